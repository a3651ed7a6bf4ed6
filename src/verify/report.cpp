#include "verify/report.hpp"

#include <algorithm>
#include <cmath>

#include <fmt/format.h>
#include <nlohmann/json.hpp>

#include "base/text_util.hpp"
#include "scale/expression.hpp"
#include "verify/held_report.hpp"
#include "verify/meas_compare.hpp"
#include "verify/noise_compare.hpp"

namespace deckscale {

bool VerifyReport::passed() const {
    // Comparisons with expected differences (flicker noise) are shown but do not decide.
    return std::any_of(comparisons.begin(), comparisons.end(),
                       [](const Comparison& c) { return c.decides(); }) &&
           std::all_of(comparisons.begin(), comparisons.end(),
                       [](const Comparison& c) { return !c.decides() || c.passed(); });
}

namespace {

const char* kind_word(VectorKind k) {
    switch (k) {
        case VectorKind::voltage: return "voltage";
        case VectorKind::current: return "current";
        case VectorKind::voltage_density: return "voltage density";
        case VectorKind::current_density: return "current density";
        case VectorKind::voltage_squared_density: return "squared voltage density";
        case VectorKind::current_squared_density: return "squared current density";
        case VectorKind::voltage_squared: return "squared voltage";
        case VectorKind::current_squared: return "squared current";
        default: return "other";
    }
}

// Complex sweeps over frequency, shown with magnitude and phase errors.
bool ac_like(const Comparison& c) {
    return c.analysis == "ac" || c.analysis == "sp" || c.analysis == "disto";
}

const char* analysis_title(const std::string& a) {
    if (a == "ac") return "AC sweep";
    if (a == "op") return "Operating point";
    if (a == "noise") return "Noise";
    if (a == "dc") return "DC sweep";
    if (a == "tf") return "Transfer function";
    if (a == "sp") return "S-parameter sweep";
    if (a == "disto") return "Distortion";
    if (a == "meas") return "Measurements";
    return "Transient";
}

// "Distortion (2nd harmonic)": the analysis and which of its plots.
std::string title_of(const Comparison& c) {
    std::string t = analysis_title(c.analysis);
    return c.part.empty() ? t : fmt::format("{} ({})", t, c.part);
}


// The unit of a comparison's axis; one made without it (by hand) gets its analysis's own.
std::string axis_of(const Comparison& c) {
    if (!c.axis_unit.empty()) return c.axis_unit;
    return ac_like(c) || c.analysis == "noise" ? "Hz" : c.analysis == "tran" ? "s" : "";
}

// A comparison at one point (no sweep or time axis).
bool single_point(const Comparison& c) {
    return c.analysis == "op" || c.analysis == "tf" || c.analysis == "meas";
}

// The tolerance a comparison was judged by (measurements of a transient run: the transient's,
// plus the 1e-6 of ngspice's 7 printed digits).
double tolerance_of(const Comparison& c, const VerifyReport& r) {
    if (c.analysis == "meas")
        return measure_base_tolerance(c.part, r.tolerances) + kPrintedDigitsTolerance;
    return c.analysis == "tran" ? r.tolerances.transient : r.tolerances.relative;
}

// The deck's own measurements: both results, what they measure and the factor between them.
std::string measures_table(const Comparison& c) {
    std::size_t name_w = 12, what_w = 20;
    for (const auto& v : c.vectors) {
        name_w = std::max(name_w, v.name.size() + 2);
        what_w = std::max(what_w, v.quantity.size() + 2);
    }
    std::string s = fmt::format("    {:<{}} {:<{}} {:>16} {:>16} {:>12}\n", "measurement", name_w,
                                "quantity", what_w, "original", "scaled", "rel. error");
    for (const auto& v : c.vectors)
        s += fmt::format("    {:<{}} {:<{}} {:>16.7g} {:>16.7g} {:>12.3g}  {}\n", v.name, name_w,
                         v.quantity, what_w, v.original_value, v.scaled_value, v.worst,
                         v.passed ? "ok" : "FAIL");
    return s;
}

// How the noise of the scaled deck was mapped back (verify/noise_compare.hpp's factors).
std::string noise_mapping(const VerifyReport& r, const Comparison& c) {
    bool current_input = std::any_of(c.vectors.begin(), c.vectors.end(), [](const VectorResult& v) {
        return v.kind == VectorKind::current_density ||
               v.kind == VectorKind::current_squared_density;
    });
    return fmt::format(
        "compared as: noise density x sqrt(Km) = x{:.6g} at Kf f, integrated noise "
        "x sqrt(Km Kf) = x{:.6g}{}",
        std::sqrt(r.km), std::sqrt(r.km * r.kf),
        current_input ? "; the current input's input-referred noise / sqrt(Km)" : "");
}

}  // namespace

std::string report_text(const VerifyReport& r) {
    std::string s;
    s += "deckscale verify\n";
    s += fmt::format("  original   {}\n  scaled     {}\n", r.original, r.scaled);
    s += fmt::format("  factors    Km = {}, Kf = {}{}\n", factor_text(r.km), factor_text(r.kf),
                     r.factors_inferred
                         ? fmt::format("  (inferred from {} resistor and {} C/L pairs)", r.resistor_pairs,
                                       r.reactive_pairs)
                         : r.factors_from_held_line ? "  (from the held-parts line of the scaled deck)"
                                                    : "  (given)");
    if (!r.held.empty()) {
        std::string items;
        for (const auto& h : r.held) items += (items.empty() ? "" : ", ") + h;
        s += fmt::format("  held       {} (kept as written by scale --hold: the scaled deck is "
                         "not expected to equal the original)\n",
                         items);
    }
    if (r.mismatches.empty()) {
        s += "  elements   every matched R, C and L agrees with the factors\n";
    } else {
        s += fmt::format("  elements   {} matched element(s) disagree with the factors:\n", r.mismatches.size());
        for (const auto& m : r.mismatches)
            s += fmt::format("    {}:{}: {} is {} (scaled {}:{}: {}), expected {:.7g}: off by {:+.4g} %\n",
                             m.original.file, m.original.line, m.original.name, m.original.text,
                             m.scaled.file, m.scaled.line, m.scaled.text, m.expected, m.deviation * 100);
    }
    for (const auto& n : r.notes) s += "  note       " + n + "\n";
    for (const auto& c : r.comparisons) {
        s += "\n";
        std::string axis = axis_of(c);
        if (single_point(c))
            s += fmt::format("  {}: {} {}\n", title_of(c), c.vectors.size(),
                             c.analysis != "meas"        ? "vectors"
                             : c.vectors.size() == 1 ? "result compared"
                                                     : "results compared");
        else
            s += fmt::format("  {}: {} points, {:.6g} {} .. {:.6g} {} of the original, {} vectors\n",
                             title_of(c), c.points, c.first, axis, c.last, axis,
                             c.vectors.size());
        if (c.analysis == "noise") s += "    " + noise_mapping(r, c) + "\n";
        for (const auto& d : c.expected_differences) s += "    not expected to match: " + d + "\n";
        for (const auto& n : c.notes) s += "    note: " + n + "\n";
        for (const auto& p : c.problems) s += "    problem: " + p + "\n";
        if (!c.not_compared.empty()) {
            std::string names;
            for (const auto& n : c.not_compared) names += (names.empty() ? "" : ", ") + n;
            s += fmt::format("    not compared (device-internal states, not port currents): {}\n", names);
        }
        if (c.vectors.empty()) continue;
        if (c.analysis == "meas") {
            s += measures_table(c);
            continue;
        }
        if (!r.held.empty() && c.analysis == "ac") {
            s += held_ac_table(c, r);
            continue;
        }
        // With held parts the operating point and transient are information (the verdict
        // "info" below).
        // The name column fits the longest name shown ("(x Km)" marks a current).
        std::size_t width = 22;
        for (const auto& v : c.vectors)
            width = std::max(width, v.name.size() +
                                        (r.tolerances.flux_currents.count(to_lower(v.name)) ? 11 : 8));
        if (ac_like(c))
            s += fmt::format("    {:<{}} {:>12} {:>14} {:>12} {:>12}\n", "vector", width, "rel. error", "at Hz",
                             "mag. dB", "phase deg");
        else if (c.analysis == "noise")
            s += fmt::format("    {:<{}} {:>12} {:>14} {:>12}\n", "vector", width, "rel. error",
                             "at Hz", "ratio dB");
        else
            s += fmt::format("    {:<{}} {:>12} {:>14}\n", "vector", width, "rel. error",
                             single_point(c) ? "" : "at " + axis);
        std::size_t shown = 0;
        for (const auto& v : c.vectors) {
            if (shown >= 8 && v.passed && !v.gmin_level) continue;  // GMIN-level ones are shown
            ++shown;
            bool flux = r.tolerances.flux_currents.count(to_lower(v.name)) > 0;
            std::string name = v.kind != VectorKind::current || c.analysis == "noise" ? v.name
                               : flux ? v.name + " (x Km Kf)"
                                      : v.name + " (x Km)";
            const char* verdict = !r.held.empty() ? "info"
                                  : v.gmin_level  ? "GMIN level"
                                  : v.passed      ? "ok"
                                  : c.decides()   ? "FAIL"
                                                  : "differs";
            if (c.analysis == "noise")
                s += fmt::format("    {:<{}} {:>12.3g} {:>14} {:>12.3g}  {}\n", name, width,
                                 v.worst, integrated_noise(v) ? "band" : fmt::format("{:.6g}", v.at),
                                 v.db_error, verdict);
            else if (ac_like(c))
                s += fmt::format("    {:<{}} {:>12.3g} {:>14.6g} {:>12.3g} {:>12.3g}  {}\n", name,
                                 width, v.worst, v.at, v.db_error, v.deg_error, verdict);
            else if (!single_point(c))
                s += fmt::format("    {:<{}} {:>12.3g} {:>14.6g}  {}\n", name, width, v.worst, v.at,
                                 verdict);
            else
                s += fmt::format("    {:<{}} {:>12.3g} {:>14}  {}\n", name, width, v.worst, "",
                                 verdict);
        }
        if (shown < c.vectors.size())
            s += fmt::format("    ... and {} more vectors{}\n", c.vectors.size() - shown,
                             r.held.empty() ? " within tolerance" : "");
    }
    s += "\n";
    if (!r.held.empty()) return s + held_verdict(r);
    // Each analysis against its own tolerance: "ac 2e-09 (tolerance 1e-06), tran ...".
    std::string worst;
    for (const auto& c : r.comparisons) {
        double tol = tolerance_of(c, r);
        worst += fmt::format("{}{} {:.3g} (tolerance {:.3g}{})", worst.empty() ? "" : ", ",
                             c.label(), c.worst() ? c.worst()->worst : 0.0, tol,
                             c.decides() ? "" : "; not judged: flicker noise does not follow");
    }
    if (worst.empty()) worst = "nothing compared";
    if (r.passed())
        s += fmt::format("PASS: the scaled deck is equivalent to the original; worst relative error: {}\n",
                         worst);
    else
        s += fmt::format("FAIL: the scaled deck is NOT equivalent to the original; worst relative error: {}\n",
                         worst);
    return s;
}

std::string report_json(const VerifyReport& r) {
    nlohmann::json j;
    j["original"] = r.original;
    j["scaled"] = r.scaled;
    j["km"] = r.km;
    j["kf"] = r.kf;
    j["factors"] = r.factors_inferred         ? "inferred"
                   : r.factors_from_held_line ? "held-parts line"
                                              : "given";
    j["passed"] = r.passed();
    j["tolerance"] = {{"relative", r.tolerances.relative}, {"transient", r.tolerances.transient},
                      {"db", r.tolerances.db}, {"degrees", r.tolerances.degrees}};
    auto mm = nlohmann::json::array();
    for (const auto& m : r.mismatches)
        mm.push_back({{"element", m.original.name}, {"file", m.original.file}, {"line", m.original.line},
                      {"scaled_file", m.scaled.file}, {"scaled_line", m.scaled.line},
                      {"original", m.original.value}, {"scaled", m.scaled.value}, {"expected", m.expected},
                      {"deviation", m.deviation}});
    j["element_mismatches"] = mm;
    auto an = nlohmann::json::array();
    for (const auto& c : r.comparisons) {
        auto vs = nlohmann::json::array();
        for (const auto& v : c.vectors)
            vs.push_back({{"name", v.name}, {"kind", kind_word(v.kind)}, {"worst", v.worst}, {"at", v.at},
                          {"db_error", v.db_error}, {"deg_error", v.deg_error}, {"peak", v.peak},
                          {"max_db", v.max_db}, {"max_db_at", v.max_db_at},
                          {"max_deg", v.max_deg}, {"max_deg_at", v.max_deg_at},
                          {"passed", v.passed}, {"gmin_level", v.gmin_level}});
        if (c.analysis == "meas")
            for (std::size_t i = 0; i < c.vectors.size(); ++i) {
                const auto& v = c.vectors[i];
                vs[i]["original_value"] = v.original_value;
                vs[i]["scaled_value"] = v.scaled_value;
                vs[i]["quantity"] = v.quantity;
            }
        an.push_back({{"analysis", c.analysis},
                      {"part", c.part},
                      {"unit", axis_of(c)},
                      {"points", c.points},
                      {"first", c.first},
                      {"last", c.last},
                      {"passed", c.passed()},
                      {"problems", c.problems},
                      {"not_compared", c.not_compared},
                      {"expected_to_match", c.decides()},
                      {"expected_differences", c.expected_differences},
                      {"notes", c.notes},
                      {"vectors", vs}});
    }
    j["analyses"] = an;
    j["notes"] = r.notes;
    j["held"] = r.held;
    return j.dump(2) + "\n";
}

}  // namespace deckscale
