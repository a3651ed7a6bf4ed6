#include "verify/compare.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>

#include <fmt/format.h>
#include <fmt/ranges.h>

#include "base/text_util.hpp"
#include "verify/compare_parts.hpp"
#include "verify/helper_vectors.hpp"

namespace deckscale {

bool Comparison::passed() const {
    if (!problems.empty()) return false;
    return std::all_of(vectors.begin(), vectors.end(), [](const VectorResult& v) { return v.passed; });
}

const VectorResult* Comparison::worst() const { return vectors.empty() ? nullptr : &vectors.front(); }

// Node voltages and branch currents ("x#branch": voltage sources, inductors, E and H
// sources) are compared. Other '#' vectors are internal states of devices such as
// transmission lines ("t1#i1"), in the device's own normalisation, not port currents; so are
// the states of the helpers ngspice makes for behavioural L and C (verify/helper_vectors).
// The smallest magnitude an error is measured against: ngspice's own absolute tolerances
// (ABSTOL 1e-12 A, VNTOL 1e-6 V; ngspice 39 manual §15.1.1), below which it resolves nothing.
// A vector that is numerically zero in one deck (a source feeding only a high-impedance code
// model input: exactly 0 A in the original, -3.4e-21 A in the scaled run) is then not read as
// a 100 % error; an error of more than tolerance x 1e-12 A (or x 1e-6 V) still is.
double noise_floor(VectorKind kind) {
    if (kind == VectorKind::current) return 1e-12;
    if (kind == VectorKind::voltage) return 1e-6;
    return 0;
}

static bool internal_state(const SimVector& v, const SimPlot& p) {
    auto hash = v.name.find('#');
    return (hash != std::string::npos && v.name.compare(hash, std::string::npos, "#branch") != 0) ||
           translation_state(v, p);
}

// The swept quantity of a DC plot ("v-sweep", "i-sweep", "res-sweep", "temp-sweep").
static bool sweep_vector(const SimVector& v) { return v.name.ends_with("-sweep"); }

bool compared(const SimVector& v, const SimPlot& p) {
    return (v.kind == VectorKind::voltage || v.kind == VectorKind::current) &&
           !internal_state(v, p) && !sweep_vector(v);
}

static void note_internal_states(const SimPlot& o, Comparison& c) {
    for (const auto& v : o.vectors)
        if (internal_state(v, o)) c.not_compared.push_back(v.name);
}

// Factor that maps a scaled-deck value back onto the original: 1 for voltages, Km for currents,
// Km Kf for the flux of a magnetic loop.
double back_factor(const SimVector& v, double km, const Tolerances& tol) {
    if (v.kind == VectorKind::current && !tol.flux_currents.empty() &&
        tol.flux_currents.count(to_lower(v.name)))
        return km * tol.kf;
    return v.kind == VectorKind::current || current_as_voltage(v) ? km : 1;
}

const SimVector* scale_vector(const SimPlot& p) {
    for (const auto& v : p.vectors)
        if (v.kind == VectorKind::frequency || v.kind == VectorKind::time) return &v;
    return nullptr;
}

// Vectors of the original that the scaled deck lacks, and the other way round.
static void match_names(const SimPlot& o, const SimPlot& s, Comparison& c) {
    for (const auto& v : o.vectors)
        if (compared(v, o) && !s.find(v.name))
            c.problems.push_back(fmt::format("'{}' exists in the original but not in the scaled deck", v.name));
    for (const auto& v : s.vectors)
        if (compared(v, s) && !o.find(v.name))
            c.problems.push_back(fmt::format("'{}' exists in the scaled deck but not in the original", v.name));
}

// The vectors compared in both plots, in the original's order; the names only one plot has
// and the original's device-internal vectors go into `c`.
std::vector<std::pair<const SimVector*, const SimVector*>> pairs_to_compare(const SimPlot& o,
                                                                            const SimPlot& s,
                                                                            Comparison& c) {
    match_names(o, s, c);
    note_internal_states(o, c);
    std::vector<std::pair<const SimVector*, const SimVector*>> pairs;
    std::string empty;  // vectors ngspice made without values in both runs
    for (const auto& vo : o.vectors) {
        if (!compared(vo, o)) continue;
        const SimVector* vs = s.find(vo.name);
        if (!vs) continue;
        if (vo.values.empty() != vs->values.empty()) {
            c.problems.push_back(fmt::format("'{}' has values in the {} run only", vo.name,
                                             vo.values.empty() ? "scaled" : "original"));
        } else if (vo.values.empty()) {
            // ngspice 39's savecurrents vectors (@r1[i]) in an AC plot: made, never filled.
            empty += (empty.empty() ? "" : ", ") + vo.name;
        } else {
            pairs.emplace_back(&vo, vs);
        }
    }
    if (!empty.empty())
        c.notes.push_back("ngspice gave no values for " + empty + " in either run: not compared");
    return pairs;
}

// Marks the failed branch currents of `c` that stay at the GMIN level of the original plot
// (Tolerances::gmin) in both runs (the scaled one mapped back by Km) as passed and not
// judged, with a note naming each.
void excuse_gmin_level(const SimPlot& o, const SimPlot& s, double km, const Tolerances& tol,
                       Comparison& c) {
    if (tol.held || !(tol.gmin > 0)) return;
    double vmax = 0;
    for (const auto& v : o.vectors)
        if (v.kind == VectorKind::voltage && compared(v, o))
            for (const auto& x : v.values) vmax = std::max(vmax, std::abs(x));
    double level = kGminLevels * tol.gmin * vmax;
    for (auto& r : c.vectors) {
        if (r.passed || r.kind != VectorKind::current || !(r.peak <= level)) continue;
        const SimVector* vs = s.find(r.name);
        double scaled_peak = 0;
        if (vs)
            for (const auto& x : vs->values)
                scaled_peak = std::max(scaled_peak, std::abs(x) * back_factor(*vs, km, tol));
        if (!(scaled_peak <= level)) continue;
        r.passed = true;
        r.gmin_level = true;
        c.notes.push_back(fmt::format(
            "{}: not judged, its largest value {:.3g} A is within {:g} x GMIN ({:.3g} S) x the "
            "largest node voltage ({:.3g} V), the current of the simulator's GMIN shunts, which "
            "it resolves only as far as its matrix allows",
            r.name, std::max(r.peak, scaled_peak), kGminLevels, tol.gmin, vmax));
    }
}

static double wrap_degrees(double d) {
    while (d > 180) d -= 360;
    while (d < -180) d += 360;
    return d;
}


// Judged vectors first, worst first (an error that is no number, from NaN or infinite values
// in a run, first of all); then those at the GMIN level (not judged). Every comparison ends
// here, so a vector without a numeric error is also failed and named as a problem here:
// 'worst > tolerance' lets NaN through.
void mark_non_finite(VectorResult& r, const SimVector& original, const SimVector& scaled) {
    for (const SimVector* v : {&original, &scaled})
        for (const auto& x : v->values)
            if (!std::isfinite(x.real()) || !std::isfinite(x.imag())) {
                r.worst = std::numeric_limits<double>::quiet_NaN();
                return;
            }
}

void sort_worst_first(Comparison& c) {
    auto rank = [](double worst) {
        return std::isnan(worst) ? std::numeric_limits<double>::infinity() : worst;
    };
    std::vector<std::string> bad;
    for (auto& v : c.vectors)
        if (std::isnan(v.worst)) {
            v.passed = false;
            v.gmin_level = false;
            bad.push_back(v.name);
        }
    if (!bad.empty())
        c.problems.push_back(fmt::format(
            "no error can be computed for {} (NaN or infinite values in a run: the simulator "
            "could not evaluate the circuit there), so equivalence is not shown",
            fmt::join(bad, ", ")));
    std::stable_sort(c.vectors.begin(), c.vectors.end(),
                     [&](const VectorResult& a, const VectorResult& b) {
                         if (a.gmin_level != b.gmin_level) return b.gmin_level;
                         return rank(a.worst) > rank(b.worst);
                     });
}

std::size_t check_mapped_sweep(const SimVector& fo, const SimVector& fs, double kf, Comparison& c) {
    std::size_t n = std::min(fo.values.size(), fs.values.size());
    if (fo.values.size() != fs.values.size())
        c.problems.push_back(fmt::format("the sweeps have {} and {} points", fo.values.size(),
                                         fs.values.size()));
    for (std::size_t k = 0; k < n; ++k) {
        double f = fo.values[k].real(), g = fs.values[k].real();
        if (std::fabs(g - kf * f) > 1e-9 * std::fabs(kf * f)) {
            c.problems.push_back(fmt::format("point {}: the scaled deck ran at {:.9g} Hz, not at "
                                             "Kf x {:.9g} Hz", k, g, f));
            break;
        }
    }
    c.points = n;
    if (n) {
        c.first = fo.values.front().real();
        c.last = fo.values[n - 1].real();
    }
    return n;
}

Comparison compare_ac(const SimPlot& o, const SimPlot& s, double km, double kf, const Tolerances& tol) {
    Comparison c;
    c.analysis = "ac";
    c.axis_unit = "Hz";
    const SimVector* fo = scale_vector(o);
    const SimVector* fs = scale_vector(s);
    if (!fo || !fs) {
        c.problems.push_back("an AC plot without a frequency vector");
        return c;
    }
    std::size_t n = check_mapped_sweep(*fo, *fs, kf, c);
    for (const auto& [po, vs] : pairs_to_compare(o, s, c)) {
        const SimVector& vo = *po;
        VectorResult r{vo.name, vo.kind};
        double back = back_factor(vo, km, tol);
        // Magnitudes (hypot), dB and phases are costly: each is computed where it can matter.
        // A squared magnitude (std::norm) well below the square of the largest so far cannot
        // become the largest; any other point is judged exactly as every point would be.
        auto below = [](double square, double best) {
            return square < best * best * (1 - 1e-9);
        };
        for (std::size_t k = 0; k < n && k < vo.values.size(); ++k)
            if (!below(std::norm(vo.values[k]), r.peak))
                r.peak = std::max(r.peak, std::abs(vo.values[k]));
        double floor = std::max(r.peak, noise_floor(vo.kind));
        if (floor == 0) floor = 1e-300;
        bool every_point = tol.db > 0 || tol.degrees > 0 || tol.held;
        for (std::size_t k = 0; k < n && k < vo.values.size() && k < vs->values.size(); ++k) {
            std::complex<double> a = vo.values[k], b = vs->values[k] * back;
            if (!every_point && k > 0 && below(std::norm(b - a), r.worst * floor)) continue;
            double e = std::abs(b - a) / floor;
            if (!every_point && !(e > r.worst || k == 0)) continue;
            bool in_range = std::abs(a) > 1e-3 * r.peak && std::abs(b) > 0;
            double db = in_range ? 20 * std::log10(std::abs(b) / std::abs(a)) : 0;
            double deg = in_range ? wrap_degrees((std::arg(b) - std::arg(a)) * 180 / std::numbers::pi) : 0;
            if (tol.db > 0 && std::fabs(db) > tol.db) r.passed = false;
            if (tol.degrees > 0 && std::fabs(deg) > tol.degrees) r.passed = false;
            if (std::fabs(db) > r.max_db) {
                r.max_db = std::fabs(db);
                r.max_db_at = fo->values[k].real();
            }
            if (std::fabs(deg) > r.max_deg) {
                r.max_deg = std::fabs(deg);
                r.max_deg_at = fo->values[k].real();
            }
            if (e > r.worst || k == 0) {
                r.worst = e;
                r.at = fo->values[k].real();
                r.db_error = db;
                r.deg_error = deg;
            }
        }
        if (r.peak == 0 && noise_floor(vo.kind) == 0) {
            // An original that is zero everywhere: any non-zero scaled value is an error of 100 %.
            r.worst = 0;
            for (std::size_t k = 0; k < n && k < vs->values.size(); ++k)
                if (vs->values[k] != std::complex<double>(0)) r.worst = 1;
        }
        if (r.worst > tol.relative && !tol.held) r.passed = false;
        mark_non_finite(r, vo, *vs);
        c.vectors.push_back(r);
    }
    excuse_gmin_level(o, s, km, tol, c);
    sort_worst_first(c);
    return c;
}

Comparison compare_op(const SimPlot& o, const SimPlot& s, double km, const Tolerances& tol) {
    Comparison c;
    c.analysis = "op";
    c.points = 1;
    auto pairs = pairs_to_compare(o, s, c);
    // The largest value of each kind in either deck (scaled currents mapped back): an original
    // at 0 V everywhere must not hide a scaled deck that is not.
    double vmax = 0, imax = 0;
    for (const SimPlot* p : {&o, &s})
        for (const auto& v : p->vectors)
            if (compared(v, *p) && !v.values.empty()) {
                double x = std::abs(v.values[0]) * (p == &s ? back_factor(v, km, tol) : 1);
                double& m = v.kind == VectorKind::current ? imax : vmax;
                m = std::max(m, x);
            }
    for (const auto& [po, vs] : pairs) {
        const SimVector& vo = *po;
        if (vo.values.empty() || vs->values.empty()) continue;
        VectorResult r{vo.name, vo.kind};
        double a = vo.values[0].real(), b = vs->values[0].real() * back_factor(vo, km, tol);
        // Relative to the value itself, but never to less than a millionth of the largest
        // value of its kind (a node at 0 V must not make 1e-15 V look like an error).
        double scale = std::max(std::fabs(a), 1e-6 * (vo.kind == VectorKind::current ? imax : vmax));
        r.peak = std::fabs(a);
        r.worst = scale > 0 ? std::fabs(b - a) / scale : 0;
        r.passed = r.worst <= tol.relative || tol.held;
        mark_non_finite(r, vo, *vs);
        c.vectors.push_back(r);
    }
    excuse_gmin_level(o, s, km, tol, c);
    sort_worst_first(c);
    return c;
}

Comparison compare_dc(const SimPlot& o, const SimPlot& s, double km, double sweep_factor,
                      const std::string& unit, const Tolerances& tol) {
    Comparison c;
    c.analysis = "dc";
    c.axis_unit = unit;
    auto sweep_of = [](const SimPlot& p) -> const SimVector* {
        for (const auto& v : p.vectors)
            if (sweep_vector(v)) return &v;
        return nullptr;
    };
    const SimVector* xo = sweep_of(o);
    const SimVector* xs = sweep_of(s);
    if (!xo || !xs || xo->values.empty()) {
        c.problems.push_back("a DC plot without its swept values");
        return c;
    }
    std::size_t n = std::min(xo->values.size(), xs->values.size());
    if (xo->values.size() != xs->values.size())
        c.problems.push_back(fmt::format("the sweeps have {} and {} points", xo->values.size(),
                                         xs->values.size()));
    // A sweep through 0 steps onto values like 1e-17 instead: the points are judged against
    // the sweep's largest value.
    double span = 0;
    for (const auto& x : xo->values) span = std::max(span, std::fabs(x.real() * sweep_factor));
    for (std::size_t k = 0; k < n; ++k) {
        double want = xo->values[k].real() * sweep_factor, got = xs->values[k].real();
        if (std::fabs(got - want) > 1e-9 * std::max(std::fabs(want), span)) {
            c.problems.push_back(fmt::format("point {}: the scaled deck swept {:.9g} {}, not "
                                             "{:.9g} x {:.9g} {}",
                                             k, got, unit, sweep_factor, xo->values[k].real(), unit));
            break;
        }
    }
    c.points = n;
    c.first = xo->values.front().real();
    c.last = xo->values[n - 1].real();
    for (const auto& [po, vs] : pairs_to_compare(o, s, c)) {
        const SimVector& vo = *po;
        VectorResult r{vo.name, vo.kind};
        double back = back_factor(vo, km, tol);
        for (std::size_t k = 0; k < n && k < vo.values.size(); ++k)
            r.peak = std::max(r.peak, std::fabs(vo.values[k].real()));
        double floor = std::max(r.peak, noise_floor(vo.kind));
        if (floor == 0) floor = 1e-300;
        for (std::size_t k = 0; k < n && k < vo.values.size() && k < vs->values.size(); ++k) {
            double e = std::fabs(vs->values[k].real() * back - vo.values[k].real()) / floor;
            if (e > r.worst || k == 0) {
                r.worst = e;
                r.at = xo->values[k].real();
            }
        }
        r.passed = r.worst <= tol.relative || tol.held;
        mark_non_finite(r, vo, *vs);
        c.vectors.push_back(r);
    }
    excuse_gmin_level(o, s, km, tol, c);
    sort_worst_first(c);
    return c;
}

}  // namespace deckscale
