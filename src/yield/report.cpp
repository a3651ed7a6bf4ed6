#include "yield/report.hpp"

#include <fmt/format.h>

#include <cmath>
#include <nlohmann/json.hpp>

namespace deckscale {
namespace {

std::string hz(double f) { return fmt::format("{:.5g} Hz", f); }

std::string summary_line(const char* name, const Summary& s, const char* unit, double scale = 1) {
    if (s.count == 0) return fmt::format("  {:<10} (none)\n", name);
    return fmt::format(
        "  {:<10} mean {:.4g}  sd {:.3g}  min {:.4g}  5% {:.4g}  median {:.4g}  95% {:.4g}  "
        "max {:.4g} {}\n",
        name, s.mean * scale, s.sd * scale, s.min * scale, s.p5 * scale, s.median * scale,
        s.p95 * scale, s.max * scale, unit);
}

nlohmann::json summary_json(const Summary& s) {
    if (s.count == 0) return nullptr;
    return {{"count", s.count}, {"mean", s.mean},     {"sd", s.sd},   {"min", s.min},
            {"p5", s.p5},       {"median", s.median}, {"p95", s.p95}, {"max", s.max}};
}

nlohmann::json finite(double x) {
    return std::isfinite(x) ? nlohmann::json(x) : nlohmann::json(nullptr);
}

nlohmann::json figures_json(const ResponseFigures& f) {
    return {{"pass", f.pass},
            {"gain_db", f.gain_db},
            {"deviation_db", f.deviation_db},
            {"ripple_db", f.ripple_db},
            {"corner_hz", f.corner_hz ? nlohmann::json(*f.corner_hz) : nlohmann::json(nullptr)},
            {"margin_db", finite(f.margin_db)}};
}

}  // namespace

std::string describe_mask(const Mask& m) {
    std::string s;
    if (!m.rows.empty()) {
        s = fmt::format("the limits of {} ({} rows)", m.rows_source, m.rows.size());
    } else if (m.band_low) {
        s = fmt::format("within +-{:g} dB of the nominal from {} to {}", m.window_db,
                        hz(*m.band_low), hz(*m.band_high));
    } else {
        s = fmt::format(
            "within +-{:g} dB of the nominal over its passband (within 3 dB of its peak)",
            m.window_db);
    }
    if (m.corner_low)
        s += fmt::format(", corner in {} .. {}", hz(*m.corner_low), hz(*m.corner_high));
    return s;
}

std::string yield_text(const YieldResult& r, const YieldReportContext& c) {
    std::string s;
    std::size_t varied = 0;
    for (const Part& p : r.parts) varied += p.tolerance > 0;
    std::size_t n = r.trials.size();
    s += fmt::format("{} trials, seed {}, {} spread; {} of {} parts varied; output {}; sweep {}\n",
                     n, c.seed, to_string(c.spread), varied, r.parts.size() + r.held.size(),
                     r.output, r.sweep_card);
    s += fmt::format("mask: {}\n", c.mask);
    s += fmt::format("nominal: {}; gain {:.4g} dB, ripple {:.3g} dB, corner {}\n",
                     r.nominal.pass ? "meets the mask" : "VIOLATES the mask", r.nominal.gain_db,
                     r.nominal.ripple_db, r.nominal.corner_hz ? hz(*r.nominal.corner_hz) : "none");
    double y = n ? static_cast<double>(r.passed) / static_cast<double>(n) : 0;
    s += fmt::format(
        "yield: {} of {} = {:.1f} %  (95 % Wilson score interval {:.1f} % .. {:.1f} %)\n", r.passed,
        n, 100 * y, 100 * r.interval.low, 100 * r.interval.high);
    s += "key figures over the trials:\n";
    s += summary_line("gain", r.gain, "dB");
    s += summary_line("deviation", r.deviation, "dB");
    s += summary_line("ripple", r.ripple, "dB");
    s += summary_line("corner", r.corner, "Hz");
    if (r.worst_trial) {
        const TrialResult& w = r.trials[r.worst_trial - 1];
        s += fmt::format("worst trial: #{} ({}; deviation {:.3g} dB{}, corner {}), parts:", w.trial,
                         w.figures.pass ? "meets the mask" : "fails", w.figures.deviation_db,
                         std::isfinite(w.figures.margin_db)
                             ? fmt::format(", margin {:.3g} dB", w.figures.margin_db)
                             : "",
                         w.figures.corner_hz ? hz(*w.figures.corner_hz) : "none");
        for (const auto& [name, value] : r.worst_values)
            s += fmt::format(" {}={:.6g}", name, value);
        s += "\n";
    }
    if (!r.sensitivities.empty()) {
        s += "sensitivity of the corner (share of its variance; % corner per % part):\n";
        for (const Sensitivity& x : r.sensitivities)
            s += fmt::format("  {:<10} {:5.1f} %  {:+.3f}\n", x.part, 100 * x.share, x.slope);
    } else {
        s += "sensitivity: not ranked (a response without a -3 dB corner in every trial)\n";
    }
    if (!r.held.empty())
        s += fmt::format("{} R, C or L parts keep their values (see the notes above)\n",
                         r.held.size());
    return s;
}

std::string yield_json(const YieldResult& r, const YieldReportContext& c) {
    nlohmann::json j;
    j["seed"] = c.seed;
    j["spread"] = to_string(c.spread);
    j["mask"] = c.mask;
    j["output"] = r.output;
    j["sweep"] = r.sweep_card;
    j["trials"] = r.trials.size();
    j["passed"] = r.passed;
    j["yield"] = r.trials.empty()
                     ? 0.0
                     : static_cast<double>(r.passed) / static_cast<double>(r.trials.size());
    j["interval"] = {{"method", "Wilson score"},
                     {"level", 0.95},
                     {"low", r.interval.low},
                     {"high", r.interval.high}};
    j["nominal"] = figures_json(r.nominal);
    j["summary"] = {{"gain_db", summary_json(r.gain)},
                    {"deviation_db", summary_json(r.deviation)},
                    {"ripple_db", summary_json(r.ripple)},
                    {"corner_hz", summary_json(r.corner)}};
    nlohmann::json parts = nlohmann::json::array();
    for (const Part& p : r.parts)
        parts.push_back({{"name", p.name}, {"nominal", p.nominal}, {"tolerance", p.tolerance}});
    j["parts"] = parts;
    nlohmann::json held = nlohmann::json::array();
    for (const Diagnostic& d : r.held)
        held.push_back({{"file", d.file}, {"line", d.line}, {"message", d.message}});
    j["held"] = held;
    nlohmann::json sens = nlohmann::json::array();
    for (const Sensitivity& x : r.sensitivities)
        sens.push_back({{"part", x.part}, {"share", x.share}, {"slope", x.slope}});
    j["sensitivity"] = {{"figure", r.ranked_figure}, {"ranking", sens}};
    nlohmann::json worst = {{"trial", r.worst_trial}};
    for (const auto& [name, value] : r.worst_values) worst["values"][name] = value;
    j["worst"] = worst;
    nlohmann::json trials = nlohmann::json::array();
    for (const TrialResult& t : r.trials) {
        nlohmann::json f = figures_json(t.figures);
        f["trial"] = t.trial;
        trials.push_back(std::move(f));
    }
    j["per_trial"] = trials;
    return j.dump(1) + "\n";
}

}  // namespace deckscale
