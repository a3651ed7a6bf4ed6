#include "batch/case_run.hpp"

#include <fmt/format.h>

#include <chrono>
#include <filesystem>
#include <utility>

#include "base/output_file.hpp"
#include "deck/diagnostic.hpp"
#include "scale/rescale.hpp"
#include "verify/held_report.hpp"
#include "verify/noise_compare.hpp"
#include "verify/pair.hpp"
#include "write/data_files.hpp"
#include "write/plan.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

// The scaled deck for a factor target, written flattened (one self-contained file) into
// `folder`; returns its path, or "" with the result's outcome and problems set.
std::string make_scaled(const SuiteCase& c, const FactorTarget& f, const FileSystem& files,
                        const std::string& folder, CaseResult& r) {
    ScaleSettings settings;
    settings.factors = {f.km, f.kf};
    settings.record_changes = false;
    settings.hold = f.hold;
    ScaledDeck scaled = load_and_scale(c.deck, files, settings);
    if (!scaled.result.unscalable.empty()) {
        r.outcome = CaseOutcome::refused;
        for (const auto& d : scaled.result.unscalable) r.refusals.push_back(d.message);
        r.problems.push_back(fmt::format("{} item(s) cannot be scaled exactly", r.refusals.size()));
        for (const auto& d : scaled.result.unscalable) {
            std::string text = render(d);
            if (!text.empty() && text.back() == '\n') text.pop_back();
            r.problems.push_back(text);
        }
        return "";
    }
    if (folder.empty()) {
        r.problems.push_back("cannot make a temporary folder for the scaled deck");
        return "";
    }
    std::string out = folder + "/" + fs::path(c.deck).stem().string() + "-scaled.cir";
    OutputPlan plan = plan_output(scaled.deck, std::move(scaled.result.edits), out, true);
    add_data_files(plan, data_file_outputs(scaled.deck, scaled.result.data_files, out, files,
                                           settings.digits));
    OutputBatch batch;
    for (const auto& file : plan.files) {
        auto produce = [&](ByteSink& sink) { produce_output(scaled.deck, plan, file, sink); };
        if (auto e = batch.add(file.path, produce); !e.empty()) {
            r.problems.push_back(e);
            return "";
        }
    }
    if (auto e = batch.commit(); !e.empty()) {
        r.problems.push_back(e);
        return "";
    }
    return out;
}

// Every string in `j` equal to `from` replaced by `to`.
void replace_strings(nlohmann::json& j, const std::string& from, const std::string& to) {
    if (j.is_string() && j.get_ref<const std::string&>() == from) j = to;
    if (j.is_structured())
        for (auto& child : j) replace_strings(child, from, to);
}

double tolerance_of(const Comparison& c, const Tolerances& t) {
    return c.analysis == "tran" ? t.transient : t.relative;
}

// With held parts: the AC vector that moved most, in dB and degrees.
std::string moved_most(const VerifyReport& report) {
    for (const auto& c : report.comparisons) {
        const VectorResult* most = c.analysis == "ac" ? most_moved(c, false) : nullptr;
        if (most)
            return fmt::format("ac {}: held parts moved it by up to {:.3g} dB (at {:.6g} Hz) and "
                               "{:.3g} deg (at {:.6g} Hz) of the scaled deck",
                               most->name, most->max_db, most->max_db_at * report.kf,
                               most->max_deg, most->max_deg_at * report.kf);
    }
    return "";
}

}  // namespace

std::string worst_vector(const VerifyReport& report) {
    if (!report.held.empty()) return moved_most(report);
    const Comparison* wc = nullptr;
    const VectorResult* wv = nullptr;
    // A failing vector always ranks above a passing one (compared as a pair: adding a huge
    // number to the failing ones' ratios made them all equal), then by error over tolerance.
    std::pair<bool, double> worst_rank{false, -1};
    for (const auto& c : report.comparisons) {
        if (!c.decides()) continue;  // flicker noise that cannot agree: shown, never the worst
        for (const auto& v : c.vectors) {
            std::pair<bool, double> rank{!v.passed, v.worst / tolerance_of(c, report.tolerances)};
            if (rank > worst_rank) {
                worst_rank = rank;
                wc = &c;
                wv = &v;
            }
        }
    }
    if (!wv) return "";
    // Where it is worst, in the analysis's own unit ("at 1.6e+07 Hz", "at 0.0031 s").
    std::string at;
    if (wc->analysis == "noise" && integrated_noise(*wv))
        at = " over the band";
    else if (wc->analysis != "op" && wc->analysis != "tf")
        at = wc->axis_unit.empty() ? fmt::format(" at {:.6g}", wv->at)
                                   : fmt::format(" at {:.6g} {}", wv->at, wc->axis_unit);
    return fmt::format("{} {}: relative error {:.3g}{} (tolerance {:.3g})", wc->label(), wv->name,
                       wv->worst, at, tolerance_of(*wc, report.tolerances));
}

CaseResult run_case(const SuiteCase& c, const FileSystem& files, const std::string& scratch) {
    auto start = std::chrono::steady_clock::now();
    CaseResult r;
    r.index = c.index;
    r.name = c.name;
    r.deck = c.deck;
    r.expect = c.expect;
    PairRequest request;
    request.original = c.deck;
    request.sweep = c.sweep;
    request.drive = c.drive;
    request.tolerances = c.tolerances;
    request.timeout = c.timeout;
    request.memory_mb = c.memory_mb;
    try {
        if (const auto* s = std::get_if<ScaledTarget>(&c.target)) {
            r.scaled = s->path;
            request.scaled = s->path;
            if (s->factors) {
                request.factors_given = true;
                request.km = r.km = s->factors->km;
                request.kf = r.kf = s->factors->kf;
            }
        } else {
            const auto& f = std::get<FactorTarget>(c.target);
            request.factors_given = true;
            request.km = r.km = f.km;
            request.kf = r.kf = f.kf;
            request.scaled = make_scaled(c, f, files, scratch, r);
        }
        if (!request.scaled.empty()) {
            PairVerification v = verify_pair(request, files);
            // As the verify command prints them: the failed runs, then what they tell.
            for (const auto& f : v.failures)
                r.problems.push_back(fmt::format("simulating {} ({}) failed: {}: {}", f.label,
                                                 f.analysis, to_string(f.status), f.message));
            for (const auto& p : v.problems) r.problems.push_back(p);
            if (v.outcome == PairVerification::Outcome::compared) {
                r.km = v.report.km;
                r.kf = v.report.kf;
                r.outcome = v.report.passed() ? CaseOutcome::pass : CaseOutcome::fail;
                r.worst = worst_vector(v.report);
                r.report = nlohmann::json::parse(report_json(v.report));
                // A deck made for the run is gone afterwards: the report names it, not its
                // temporary path (and two runs of a suite give the same report).
                if (r.scaled.empty())
                    replace_strings(
                        r.report, request.scaled,
                        fs::path(c.deck).stem().string() + "-scaled.cir (made for the run)");
            }
        }
    } catch (const DeckError& e) {
        r.outcome = CaseOutcome::error;
        std::string text = render(e.diagnostic());
        if (!text.empty() && text.back() == '\n') text.pop_back();
        r.problems.push_back(text);
    }
    r.seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    return r;
}

}  // namespace deckscale
