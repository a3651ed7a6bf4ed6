#include "deck/sweep_rewrite.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>
#include <optional>

#include "base/text_util.hpp"
#include "deck/decimal.hpp"
#include "deck/spice_number.hpp"
#include "deck/sweep_steps.hpp"

namespace deckscale {
namespace {

// The algorithm of the shared notes "control-and-sweeps.md" B.4: at most 15 significant digits
// (ngspice's reader is exact only there), the shortest faithful text, then the stop value
// nudged until the stepping model counts the original's points, then every point checked.

constexpr int kMaxDigits = 15;
constexpr double kPointTolerance = 1e-9;  // relative, every point against factor x original

double ulp(double x) {
    x = std::fabs(x);
    return std::nextafter(x, std::numeric_limits<double>::infinity()) - x;
}

// Shortest text in the spelling of `like` that ngspice reads within 2 ulps of x (the sweep
// checks use the value read, not x); the 15-digit text when none is.
std::string faithful(const SpiceNumber& like, double x) {
    for (int d = 1; d < kMaxDigits; ++d) {
        // Rounded to d digits, laid out as for 15 (a plain "100000" stays plain, not "1e+05").
        std::string s = respell(like, to_decimal(x, d), kMaxDigits);
        if (std::fabs(ngspice_read(s) - x) <= 2 * ulp(x)) return s;
    }
    return respell(like, x, kMaxDigits);
}

// The 15-digit text of x with k added to its last digit (in magnitude); nullopt when the
// result would need a 16th digit or is not positive.
std::optional<std::string> nudged(const SpiceNumber& like, double x, long long k) {
    if (!std::isfinite(x)) return std::nullopt;
    Decimal d = to_decimal(x, kMaxDigits);
    std::string digits = d.digits;
    digits.resize(kMaxDigits, '0');
    long long v = std::stoll(digits) + k;
    if (v <= 0 || v >= 1'000'000'000'000'000LL) return std::nullopt;
    Decimal out;
    out.negative = d.negative;
    out.digits = std::to_string(v);
    out.exponent = d.exponent - (kMaxDigits - static_cast<int>(out.digits.size()));
    while (out.digits.size() > 1 && out.digits.back() == '0') out.digits.pop_back();
    return respell(like, out, kMaxDigits);
}

// The nudge of smallest |k| that passes `ok`: k = 1, 2, 4, ... upwards, then downwards, and
// bisection between the last failing and the first passing k.
std::optional<std::string> nudge_search(const SpiceNumber& like, double x,
                                        const std::function<bool(const std::string&)>& ok) {
    for (long long sign : {1LL, -1LL})
        for (long long k = 1; k <= (1LL << 40); k *= 2) {
            auto s = nudged(like, x, sign * k);
            if (!s) break;
            if (!ok(*s)) continue;
            long long lo = k / 2, hi = k;  // the smallest passing k lies in (lo, hi]
            while (hi - lo > 1) {
                long long mid = (lo + hi) / 2;
                auto t = nudged(like, x, sign * mid);
                if (t && ok(*t))
                    hi = mid;
                else
                    lo = mid;
            }
            return nudged(like, x, sign * hi);
        }
    return std::nullopt;
}

std::optional<SpiceNumber> number(std::string_view text) {
    auto p = parse_spice_number(text);
    if (!p.number || p.problem != NumberProblem::none) return std::nullopt;
    return p.number;
}

// Largest relative distance of `got` from factor x `want` (`floor`: smallest magnitude to
// relate to); infinity when the counts differ.
double worst_error(const SweepPoints& got, const SweepPoints& want, double factor,
                   double floor = 0) {
    if (got.endless || got.values.size() != want.values.size())
        return std::numeric_limits<double>::infinity();
    double worst = 0;
    for (std::size_t i = 0; i < got.values.size(); ++i) {
        double target = want.values[i] * factor;
        double scale = std::max({std::fabs(target), floor, 1e-300});
        worst = std::max(worst, std::fabs(got.values[i] - target) / scale);
    }
    return worst;
}

SweepRewrite refuse(std::string why) { return SweepRewrite{{}, std::move(why)}; }

SweepRewrite rewrite_frequencies(SweepKind kind, const std::vector<std::string_view>& fields,
                                 double factor, double reltol) {
    if (fields.size() != 4)
        return refuse("a frequency sweep needs dec|oct|lin, points, fstart, fstop");
    std::string type = to_lower(fields[0]);
    if (type != "dec" && type != "oct" && type != "lin")
        return refuse(fmt::format("unknown sweep type '{}'", fields[0]));
    auto start = number(fields[2]), stop = number(fields[3]);
    if (!number(fields[1]) || !start || !stop)
        return refuse("the sweep's fields are not plain numbers");
    double n = ngspice_read(fields[1]), x0 = ngspice_read(fields[2]), x1 = ngspice_read(fields[3]);
    auto points = [&](double a, double b, bool count_only = false) {
        return kind == SweepKind::ac ? ac_points(type, n, a, b, reltol, count_only)
                                     : noise_points(type, n, a, b, reltol, count_only);
    };
    SweepPoints original = points(x0, x1);
    if (original.over_limit)
        return refuse(fmt::format("this sweep asks for {:.6g} points, more than the {} this "
                                  "check steps through: write fewer points",
                                  original.asked, kSweepPointLimit));
    if (original.endless)
        return refuse(
            "ngspice 39 never ends this sweep (its frequency runs away): the original "
            "card itself does not work");
    std::string s0 = faithful(*start, factor * x0), s1 = faithful(*stop, factor * x1);
    SweepRewrite out{{std::string(fields[0]), std::string(fields[1]), s0, s1}, {}};
    if (original.values.empty()) return out;  // ngspice rejects it either way
    double y0 = ngspice_read(s0);
    std::function<bool(const std::string&)> ok;
    if (kind == SweepKind::ac && type == "dec") {
        // acan.c:89: floor(N * |log10(fstop / fstart)|) points decide everything. Keep that
        // product in the original's integer interval, 4 ulps from its ends (another libm's
        // log10 agrees then) unless the original sits closer, or keep the ratio bit for bit.
        double nn = static_cast<double>(std::max(count_field(n), 1L));
        double p0 = std::fabs(std::log10(x1 / x0)) * nn;
        double k = std::floor(p0), m = 4 * ulp(std::max(k, 1.0));
        double lo = p0 >= k + m ? k + m : k, hi = p0 < k + 1 - m ? k + 1 - m : k + 1;
        ok = [=](const std::string& s) {
            double y1 = ngspice_read(s);
            if (y1 / y0 == x1 / x0) return true;
            double p = std::fabs(std::log10(y1 / y0)) * nn;
            return lo <= p && p < hi;
        };
    } else {
        // Every other sweep counts by its stop test f <= fstop + tolerance.
        ok = [&](const std::string& s) {
            SweepPoints p = points(y0, ngspice_read(s), true);
            return !p.endless && p.count == original.values.size();
        };
    }
    if (!ok(s1)) {
        auto s = nudge_search(*stop, factor * x1, ok);
        if (!s)
            return refuse(
                fmt::format("no fstop of at most 15 digits makes ngspice 39 step through "
                            "the original's {} points",
                            original.values.size()));
        out.fields[3] = *s;
    }
    double err = worst_error(points(y0, ngspice_read(out.fields[3])), original, factor);
    if (!(err <= kPointTolerance))
        return refuse(
            fmt::format("the rewritten sweep would not visit the original's {} points "
                        "times the factor within {:g}",
                        original.values.size(), kPointTolerance));
    return out;
}

SweepRewrite rewrite_dc(const std::vector<std::string_view>& fields, double factor) {
    if (fields.size() != 3) return refuse("a DC sweep level needs start, stop and step");
    auto start = number(fields[0]), stop = number(fields[1]), step = number(fields[2]);
    if (!start || !stop || !step) return refuse("the sweep's fields are not plain numbers");
    double x0 = ngspice_read(fields[0]), x1 = ngspice_read(fields[1]), xs = ngspice_read(fields[2]);
    SweepPoints original = dc_points(x0, x1, xs);
    if (original.over_limit)
        return refuse(fmt::format("this DC sweep asks for {:.6g} points, more than the {} this "
                                  "check steps through: write fewer points",
                                  original.asked, kSweepPointLimit));
    if (original.endless)
        return refuse(
            "ngspice 39 never ends this DC sweep (a step of 0?): the original card "
            "itself does not work");
    std::string s0 = faithful(*start, factor * x0), s1 = faithful(*stop, factor * x1);
    std::string ss = faithful(*step, factor * xs);
    double y0 = ngspice_read(s0), ys = ngspice_read(ss);
    std::size_t n0 = original.values.size();
    auto count = [&](const std::string& s) {
        SweepPoints p = dc_points(y0, ngspice_read(s), ys, true);
        return p.endless ? ~std::size_t{0} : p.count;
    };
    if (n0 > 0 && count(s1) != n0) {
        // dctrcurv.c:218: the last point v[n0-1] must pass the stop test and v[n0] fail it,
        // which holds for any stop in [v[n0-1] - tol, v[n0] - tol) (mirrored for step < 0).
        double last = y0;
        for (std::size_t i = 1; i < n0; ++i) last += ys;
        double next = last + ys, sg = std::copysign(1.0, ys);
        double tol = std::numeric_limits<double>::epsilon() * 1e3;
        double lo = last - sg * tol, hi = next - sg * tol;
        double mu =
            std::min(std::fabs(hi - lo) / 4, 64 * ulp(std::max(std::fabs(lo), std::fabs(hi))));
        double want = factor * x1;
        want = sg > 0 ? std::clamp(want, lo + mu, hi - mu) : std::clamp(want, hi + mu, lo - mu);
        s1 = respell(*stop, want, kMaxDigits);
        if (count(s1) != n0) s1 = respell(*stop, (lo + hi) / 2, kMaxDigits);
    }
    double err =
        worst_error(dc_points(y0, ngspice_read(s1), ys), original, factor, std::fabs(factor * xs));
    if (!(err <= kPointTolerance))
        return refuse(
            fmt::format("no stop value of at most 15 digits makes ngspice 39 step "
                        "through the original's {} points times the factor",
                        n0));
    return SweepRewrite{{s0, s1, ss}, {}};
}

SweepRewrite rewrite_tran(const std::vector<std::string_view>& fields, double factor) {
    if (fields.size() < 2 || fields.size() > 4)
        return refuse("a transient needs tstep, tstop [, tstart [, tmax]]");
    std::vector<SpiceNumber> like;
    std::vector<double> x;
    SweepRewrite out;
    for (auto f : fields) {
        auto n = number(f);
        if (!n) return refuse("the transient's times are not plain numbers");
        like.push_back(*n);
        x.push_back(ngspice_read(f));
        out.fields.push_back(faithful(*n, factor * x.back()));
    }
    double t0 = fields.size() > 2 ? x[2] : 0;
    long n0 = linearize_points(x[0], x[1], t0);
    if (n0 > 0) {
        // linear.c:85: (int)((tstop - tstart) / tstep + 1.5) points after linearize.
        auto ok = [&](const std::string& s) {
            double y0 = fields.size() > 2 ? ngspice_read(out.fields[2]) : 0;
            return linearize_points(ngspice_read(out.fields[0]), ngspice_read(s), y0) == n0;
        };
        if (!ok(out.fields[1])) {
            auto s = nudge_search(like[1], factor * x[1], ok);
            if (!s)
                return refuse(
                    fmt::format("no tstop of at most 15 digits keeps the {} points of "
                                "linearize",
                                n0));
            out.fields[1] = *s;
        }
    }
    for (std::size_t i = 0; i < x.size(); ++i) {
        double want = factor * x[i], got = ngspice_read(out.fields[i]);
        if (!(std::fabs(got - want) <= kPointTolerance * std::fabs(want)))
            return refuse("a transient time cannot be written within 1e-9 of the scaled value");
    }
    return out;
}

}  // namespace

SweepRewrite rewrite_sweep(SweepKind kind, const std::vector<std::string_view>& fields,
                           double factor, double reltol) {
    // A value the factor pushes out of a double's range has no text to write.
    for (std::string_view f : fields)
        if (auto x = number(f)) {
            double y = factor * x->value;
            if (!std::isfinite(y) || (x->value != 0 && y == 0))
                return refuse(fmt::format("'{}' times {:.6g} is out of the range of numbers", f,
                                          factor));
        }
    switch (kind) {
        case SweepKind::ac:
        case SweepKind::noise:
            return rewrite_frequencies(kind, fields, factor, reltol);
        case SweepKind::dc:
            return rewrite_dc(fields, factor);
        case SweepKind::tran:
            return rewrite_tran(fields, factor);
    }
    return refuse("unknown sweep kind");
}

}  // namespace deckscale
