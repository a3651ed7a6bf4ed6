#include "cli/retarget_command.hpp"

#include <fmt/format.h>

#include <cmath>
#include <filesystem>

#include "base/text_util.hpp"
#include "cli/exit_codes.hpp"
#include "retarget/fit.hpp"
#include "retarget/quantity.hpp"
#include "scale/cautions.hpp"
#include "scale/expression.hpp"
#include "verify/bode_plot.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

// The measured feature must land within this of its target (relative).
constexpr double kTargetTolerance = 1e-3;

// Splits "A=B" (or "A:B") at the first `sep`; both sides non-empty, else false.
bool split(const std::string& text, char sep, std::string& left, std::string& right) {
    auto at = text.find(sep);
    if (at == std::string::npos || at == 0 || at + 1 == text.size()) return false;
    left = text.substr(0, at);
    right = text.substr(at + 1);
    return true;
}

std::string ohms_text(double ohms) { return fmt::format("{:.7g} Ohm", ohms); }

// The best fit: the level chosen, and each part's rounding error there and at both ends.
std::string fit_text(const RetargetResult& r, const RetargetRequest& q) {
    const auto& z = *q.impedance;
    double low = r.fit_km_low, high = r.fit_km_high, km = r.fit->km;
    std::string s = fmt::format(
        "  best fit   {} in {} ... {}: {} rounds best ({} levels tried; worst part error {:.3g} %, "
        "at the ends {:.3g} % and {:.3g} %)\n",
        z.element, ohms_text(z.to), ohms_text(z.to_high), ohms_text(km * r.element_value),
        r.fit->candidates, 100 * std::expm1(r.fit->score.worst),
        100 * std::expm1(fit_score(r.fit_parts, q.series, low).worst),
        100 * std::expm1(fit_score(r.fit_parts, q.series, high).worst));
    s += fmt::format("    {:<10} {:>12} {:>12} {:>12}\n", "part", "at " + ohms_text(z.to), "chosen",
                     "at " + ohms_text(z.to_high));
    for (const auto& p : r.fit_parts)
        s += fmt::format("    {:<10} {:>+11.3f}% {:>+11.3f}% {:>+11.3f}%\n", p.name,
                         100 * part_error(p, q.series, low), 100 * part_error(p, q.series, km),
                         100 * part_error(p, q.series, high));
    return s;
}

}  // namespace

std::optional<RetargetRequest> retarget_request(const RetargetOptions& o, std::string& error) {
    RetargetRequest r;
    r.deck = o.deck;
    r.output = o.output;
    r.sweep = o.sweep;
    r.drive = o.drive;
    r.digits = o.digits;
    r.timeout = std::chrono::milliseconds(static_cast<long>(o.timeout_s * 1000));
    r.memory_mb = o.memory_mb;
    std::string a, b;
    if (!o.impedance.empty()) {
        auto v = split(o.impedance, '=', a, b) ? parse_impedance(b) : std::nullopt;
        if (!v) {
            error = fmt::format("--impedance {}: write NAME=VALUE with a positive value (R1=600)",
                                o.impedance);
            return std::nullopt;
        }
        r.impedance = ImpedanceTarget{a, 1, *v};
    }
    if (!o.impedance_map.empty()) {
        auto from = split(o.impedance_map, ':', a, b) ? parse_impedance(a) : std::nullopt;
        auto to = from ? parse_impedance(b) : std::nullopt;
        if (!to) {
            error =
                fmt::format("--impedance-map {}: write OLD:NEW with positive impedances (1:600)",
                            o.impedance_map);
            return std::nullopt;
        }
        r.impedance = ImpedanceTarget{"", *from, *to};
    }
    if (!o.impedance_range.empty()) {
        std::string low, high;
        auto lo = split(o.impedance_range, '=', a, b) && split(b, ':', low, high)
                      ? parse_impedance(low)
                      : std::nullopt;
        auto hi = lo ? parse_impedance(high) : std::nullopt;
        if (!hi || !(*hi > *lo)) {
            error = fmt::format(
                "--impedance-range {}: write NAME=LOW:HIGH with 0 < LOW < HIGH (R1=500:2k)",
                o.impedance_range);
            return std::nullopt;
        }
        auto series = parse_snap_series(o.series, error);
        if (!series) {
            error = "--series " + error;
            return std::nullopt;
        }
        r.series = *series;
        r.impedance = ImpedanceTarget{a, 1, *lo, *hi};
    }
    struct Named {
        const char* option;
        const std::string& text;
        Feature feature;
    };
    for (const Named& n : {Named{"--corner", o.corner, Feature::corner},
                           Named{"--center", o.center, Feature::center},
                           Named{"--notch", o.notch, Feature::notch}}) {
        if (n.text.empty()) continue;
        auto f = split(n.text, '=', a, b) ? parse_frequency(b) : std::nullopt;
        if (!f) {
            error = fmt::format("{} {}: write NODE=FREQ with a positive frequency (out=3.4k)",
                                n.option, n.text);
            return std::nullopt;
        }
        r.frequency = FrequencyTarget{n.feature, a, 0, *f};
    }
    if (!o.frequency_map.empty()) {
        auto from = split(o.frequency_map, ':', a, b) ? parse_frequency(a) : std::nullopt;
        auto to = from ? parse_frequency(b) : std::nullopt;
        if (!to) {
            error = fmt::format(
                "--frequency-map {}: write OLD:NEW with positive frequencies in Hz "
                "or rad/s (1rad/s:3.4k)",
                o.frequency_map);
            return std::nullopt;
        }
        r.frequency = FrequencyTarget{std::nullopt, "", *from, *to};
    }
    return r;
}

int run_retarget(const RetargetOptions& o, std::ostream& out, std::ostream& err) {
    std::string error;
    auto request = retarget_request(o, error);
    if (!request) {
        err << "deckscale: error: " << error << "\n";
        return exit_bad_input;
    }
    std::error_code ec;
    if (fs::exists(o.output, ec) && fs::exists(o.deck, ec) &&
        fs::equivalent(o.output, o.deck, ec)) {
        err << fmt::format(
            "deckscale: error: '{}' is the input deck; retarget never overwrites it\n", o.output);
        return exit_bad_input;
    }
    DiskFileSystem disk;
    RetargetResult r;
    try {
        r = retarget(*request, disk);
    } catch (const DeckError& e) {
        err << render(e.diagnostic());
        return exit_bad_input;
    }
    err << render(r.warnings);
    using Outcome = RetargetResult::Outcome;
    if (r.outcome == Outcome::refused) {
        err << render(r.unscalable);
        err << fmt::format("deckscale: {} item(s) cannot be scaled exactly; nothing was written\n",
                           r.unscalable.size());
        return exit_refused;
    }
    if (r.written.empty()) {
        for (const auto& p : r.problems) err << "deckscale: error: " << p << "\n";
        return r.outcome == Outcome::sim_failed ? exit_sim_failed : exit_bad_input;
    }

    out << fmt::format("retarget {} -> {}\n", o.deck, o.output);
    const auto& z = request->impedance;
    if (!z)
        out << "  impedance  unchanged  Km = 1\n";
    else if (!z->element.empty())
        out << fmt::format("  impedance  {} = {} becomes {}  Km = {}\n", z->element,
                           ohms_text(r.element_value), ohms_text(r.km * r.element_value),
                           factor_text(r.km));
    else
        out << fmt::format("  impedance  {} becomes {}  Km = {}\n", ohms_text(z->from),
                           ohms_text(z->to), factor_text(r.km));
    if (r.fit) out << fit_text(r, *request);
    const auto& f = request->frequency;
    if (!f)
        out << "  frequency  unchanged  Kf = 1\n";
    else if (r.before)
        out << fmt::format(
            "  frequency  {} of {}: measured {} (level {:.4g} dB, {} sweeps), target {}  "
            "Kf = {}\n",
            to_string(r.before->feature), f->node, frequency_text(r.before->freq),
            r.before->level_db, r.before->sweeps, frequency_text(f->to), factor_text(r.kf));
    else
        out << fmt::format("  frequency  {} becomes {}  Kf = {}\n", frequency_text(f->from),
                           frequency_text(f->to), factor_text(r.kf));
    out << fmt::format("  written    {} value(s) rewritten;", r.change_count);
    for (const auto& w : r.written) out << " " << w;
    out << "\n";
    bool reached = true;
    if (r.after) {
        double e = r.target_error();
        reached = std::abs(e) <= kTargetTolerance;
        out << fmt::format("  achieved   {} of {} in {}: {} (error {:+.3g} %, {})\n",
                           to_string(r.after->feature), f->node, o.output,
                           frequency_text(r.after->freq), 100 * e,
                           reached ? "within 0.1 %" : "NOT within 0.1 %");
    }
    for (const auto& p : r.problems) err << "deckscale: error: " << p << "\n";
    int code = reached ? exit_ok : exit_not_equivalent;
    if (r.verification && r.verification->outcome == PairVerification::Outcome::compared) {
        out << report_text(r.verification->report);
        if (!r.verification->report.passed()) code = exit_not_equivalent;
    } else if (r.outcome == Outcome::sim_failed) {
        for (const auto& s : r.verification ? r.verification->failures : std::vector<SimFailure>{})
            err << fmt::format("deckscale: error: simulating {} ({}) failed: {}: {}\n", s.label,
                               s.analysis, to_string(s.status), s.message);
        code = exit_sim_failed;
    } else {
        code = exit_bad_input;
    }
    if (!o.plot.empty()) {
        const PairVerification* v = r.verification ? &*r.verification : nullptr;
        if (!v || !v->ac_original() || !v->ac_scaled()) {
            err << "deckscale: warning: --plot needs an AC sweep; no plot written\n";
        } else {
            std::string node = f && f->feature ? f->node : "out";
            if (node.size() > 3 && istarts_with(node, "v(") && node.back() == ')')
                node = node.substr(2, node.size() - 3);
            BodePlotRequest req{
                o.plot, {node}, fmt::format("{} retargeted to {}", o.deck, o.output), r.km, r.kf};
            if (r.after) {
                req.mark_hz = r.target_hz;
                req.mark_label = fmt::format("target {} {}", to_string(r.after->feature),
                                             frequency_text(r.target_hz));
            }
            if (auto e = write_bode_plot(*v->ac_original(), *v->ac_scaled(), req); !e.empty())
                err << "deckscale: error: plot: " << e << "\n";
            else
                out << "plot written to " << o.plot << "\n";
        }
    }
    err << nominal_value_cautions();
    return code;
}

}  // namespace deckscale
