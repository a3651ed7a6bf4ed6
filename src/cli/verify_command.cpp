#include "cli/verify_command.hpp"

#include <algorithm>
#include <filesystem>
#include <thread>

#include <fmt/format.h>

#include "base/output_file.hpp"
#include "base/text_util.hpp"
#include "cli/exit_codes.hpp"
#include "deck/load.hpp"
#include "sim/head_start.hpp"
#include "verify/bode_plot.hpp"
#include "verify/pair.hpp"
#include "write/data_files.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

// The vectors to draw: a node named like an output, else the first voltage vector.
std::vector<std::string> plot_vectors(const SimPlot& p) {
    for (const char* n : {"out", "vout", "output", "v(out)"})
        if (auto v = p.find(n)) return {v->name};
    for (const auto& v : p.vectors)
        if (v.kind == VectorKind::voltage) return {v.name};
    return {};
}

}  // namespace

int run_verify(const VerifyOptions& o, std::ostream& out, std::ostream& err) {
    // Refuse unwritable report paths before any simulation runs.
    for (const std::string& path : {o.json, o.plot}) {
        if (path.empty()) continue;
        fs::path dir = fs::absolute(path).parent_path();
        std::error_code ec;
        if (!fs::is_directory(dir, ec)) {
            err << fmt::format("deckscale: error: cannot write '{}': the folder '{}' does not exist\n",
                               path, dir.string());
            return exit_bad_input;
        }
    }
    // Every run has at least one pair: two simulator processes load libngspice while the
    // decks are read and prepared.
    SimHeadStart head_start(std::min(2u, std::max(1u, std::thread::hardware_concurrency())));
    PairRequest request;
    request.original = o.original;
    request.scaled = o.scaled;
    request.factors_given = o.factors_given;
    request.km = o.km;
    request.kf = o.kf;
    request.sweep = o.sweep;
    request.drive = o.drive;
    request.tolerances.relative = o.tolerance;
    request.tolerances.transient = o.tran_tolerance;
    request.tolerances.db = o.tolerance_db;
    request.tolerances.degrees = o.tolerance_deg;
    request.timeout = std::chrono::milliseconds(static_cast<long>(o.timeout_s * 1000));
    request.memory_mb = o.memory_mb;
    request.max_step = o.max_step;
    DiskFileSystem disk;
    PairVerification v;
    try {
        v = verify_pair(request, disk, &head_start);
    } catch (const DeckError& e) {
        err << render(e.diagnostic());
        return exit_bad_input;
    }
    for (const auto& f : v.failures) {
        err << fmt::format("deckscale: error: simulating {} ({}) failed: {}: {}\n", f.label,
                           f.analysis, to_string(f.status), f.message);
        // A process over its address-space limit usually dies of a failed allocation.
        if (f.status == SimStatus::crashed && o.memory_mb > 0)
            err << fmt::format("  (each simulation may use {} MB of memory; --sim-memory MB "
                               "changes that, 0 lifts the limit)\n", o.memory_mb);
    }
    for (const auto& p : v.problems) err << "deckscale: error: " << p << "\n";
    if (v.outcome == PairVerification::Outcome::bad_input) return exit_bad_input;
    // ngspice hardly says that a code model's data file is missing: the run fails ("timestep
    // too small") or gives values read from nowhere. Either way, name the files beside the
    // original but not beside the scaled deck.
    auto left_behind = [&] {
        try {
            err << render(data_files_left_behind(load_deck(o.scaled, disk), o.original,
                                                 o.scaled, disk));
        } catch (const DeckError&) {
        }
    };
    if (v.outcome == PairVerification::Outcome::sim_failed) {
        left_behind();
        return exit_sim_failed;
    }
    if (!v.report.passed()) left_behind();

    const VerifyReport& report = v.report;
    out << report_text(report);
    if (!o.json.empty())
        if (auto e = write_file_atomically(o.json, report_json(report)); !e.empty()) {
            err << "deckscale: error: " << e << "\n";
            return exit_bad_input;
        }
    if (!o.plot.empty()) {
        if (!v.ac_original()) {
            err << "deckscale: warning: --plot needs an AC sweep; no plot written\n";
        } else {
            BodePlotRequest req{o.plot, plot_vectors(*v.ac_original()),
                                fmt::format("{} vs {}", o.original, o.scaled), report.km, report.kf};
            if (auto e = write_bode_plot(*v.ac_original(), *v.ac_scaled(), req); !e.empty()) {
                err << "deckscale: error: plot: " << e << "\n";
                return exit_bad_input;
            }
            out << "plot written to " << o.plot << "\n";
        }
    }
    return report.passed() ? exit_ok : exit_not_equivalent;
}

}  // namespace deckscale
