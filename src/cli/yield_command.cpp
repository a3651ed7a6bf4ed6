#include "cli/yield_command.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <filesystem>

#include "base/file_system.hpp"
#include "base/output_file.hpp"
#include "cli/exit_codes.hpp"
#include "deck/spice_number.hpp"
#include "yield/plot.hpp"
#include "yield/report.hpp"
#include "yield/run.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

// Fills the request from the options; returns a usage error or "".
std::string make_request(const YieldOptions& o, YieldRequest& r, const FileSystem& files) {
    r.deck = o.deck;
    r.trials = o.trials;
    r.seed = o.seed;
    if (!o.tolerance.empty())
        if (auto e = parse_tolerances(o.tolerance, r.tolerances); !e.empty())
            return "--tolerance " + e;
    r.spread = o.spread == "gauss" ? Spread::gauss : Spread::uniform;
    if (!o.mask.empty()) {
        std::string w = o.mask;
        if (w.size() > 2 && (w.ends_with("dB") || w.ends_with("db") || w.ends_with("DB")))
            w.resize(w.size() - 2);
        NumberParse p = parse_spice_number(w);
        if (!p.number || p.problem != NumberProblem::none || !(p.number->value > 0))
            return fmt::format("--mask '{}': give the window in dB, e.g. 0.5dB", o.mask);
        r.mask.window_db = p.number->value;
    }
    if (!o.mask_file.empty()) {
        if (!o.mask.empty() || !o.band.empty()) return "--mask-file excludes --mask and --band";
        auto text = files.read(o.mask_file);
        if (!text) return fmt::format("--mask-file: cannot read '{}'", o.mask_file);
        if (auto e = parse_mask_rows(std::string(text->bytes), o.mask_file, r.mask); !e.empty())
            return e;
    }
    double lo = 0, hi = 0;
    if (!o.band.empty()) {
        if (auto e = parse_range(o.band, lo, hi); !e.empty()) return "--band " + e;
        r.mask.band_low = lo;
        r.mask.band_high = hi;
    }
    if (!o.corner.empty()) {
        if (auto e = parse_range(o.corner, lo, hi); !e.empty()) return "--corner " + e;
        r.mask.corner_low = lo;
        r.mask.corner_high = hi;
    }
    r.sweep = o.sweep;
    r.drive = o.drive;
    r.output = o.output;
    r.workers = o.workers;
    r.timeout = std::chrono::milliseconds(static_cast<long>(o.timeout_s * 1000));
    r.memory_mb = o.memory_mb;
    return "";
}

std::string progress_line(const YieldProgress& p) {
    double left =
        p.done ? p.seconds * static_cast<double>(p.trials - p.done) / static_cast<double>(p.done)
               : 0;
    return fmt::format(
        "\r{} of {} trials, yield so far {:.1f} %, about {:.0f} s left   ", p.done, p.trials,
        p.done ? 100.0 * static_cast<double>(p.passed) / static_cast<double>(p.done) : 0.0, left);
}

const char* kCautions =
    "deckscale: caution: the yield covers only the tolerances given and the mask; it does not\n"
    "  cover temperature drift, ageing, parasitics or the parts' power, voltage and current\n"
    "  ratings: check those before building. For mains-connected or high-voltage circuits,\n"
    "  local codes and licensed practice govern.\n";

}  // namespace

int run_yield_command(const YieldOptions& o, std::ostream& out, std::ostream& err) {
    for (const std::string& path : {o.json, o.plot}) {
        if (path.empty()) continue;
        fs::path dir = fs::absolute(path).parent_path();
        std::error_code ec;
        if (!fs::is_directory(dir, ec)) {
            err << fmt::format(
                "deckscale: error: cannot write '{}': the folder '{}' does not exist\n", path,
                dir.string());
            return exit_bad_input;
        }
    }
    DiskFileSystem disk;
    YieldRequest request;
    if (auto e = make_request(o, request, disk); !e.empty()) {
        err << "deckscale: error: " << e << "\n";
        return exit_bad_input;
    }
    bool terminal = ::isatty(2) == 1;
    if (terminal)
        request.progress = [&err](const YieldProgress& p) {
            err << progress_line(p) << std::flush;
        };
    YieldResult r;
    try {
        r = run_yield(request, disk);
    } catch (const DeckError& e) {
        err << render(e.diagnostic());
        return exit_bad_input;
    }
    if (terminal && request.progress && r.jobs > 0) err << "\r" << std::string(72, ' ') << "\r";
    for (const auto& f : r.failures)
        err << fmt::format("deckscale: error: simulating {} failed: {}: {}\n", f.label,
                           to_string(f.status), f.message);
    for (const auto& p : r.problems) err << "deckscale: error: " << p << "\n";
    if (r.outcome == YieldResult::Outcome::bad_input) return exit_bad_input;
    if (r.outcome == YieldResult::Outcome::sim_failed) return exit_sim_failed;
    err << render(r.held);

    YieldReportContext context{o.seed, request.spread, describe_mask(request.mask)};
    out << yield_text(r, context);
    if (!o.json.empty())
        if (auto e = write_file_atomically(o.json, yield_json(r, context)); !e.empty()) {
            err << "deckscale: error: " << e << "\n";
            return exit_bad_input;
        }
    if (!o.plot.empty()) {
        std::string title = fmt::format("{}: {} trials, seed {}", o.deck, r.trials.size(), o.seed);
        std::string hist = histogram_path(o.plot);
        for (auto e : {write_envelope_plot(r, o.plot, title), write_histogram(r, hist, title)})
            if (!e.empty()) {
                err << "deckscale: error: plot: " << e << "\n";
                return exit_bad_input;
            }
        out << "plots written to " << o.plot << " and " << hist << "\n";
    }
    err << kCautions;
    return exit_ok;
}

}  // namespace deckscale
