#include "cli/stress_command.hpp"

#include <fmt/format.h>

#include <filesystem>

#include "base/file_system.hpp"
#include "base/output_file.hpp"
#include "cli/exit_codes.hpp"
#include "deck/diagnostic.hpp"
#include "stress/report.hpp"

namespace deckscale {
namespace {

const char* kCautions =
    "deckscale: caution: these are simulated loads of ideal parts. Check each part's ratings with\n"
    "  derating for voltage and power (the maker's curves over temperature), and self-heating:\n"
    "  a resistor's value and a capacitor's life change with its own dissipation. For\n"
    "  mains-connected or high-voltage circuits, local codes and licensed practice govern.\n";

}  // namespace

int run_stress_command(const StressOptions& o, std::ostream& out, std::ostream& err) {
    if (!o.json.empty()) {
        std::error_code ec;
        auto dir = std::filesystem::absolute(o.json).parent_path();
        if (!std::filesystem::is_directory(dir, ec)) {
            err << fmt::format(
                "deckscale: error: cannot write '{}': the folder '{}' does not exist\n", o.json,
                dir.string());
            return exit_bad_input;
        }
    }
    StressRequest request;
    request.original = o.original;
    request.scaled = o.scaled;
    request.ratio_limit = o.ratio;
    if (auto e = parse_ratings(o.ratings, request.ratings); !o.ratings.empty() && !e.empty()) {
        err << "deckscale: error: --rating " << e << "\n";
        return exit_bad_input;
    }
    request.timeout = std::chrono::milliseconds(static_cast<long>(o.timeout_s * 1000));
    request.memory_mb = o.memory_mb;
    DiskFileSystem disk;
    StressResult r;
    try {
        r = run_stress(request, disk);
    } catch (const DeckError& e) {
        err << render(e.diagnostic());
        return exit_bad_input;
    }
    for (const auto& p : r.problems) err << "deckscale: error: " << p << "\n";
    if (r.outcome == StressResult::Outcome::bad_input) return exit_bad_input;
    if (r.outcome == StressResult::Outcome::sim_failed) return exit_sim_failed;
    out << stress_text(r, request);
    if (!o.json.empty())
        if (auto e = write_file_atomically(o.json, stress_json(r, request)); !e.empty()) {
            err << "deckscale: error: " << e << "\n";
            return exit_bad_input;
        }
    err << kCautions;
    for (const PartStressRow& row : r.rows)
        if (!row.flags.empty()) return exit_not_equivalent;
    return exit_ok;
}

}  // namespace deckscale
