// compare_tran (verify/compare.hpp): a transient pair on the original's time axis.
#include <algorithm>
#include <cmath>
#include <vector>

#include <fmt/format.h>

#include "verify/compare.hpp"
#include "verify/compare_parts.hpp"
#include "verify/event_timing.hpp"
#include "verify/ringing.hpp"

namespace deckscale {

namespace {

// Either run rings (verify/ringing.hpp) around the original's point k or the scaled run's
// interval [j, j+1]: any of the five-point windows that hold the point or an end of the
// interval (a ringing that ends on a jump is seen from its last points).
bool ringing_near(const SimVector& o, const SimVector& to, const SimVector& s,
                  const SimVector& ts, std::size_t k, std::size_t j) {
    for (std::size_t d = 0; d < 5; ++d) {
        if (k + d >= 3 && rings_at(o.values, to.values, k + d - 3)) return true;
        if (j + d >= 3 && rings_at(s.values, ts.values, j + d - 3)) return true;
    }
    return false;
}

}  // namespace

Comparison compare_tran(const SimPlot& o, const SimPlot& s, double km, double kf, const Tolerances& tol) {
    Comparison c;
    c.analysis = "tran";
    c.axis_unit = "s";
    const SimVector* to = scale_vector(o);
    const SimVector* ts = scale_vector(s);
    if (!to || !ts || to->values.empty() || ts->values.empty()) {
        c.problems.push_back("a transient plot without a time vector");
        return c;
    }
    c.points = to->values.size();
    c.first = to->values.front().real();
    c.last = to->values.back().real();
    auto pairs = pairs_to_compare(o, s, c);
    // Scaled times mapped back onto the original time axis.
    std::vector<double> tmap(ts->values.size());
    for (std::size_t j = 0; j < tmap.size(); ++j) tmap[j] = ts->values[j].real() * kf;
    std::vector<double> torig(to->values.size());
    for (std::size_t k = 0; k < torig.size(); ++k) torig[k] = to->values[k].real();
    // Event-driven models: the runs may be up to two of their longest steps apart in time.
    double shift =
        tol.event_driven ? 2 * std::max(longest_step(torig), longest_step(tmap)) : 0;
    // Samples outside the scaled run would be compared against its end values: say so instead.
    double slack = 1e-9 * std::max(std::fabs(c.last - c.first), std::fabs(c.last));
    if (tmap.front() > c.first + slack || tmap.back() < c.last - slack)
        c.problems.push_back(fmt::format("the scaled run covers {:.6g} s .. {:.6g} s of the original's "
                                         "time, not {:.6g} s .. {:.6g} s",
                                         tmap.front(), tmap.back(), c.first, c.last));
    for (const auto& [po, vs] : pairs) {
        const SimVector& vo = *po;
        VectorResult r{vo.name, vo.kind};
        double back = back_factor(vo, km, tol);
        for (const auto& x : vo.values) r.peak = std::max(r.peak, std::fabs(x.real()));
        double floor = std::max(r.peak, noise_floor(vo.kind));
        if (floor == 0) floor = 1e-300;
        std::size_t j = 0;
        std::size_t ringing_points = 0;  // where only the ringing average agrees
        std::size_t shifted_points = 0;  // where only the runs a step or two apart agree
        for (std::size_t k = 0; k < to->values.size() && k < vo.values.size(); ++k) {
            double t = to->values[k].real();
            while (j + 1 < tmap.size() && tmap[j + 1] < t) ++j;
            if (j + 1 >= tmap.size() || t < tmap.front()) continue;
            double t0 = tmap[j], t1 = tmap[j + 1];
            double w = t1 > t0 ? (t - t0) / (t1 - t0) : 0;
            w = std::clamp(w, 0.0, 1.0);
            double y0 = vs->values[j].real(), y1 = vs->values[j + 1].real();
            double linear = ((1 - w) * y0 + w * y1) * back;
            double e = std::fabs(linear - vo.values[k].real());
            // Between two time points the scaled run's waveform is known only from its
            // neighbours: where one run took a long step over a smooth curve (a sine), the
            // straight line between its points misses the curve by ~h^2 y''/8, which is no
            // error of the rewrite. A parabola through the nearer third point follows such a
            // curve; at a corner (a PWL breakpoint) the line does. The closer of the two counts:
            // a wrong value is wrong in both.
            std::size_t third = j == 0 ? j + 2
                                : j + 2 >= tmap.size()
                                    ? j - 1
                                    : (t - tmap[j - 1] <= tmap[j + 2] - t ? j - 1 : j + 2);
            if (e > 0 && third < tmap.size() && third < vs->values.size()) {
                double t2 = tmap[third], y2 = vs->values[third].real();
                if (t0 != t1 && t0 != t2 && t1 != t2) {
                    double q = y0 * (t - t1) * (t - t2) / ((t0 - t1) * (t0 - t2)) +
                               y1 * (t - t0) * (t - t2) / ((t1 - t0) * (t1 - t2)) +
                               y2 * (t - t0) * (t - t1) / ((t2 - t0) * (t2 - t1));
                    e = std::min(e, std::fabs(q * back - vo.values[k].real()));
                }
            }
            if (e > tol.transient * floor && ringing_near(vo, *to, *vs, *ts, k, j)) {
                double so = ringing_average(vo.values, to->values, k);
                double ss = ((1 - w) * ringing_average(vs->values, ts->values, j) +
                             w * ringing_average(vs->values, ts->values, j + 1)) *
                            back;
                // A ringing run's value is known only within the band it swings in (the
                // average leaves a rest where the steps or the swing are uneven, and at an
                // edge's corner the last value before the jump is one side of the swing).
                auto [lo, hi] = ringing_band(vs->values, ts->values, j);
                auto [lo_o, hi_o] = ringing_band(vo.values, to->values, k > 0 ? k - 1 : k);
                double averaged = std::min({std::fabs(ss - so),
                                            std::max({0.0, lo * back - so, so - hi * back}),
                                            std::max({0.0, lo_o - linear, linear - hi_o})});
                if (averaged < e) {
                    e = averaged;
                    if (e <= tol.transient * floor) ++ringing_points;
                }
            }
            if (e > 0 && shift > 0) {
                double d = shifted_error(Trace{torig, vo.values}, k,
                                         Trace{tmap, vs->values, back}, shift);
                if (d < e) {
                    if (e > tol.transient * floor && d <= tol.transient * floor) ++shifted_points;
                    e = d;
                }
            }
            e /= floor;
            if (e > r.worst) {
                r.worst = e;
                r.at = t;
            }
        }
        if (shifted_points > 0)
            c.notes.push_back(fmt::format(
                "{}: agrees at {} point(s) only with the runs up to {:.3g} s (two of the longest "
                "time steps) apart: the deck's event-driven models act only at the simulator's "
                "time points, so their edges, and what they drive, land a step or two apart in "
                "the two runs; timing differences within that are not judged (a smaller "
                "largest step, verify --max-step or Python max_step=, judges them more finely)",
                vo.name, shifted_points, shift));
        if (ringing_points > 0)
            c.notes.push_back(fmt::format(
                "{}: trapezoidal ringing (values or slopes alternating from step to step) at {} "
                "point(s), compared there by the average of neighbouring points",
                vo.name, ringing_points));
        if (r.peak == 0 && noise_floor(vo.kind) == 0) {
            r.worst = 0;
            for (const auto& x : vs->values)
                if (x.real() != 0) r.worst = 1;
        }
        r.passed = r.worst <= tol.transient || tol.held;
        mark_non_finite(r, vo, *vs);
        c.vectors.push_back(r);
    }
    excuse_gmin_level(o, s, km, tol, c);
    bool failed = std::any_of(c.vectors.begin(), c.vectors.end(),
                              [](const VectorResult& v) { return !v.passed; });
    if (tol.event_driven && failed)
        // Measured: a PWM into an RC at Kf = 3 and 1 us steps differed by 1.6e-3 of its peak,
        // 2.2e-4 at 0.2 us (verify/event_timing.hpp).
        c.notes.push_back(fmt::format(
            "the deck's event-driven models place their edges only to within a time step (up "
            "to {:.3g} s here), and the two runs step apart: a pulse a step wider or narrower "
            "changes what a filter or integrator after it settles to. Run verify again with a "
            "smaller --max-step: an error that falls with the step is that resolution, one that "
            "stays is the rewrite's",
            shift / 2));
    else if (tol.code_models && failed)
        // Measured: integrators of the shared notes' int_limit deck driven into their limits,
        // Kf = 1000, 1 us steps: 7.2e-3 apart (so by hand too); 8.1e-6 at --max-step 0.1u.
        c.notes.push_back(fmt::format(
            "the deck's XSPICE code models integrate, limit or switch at the simulator's time "
            "points, outside its truncation-error control, and the two runs step apart (steps "
            "up to {:.3g} s here). Run verify again with a smaller --max-step: an error that "
            "falls with the step is that resolution, one that stays is the rewrite's",
            std::max(longest_step(torig), longest_step(tmap))));
    else if (tol.delay_lines && failed)
        // ngspice 39's lossless line sets a breakpoint one delay after each change of slope
        // (src/spicelib/devices/tra/traacct.c, at an absolute 1 V/s that no card can set).
        // Measured: a 0.5 ns pulse edge on a 5 ns line, Km 3: Kf 8 exact, Kf 7 6.6e-3 at the
        // deck's steps, 2.2e-3 at --max-step 10p, 5.6e-4 at 5p, 1.1e-4 at 1p.
        c.notes.push_back(fmt::format(
            "the deck's lossless lines (T) set a breakpoint one delay after each change of "
            "slope, at instants the two runs round apart unless Kf is a power of two, and the "
            "corners between them are resolved only to a time step (up to {:.3g} s here). Run "
            "verify again with a smaller --max-step: an error that falls with the step is that "
            "resolution, one that stays is the rewrite's",
            std::max(longest_step(torig), longest_step(tmap))));
    sort_worst_first(c);
    return c;
}

}  // namespace deckscale
