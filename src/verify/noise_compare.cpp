#include "verify/noise_compare.hpp"

#include <algorithm>
#include <cmath>

#include <set>
#include <string>

#include <fmt/format.h>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

bool squared(VectorKind k) {
    return k == VectorKind::voltage_squared_density || k == VectorKind::current_squared_density ||
           k == VectorKind::voltage_squared || k == VectorKind::current_squared;
}

// The ratio of two noise values in dB of amplitude (a squared quantity counts half).
double ratio_db(double scaled, double original, VectorKind k) {
    if (!(original > 0) || !(scaled > 0)) return 0;
    return (squared(k) ? 10 : 20) * std::log10(scaled / original);
}

const SimVector* frequencies(const SimPlot& p) {
    for (const auto& v : p.vectors)
        if (v.kind == VectorKind::frequency) return &v;
    return nullptr;
}

// One noise vector of the original against the scaled deck's, mapped back by `back`.
VectorResult compare_vector(const SimVector& o, const SimVector& s, double back,
                            const SimVector* freq, const Tolerances& tol) {
    VectorResult r{o.name, o.kind};
    std::size_t n = std::min(o.values.size(), s.values.size());
    double peak_s = 0;
    for (std::size_t k = 0; k < n; ++k) {
        r.peak = std::max(r.peak, std::fabs(o.values[k].real()));
        peak_s = std::max(peak_s, std::fabs(s.values[k].real() * back));
    }
    // Relative to the larger peak: an original that is zero everywhere (a flicker part with
    // KF = 0) must not hide a scaled deck that is not.
    double floor = std::max(r.peak, peak_s);
    for (std::size_t k = 0; k < n && floor > 0; ++k) {
        double a = o.values[k].real(), b = s.values[k].real() * back;
        double e = std::fabs(b - a) / floor;
        if (e > r.worst || k == 0) {
            r.worst = e;
            r.at = freq && k < freq->values.size() ? freq->values[k].real() : 0;
            r.db_error = ratio_db(b, a, o.kind);
        }
    }
    if (o.values.size() != s.values.size()) r.worst = std::max(r.worst, 1.0);
    r.passed = r.worst <= tol.relative;
    return r;
}

// ngspice integrates each noise source's output PSD piecewise as a power law fitted to the
// logarithms of its end points, taking the log of at least N_MINLOG = 1e-38 V^2/Hz (ngspice
// 39 src/include/ngspice/noisedef.h, Nintegrate in src/maths/ni/niinteg.c). Where a
// source's PSD crosses that floor the fit is wrong, and since rescaling moves every PSD by
// Km it crosses at other points in the two runs: seen in ngspice 39.3 as a 1.5e-4 difference
// of inoise_total_r1 of an RC ladder swept to 1e5 times its corner (its output PSD there
// 1e-44 V^2/Hz, divided by a gain of 1e-27 for the input-referred part), with every
// spectrum and both overall totals exact. A source's part is seen only with points per
// summary (its `onoise_<part>` spectrum); the parts below the floor are named here, and
// their integrated noise is left unjudged where it differs.
std::set<std::string> below_floor(const SimPlot& spectra) {
    std::set<std::string> out;
    for (const auto& v : spectra.vectors) {
        if (!istarts_with(v.name, "onoise") || iequals(v.name, "onoise_spectrum")) continue;
        bool sq = squared(v.kind);
        for (const auto& x : v.values) {
            double psd = sq ? std::fabs(x.real()) : x.real() * x.real();
            if (psd > 0 && psd < 1e-38) {
                out.insert(to_lower(v.name));
                break;
            }
        }
    }
    return out;
}

// The spectrum part an integrated vector belongs to: "inoise_total_r1_thermal" ->
// "onoise_r1_thermal"; "" for the overall totals.
std::string part_of(const std::string& total) {
    for (const char* p : {"onoise_total", "inoise_total"})
        if (istarts_with(total, p) && total.size() > std::string_view(p).size())
            return "onoise" + to_lower(total.substr(std::string_view(p).size()));
    return "";
}

void compare_plot(const SimPlot& o, const SimPlot& s, bool integrated, double km, double kf,
                  const Tolerances& tol, const std::set<std::string>& floored, Comparison& c) {
    const SimVector* freq = integrated ? nullptr : frequencies(o);
    std::string unjudged;
    for (const auto& vo : o.vectors) {
        auto factor = noise_factor(vo.kind, integrated, km, kf);
        if (!factor) continue;
        const SimVector* vs = s.find(vo.name);
        if (!vs) {
            c.problems.push_back(
                fmt::format("'{}' exists in the original but not in the scaled deck", vo.name));
            continue;
        }
        VectorResult r = compare_vector(vo, *vs, 1 / *factor, freq, tol);
        mark_non_finite(r, vo, *vs);
        if (!r.passed && integrated && floored.count(part_of(vo.name))) {
            unjudged +=
                fmt::format("{}{} ({:.3g})", unjudged.empty() ? "" : ", ", vo.name, r.worst);
            continue;
        }
        c.vectors.push_back(r);
    }
    if (!unjudged.empty())
        c.notes.push_back(
            "not judged, as their source's noise falls below ngspice's integration floor "
            "(1e-38 V^2/Hz) at some frequencies, where the two runs integrate it "
            "differently: " +
            unjudged);
    for (const auto& vs : s.vectors)
        if (noise_factor(vs.kind, integrated, km, kf) && !o.find(vs.name))
            c.problems.push_back(
                fmt::format("'{}' exists in the scaled deck but not in the original", vs.name));
}

}  // namespace

std::optional<double> noise_factor(VectorKind kind, bool integrated, double km, double kf) {
    switch (kind) {
        case VectorKind::voltage_density:
            return std::sqrt(km);
        case VectorKind::current_density:
            return 1 / std::sqrt(km);
        case VectorKind::voltage_squared_density:
            return km;
        case VectorKind::current_squared_density:
            return 1 / km;
        case VectorKind::voltage_squared:
            return km * kf;
        case VectorKind::current_squared:
            return kf / km;
        case VectorKind::voltage:
            return integrated ? std::optional<double>(std::sqrt(km * kf)) : std::nullopt;
        case VectorKind::current:
            return integrated ? std::optional<double>(std::sqrt(kf / km)) : std::nullopt;
        default:
            return std::nullopt;
    }
}

Comparison compare_noise(const SimPlot& so, const SimPlot& ss, const SimPlot* to, const SimPlot* ts,
                         double km, double kf, const Tolerances& tol) {
    Comparison c;
    c.analysis = "noise";
    c.axis_unit = "Hz";
    const SimVector* fo = frequencies(so);
    const SimVector* fs = frequencies(ss);
    if (!fo || !fs) {
        c.problems.push_back("a noise plot without a frequency vector");
        return c;
    }
    check_mapped_sweep(*fo, *fs, kf, c);
    std::set<std::string> floored = below_floor(so);
    floored.merge(below_floor(ss));
    compare_plot(so, ss, false, km, kf, tol, floored, c);
    if (to && ts)
        compare_plot(*to, *ts, true, km, kf, tol, floored, c);
    else if (to || ts)
        c.problems.push_back("only one of the runs integrated its noise");
    sort_worst_first(c);
    return c;
}

bool integrated_noise(const VectorResult& v) {
    return v.kind == VectorKind::voltage || v.kind == VectorKind::current ||
           v.kind == VectorKind::voltage_squared || v.kind == VectorKind::current_squared;
}

}  // namespace deckscale
