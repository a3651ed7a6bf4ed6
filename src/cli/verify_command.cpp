#include "cli/verify_command.hpp"

#include <algorithm>
#include <filesystem>
#include <thread>

#include <fmt/format.h>

#include "base/output_file.hpp"
#include "base/text_util.hpp"
#include "cli/exit_codes.hpp"
#include "deck/analyses.hpp"
#include "deck/load.hpp"
#include "sim/head_start.hpp"
#include "sim/simulate.hpp"
#include "verify/bode_plot.hpp"
#include "verify/compare.hpp"
#include "verify/factor_inference.hpp"
#include "verify/report.hpp"
#include "verify/sim_cards.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

struct PairJob {
    std::string analysis;  // "ac", "op", "tran"
    SimJob original, scaled;
};

const SimPlot* plot_of(const SimOutcome& o, const std::string& analysis) {
    for (const auto& p : o.plots)
        if (istarts_with(p.name, analysis)) return &p;
    return nullptr;
}

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
    DiskFileSystem disk;
    VerifyReport report;
    report.original = o.original;
    report.scaled = o.scaled;
    report.tolerances = {o.tolerance, o.tran_tolerance, o.tolerance_db, o.tolerance_deg};
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
    std::vector<PairJob> pairs;
    try {
        Deck original = load_deck(o.original, disk);
        Deck scaled = load_deck(o.scaled, disk);
        auto vo = element_values(original), vs = element_values(scaled);
        if (o.factors_given) {
            report.km = o.km;
            report.kf = o.kf;
        } else {
            auto inf = infer_factors(vo, vs);
            if (!inf.ok) {
                err << "deckscale: error: cannot infer the factors: " << inf.message << "\n";
                return exit_bad_input;
            }
            report.km = inf.km;
            report.kf = inf.kf;
            report.factors_inferred = true;
            report.resistor_pairs = inf.resistor_pairs;
            report.reactive_pairs = inf.reactive_pairs;
            if (!inf.message.empty()) report.notes.push_back(inf.message);
        }
        // Values are written with 7 significant digits by default: 1e-5 is well above that.
        report.mismatches = check_ratios(vo, vs, report.km, report.kf, 1e-5);

        DeckAnalyses an = find_analyses(original);
        for (const auto& p : an.problems) report.notes.push_back(p + " (not compared)");
        for (const auto& kw : an.uncompared)
            report.notes.push_back(fmt::format("the original's {} analysis is not compared (verify maps "
                                               ".ac, .op and .tran)", kw));
        std::optional<AcSweep> sweep = an.ac;
        if (!o.sweep.empty()) {
            std::string e;
            sweep = parse_sweep(o.sweep, e);
            if (!sweep) {
                err << "deckscale: error: --sweep: " << e << "\n";
                return exit_bad_input;
            }
            sweep->reltol = original.symbols.reltol;  // the deck's stop test
        }
        std::string drive = to_lower(o.drive);
        if (!drive.empty() && std::find(an.sources.begin(), an.sources.end(), drive) == an.sources.end()) {
            err << fmt::format("deckscale: error: --drive {}: no independent source of that name in {}\n",
                               o.drive, o.original);
            return exit_bad_input;
        }
        if (sweep && drive.empty() && an.ac_sources.empty()) {
            err << fmt::format("deckscale: error: no source of {} has an AC value, so an AC sweep "
                               "shows nothing; name the source that drives the circuit with "
                               "--drive NAME (it gets AC 1)\n", o.original);
            return exit_bad_input;
        }
        auto job = [&](const Deck& d, const std::string& path, const std::string& card, double drive_ac) {
            SimJob j;
            j.label = path;
            j.cards = simulation_cards(
                d, SimDeckOptions{
                       card, drive, drive_ac,
                       &d == &original ? ScaleFactors{} : ScaleFactors{report.km, report.kf}});
            j.work_dir = fs::absolute(path).parent_path().string();
            j.timeout = std::chrono::milliseconds(static_cast<long>(o.timeout_s * 1000));
            j.memory_limit_mb = o.memory_mb;
            return j;
        };
        // An AC current drive of 1 A in the original is 1/Km A in the scaled circuit.
        double scaled_drive = !drive.empty() && drive[0] == 'i' ? 1 / report.km : 1;
        if (sweep)
            pairs.push_back({"ac", job(original, o.original, ac_card(*sweep), 1),
                             job(scaled, o.scaled, ac_card(map_sweep(*sweep, report.kf)), scaled_drive)});
        if (an.op || (!sweep && !an.tran))
            pairs.push_back({"op", job(original, o.original, ".op", 1), job(scaled, o.scaled, ".op", scaled_drive)});
        if (an.tran)
            pairs.push_back({"tran", job(original, o.original, tran_card(*an.tran), 1),
                             job(scaled, o.scaled, tran_card(map_tran(*an.tran, report.kf)), scaled_drive)});
    } catch (const DeckError& e) {
        err << render(e.diagnostic());
        return exit_bad_input;
    }

    std::vector<SimJob> jobs;
    for (const auto& p : pairs) {
        jobs.push_back(p.original);
        jobs.push_back(p.scaled);
    }
    std::vector<SimOutcome> outcomes =
        simulate_all(jobs, 0, SimProcesses::automatic, &head_start);
    bool failed = false;
    for (std::size_t i = 0; i < jobs.size(); ++i) {
        if (outcomes[i].status == SimStatus::ok) continue;
        failed = true;
        err << fmt::format("deckscale: error: simulating {} ({}) failed: {}: {}\n", jobs[i].label,
                           pairs[i / 2].analysis, to_string(outcomes[i].status), outcomes[i].message);
        // A process over its address-space limit usually dies of a failed allocation.
        if (outcomes[i].status == SimStatus::crashed && o.memory_mb > 0)
            err << fmt::format("  (each simulation may use {} MB of memory; --sim-memory MB "
                               "changes that, 0 lifts the limit)\n", o.memory_mb);
    }
    if (failed) return exit_sim_failed;

    const SimPlot* ac_o = nullptr;
    const SimPlot* ac_s = nullptr;
    for (std::size_t i = 0; i < pairs.size(); ++i) {
        const std::string& a = pairs[i].analysis;
        const SimPlot* po = plot_of(outcomes[2 * i], a);
        const SimPlot* ps = plot_of(outcomes[2 * i + 1], a);
        if (!po || !ps) {
            err << fmt::format("deckscale: error: the simulator produced no {} plot\n", a);
            return exit_sim_failed;
        }
        if (a == "ac") {
            report.comparisons.push_back(compare_ac(*po, *ps, report.km, report.kf, report.tolerances));
            ac_o = po;
            ac_s = ps;
        } else if (a == "op") {
            report.comparisons.push_back(compare_op(*po, *ps, report.km, report.tolerances));
        } else {
            report.comparisons.push_back(compare_tran(*po, *ps, report.km, report.kf, report.tolerances));
        }
    }
    out << report_text(report);
    if (!o.json.empty())
        if (auto e = write_file_atomically(o.json, report_json(report)); !e.empty()) {
            err << "deckscale: error: " << e << "\n";
            return exit_bad_input;
        }
    if (!o.plot.empty()) {
        if (!ac_o) {
            err << "deckscale: warning: --plot needs an AC sweep; no plot written\n";
        } else {
            BodePlotRequest req{o.plot, plot_vectors(*ac_o),
                                fmt::format("{} vs {}", o.original, o.scaled), report.km, report.kf};
            if (auto e = write_bode_plot(*ac_o, *ac_s, req); !e.empty()) {
                err << "deckscale: error: plot: " << e << "\n";
                return exit_bad_input;
            }
            out << "plot written to " << o.plot << "\n";
        }
    }
    return report.passed() ? exit_ok : exit_not_equivalent;
}

}  // namespace deckscale
