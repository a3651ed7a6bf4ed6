#include "deck/sweep_steps.hpp"

#include <fmt/format.h>

#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <optional>

#include "base/text_util.hpp"
#include "deck/decimal.hpp"
#include "deck/spice_number.hpp"

namespace deckscale {

double ngspice_read(std::string_view s) {
    // INPevaluate (ngspice-39.3 src/spicelib/parser/inpeval.c): digits accumulate as
    // (10 * m + c) - '0' in double (l. 69, 113); the value is (sign * m) * pow(10, e) with e =
    // suffix + exponent - decimals (l. 198).
    std::size_t i = 0, n = s.size();
    double sign = 1;
    if (i < n && (s[i] == '+' || s[i] == '-')) sign = s[i++] == '-' ? -1 : 1;
    auto digit = [&](std::size_t k) { return k < n && s[k] >= '0' && s[k] <= '9'; };
    if (!(digit(i) || (i < n && s[i] == '.'))) return std::nan("");
    double m = 0;
    int e = 0;
    for (; digit(i); ++i) m = (10 * m + s[i]) - '0';
    if (i < n && s[i] == '.')
        for (++i; digit(i); ++i) {
            m = (10 * m + s[i]) - '0';
            --e;
        }
    if (i < n && std::strchr("eEdD", s[i])) {
        ++i;
        int esign = 1;
        if (i < n && (s[i] == '+' || s[i] == '-')) esign = s[i++] == '-' ? -1 : 1;
        int x = 0;
        for (; digit(i) && x < 100000; ++i) x = 10 * x + (s[i] - '0');
        e += esign * x;
    }
    if (i < n) {
        switch (ascii_lower(s[i])) {
            case 't':
                e += 12;
                break;
            case 'g':
                e += 9;
                break;
            case 'k':
                e += 3;
                break;
            case 'u':
                e -= 6;
                break;
            case 'n':
                e -= 9;
                break;
            case 'p':
                e -= 12;
                break;
            case 'f':
                e -= 15;
                break;
            case 'm':
                if (i + 2 < n && ascii_lower(s[i + 1]) == 'e' && ascii_lower(s[i + 2]) == 'g') {
                    e += 6;
                } else if (i + 2 < n && ascii_lower(s[i + 1]) == 'i' &&
                           ascii_lower(s[i + 2]) == 'l') {
                    e -= 6;
                    m *= 25.4;
                } else {
                    e -= 3;
                }
                break;
            default:
                break;
        }
    }
    return (sign * m) * std::pow(10.0, static_cast<double>(e));
}

long clamped_long(double f) {
    if (!(f < 9.2e18)) return std::numeric_limits<long>::max();  // NaN too
    if (!(f > -9.2e18)) return std::numeric_limits<long>::min();
    return static_cast<long>(f);
}

// Integer fields are read as floor(0.5 + value) (ngspice-39.3 src/spicelib/parser/inpgval.c:31).
// A count beyond a long is clamped; the point limit then stops the sweep.
long count_field(double v) { return clamped_long(std::floor(0.5 + v)); }

namespace {


// Pushes a point; false (and `endless` set) once the limit is passed, or at once when the
// step no longer moves the point: each loop's only state is the point, so a repeat is a loop
// without end (".ac lin 2e40 0.01 2" adds 1e-40 to 0.01; the deck fuzz target found that
// counting such a sweep to the limit, for every candidate of a nudge search, was slow).
bool push(SweepPoints& p, double v) {
    if (p.count > 0 && p.last == v) {
        p.endless = true;
        return false;
    }
    if (!p.count_only) p.values.push_back(v);
    p.last = v;
    if (++p.count > kSweepPointLimit) {
        p.endless = true;
        return false;
    }
    return true;
}

bool almost_equal_ulps(double a, double b, std::int64_t max_ulps) {
    if (a == b) return true;
    std::int64_t ia = 0, ib = 0;
    std::memcpy(&ia, &a, sizeof a);
    std::memcpy(&ib, &b, sizeof b);
    if ((ia < 0) != (ib < 0)) return false;
    return std::llabs(ia - ib) <= max_ulps;
}

// A sweep from fstart by `step` (a ratio for a log sweep) whose stop test lets it run to `end`
// (fstop plus the tolerance reltol gives) over more than twice kSweepPointLimit points: marks
// `p` as over the limit (stepping could never end below it). A reltol of 1e9 (".options
// reltol=1g") let a 201-point lin sweep run to the limit, at every step of the nudge search.
bool over_limit_to(SweepPoints& p, double fstart, double end, double step, bool log_sweep) {
    double asked = 0;
    if (log_sweep) {
        if (!(step > 1) || !(fstart > 0) || !(end > fstart)) return false;
        asked = std::log(end / fstart) / std::log(step) + 1;
    } else {
        if (!(step > 0) || !(end > fstart)) return false;
        asked = (end - fstart) / step + 1;
    }
    if (!(asked > 2.0 * static_cast<double>(kSweepPointLimit))) return false;
    p.endless = p.over_limit = true;
    p.asked = asked;
    return true;
}

// A sweep whose frequency moves away from its stop test's bound (a step below 0, a ratio
// below 1) while that test passes: it never ends (the point would fall for ever, or sit at
// 0), known without stepping to the limit. Found by the deck fuzz target: '.ac lin 201 400k
// 51222' with '.options reltol=-3k' stepped four million points per card (0.07 s each, 10 s
// for a deck of them under the sanitizers).
bool runs_away(SweepPoints& p, double fstart, double end, double step, bool log_sweep) {
    bool away = log_sweep ? step < 1 && step > 0 : step < 0;
    if (!away || !(fstart <= end)) return false;
    push(p, fstart);
    p.endless = true;
    return true;
}

// DBL_EPSILON * 1e3, the absolute stop tolerance of a DC level (dctrcurv.c:218).
const double kDcTolerance = std::numeric_limits<double>::epsilon() * 1e3;

}  // namespace

SweepPoints ac_points(std::string_view type, double points, double fstart, double fstop,
                      double reltol, bool count_only) {
    // acan.c:78-112 (setup), 226-256 (stop test), 346-382 (next frequency).
    SweepPoints p;
    p.count_only = count_only;
    long n = std::max(count_field(points), 1L);
    bool log_sweep = type != "lin";
    double delta = 0;
    if (type == "dec") {
        if (fstart <= 0) return p;
        double steps = std::floor(std::fabs(std::log10(fstop / fstart)) * static_cast<double>(n));
        delta = std::exp(std::log(fstop / fstart) / steps);
    } else if (type == "oct") {
        if (fstart <= 0) return p;
        delta = std::exp(std::log(2.0) / static_cast<double>(n));
    } else {
        delta = n - 1 > 1 ? (fstop - fstart) / static_cast<double>(n - 1) : 0;
    }
    if (!log_sweep && static_cast<std::size_t>(n) > kSweepPointLimit + 1) {
        p.endless = p.over_limit = true;
        p.asked = static_cast<double>(n);
        return p;
    }
    double tol = log_sweep ? delta * fstop * reltol : delta * reltol;
    if (over_limit_to(p, fstart, fstop + tol, delta, log_sweep)) return p;
    if (runs_away(p, fstart, fstop + tol, delta, log_sweep)) return p;
    // Room for the expected count at once (untouched room costs no memory): a sweep of
    // millions of points otherwise spends its time copying while it grows.
    double expected = 0;
    if (type == "lin") expected = static_cast<double>(n);
    if (type == "dec") expected = std::log(fstop / fstart) / std::log(delta) + 2;
    // NaN and inf aside: a step that rounds to nothing (dec 1e33: delta is 1) makes the
    // expected count infinite for a sweep of one point.
    if (!count_only && expected > 0 && std::isfinite(expected))
        p.values.reserve(static_cast<std::size_t>(
            std::min(expected, static_cast<double>(kSweepPointLimit) + 1)));
    for (double f = fstart; f <= fstop + tol;) {
        if (!push(p, f)) break;
        if (log_sweep) {
            f *= delta;
            if (delta == 1) break;
        } else {
            f += delta;
            if (delta == 0) break;
        }
    }
    return p;
}

SweepPoints noise_points(std::string_view type, double points, double fstart, double fstop,
                         double reltol, bool count_only) {
    // noisean.c:49-73, 108-128 (setup), 226-243, 302-318 (stepping).
    SweepPoints p;
    p.count_only = count_only;
    long n = count_field(points);
    if (n < 1) return p;
    bool lin = type == "lin";
    if (almost_equal_ulps(fstart, fstop, 3) || (n == 1 && lin)) {
        fstop = fstart;
        if (!lin) n = 1;
    }
    double delta = 0;
    if (type == "dec")
        delta = std::exp(std::log(10.0) / static_cast<double>(n));
    else if (type == "oct")
        delta = std::exp(std::log(2.0) / static_cast<double>(n));
    else
        delta = n == 1 ? 0 : (fstop - fstart) / static_cast<double>(n - 1);
    if (lin && static_cast<std::size_t>(n) > kSweepPointLimit + 1) {
        p.endless = p.over_limit = true;
        p.asked = static_cast<double>(n);
        return p;
    }
    double tol = lin ? delta * reltol : delta * fstop * reltol;
    if (over_limit_to(p, fstart, fstop + tol, delta, !lin)) return p;
    if (runs_away(p, fstart, fstop + tol, delta, !lin)) return p;
    for (double f = fstart; f <= fstop + tol;) {
        if (!push(p, f)) break;
        if (lin)
            f += delta;
        else
            f *= delta;
        if (n == 1 && lin) break;
    }
    return p;
}

SweepPoints dc_points(double start, double stop, double step, bool count_only) {
    // dctrcurv.c:215-268 (stop test, absolute), 453-466 (value += step).
    SweepPoints p;
    p.count_only = count_only;
    // More than the limit is known from the count: nothing is stepped ('.dc v1 10 1k 10u', 99
    // million points, stored up to the limit at every step of the rewrite's search, took 13 s
    // under the deck fuzz target's sanitizers; '.dc v1 10 1k 210u', 4.7 million, still 14 s
    // when only more than twice the limit was caught). n additions of the step put the last
    // point at most about n ulps off the count's, so a margin of 1e-6 and two points is
    // ample.
    double asked = (stop - start) / step + 1;
    double limit = static_cast<double>(kSweepPointLimit);
    if (step != 0 && std::isfinite(asked) && asked > limit * (1 + 1e-6) + 2) {
        p.endless = p.over_limit = true;
        p.asked = asked;
        return p;
    }
    // Room for the count asked, at once: growing a vector of millions of points step by step
    // spent most of a 2.4 million point sweep's 8 s under the fuzz target's sanitizers.
    if (!count_only && step != 0 && asked > 0 && std::isfinite(asked))
        p.values.reserve(static_cast<std::size_t>(std::min(asked + 2, limit + 1)));
    double sign = std::copysign(1.0, step);
    for (double v = start; !(sign * (v - stop) > kDcTolerance); v += step)
        if (!push(p, v)) break;
    return p;
}

long linearize_points(double tstep, double tstop, double tstart) {
    // linear.c:85-108: refused unless (tstop - tstart) * tstep > 0 and tstop - tstart >= tstep.
    if (!((tstop - tstart) * tstep > 0) || tstop - tstart < tstep) return 0;
    return clamped_long((tstop - tstart) / tstep + 1.5);
}

}  // namespace deckscale
