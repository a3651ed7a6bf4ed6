#include "retarget/measure.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "retarget/quantity.hpp"

namespace deckscale {
namespace {

// Points of each fine sweep: each refinement narrows the interval about twentyfold.
constexpr long kFinePoints = 41;
// Below this the node carries no signal (ngspice writes exact zeros as 0, here -inf dB).
constexpr double kNoResponseDb = -280;

AcSweep fine_sweep(double lo, double hi) {
    AcSweep s;
    s.type = "lin";
    s.points = kFinePoints;
    s.fstart = lo;
    s.fstop = hi;
    return s;
}

std::string range_text(const Sampled& s) {
    return fmt::format("{} to {}", frequency_text(s.freq.front()), frequency_text(s.freq.back()));
}

std::size_t extreme_index(const Sampled& s, bool highest) {
    auto it = highest ? std::max_element(s.db.begin(), s.db.end())
                      : std::min_element(s.db.begin(), s.db.end());
    return static_cast<std::size_t>(it - s.db.begin());
}

struct Extreme {
    double freq = 0, db = 0;
};

// Narrows the interval around the highest (lowest) point with `levels` fine sweeps; the
// centre and height of the last three points' parabola in log f give the answer when it
// is a maximum (a notch is V-shaped in dB: its lowest sample is kept).
std::string refine_extreme(const Sampled& coarse, std::size_t p, bool highest, int levels,
                           const SweepRunner& run, Measurement& m, Extreme& out) {
    double lo = coarse.freq[p - 1], hi = coarse.freq[p + 1];
    Sampled s = coarse;
    std::size_t q = p;
    for (int level = 0; level < levels; ++level) {
        SweepResult r = run(fine_sweep(lo, hi));
        ++m.sweeps;
        if (!r.problem.empty()) return r.problem;
        if (r.response.freq.size() < 3) break;
        s = std::move(r.response);
        q = extreme_index(s, highest);
        lo = s.freq[q == 0 ? 0 : q - 1];
        hi = s.freq[std::min(q + 1, s.freq.size() - 1)];
    }
    out = {s.freq[q], s.db[q]};
    if (!highest || q == 0 || q + 1 >= s.freq.size()) return "";
    double x0 = std::log(s.freq[q - 1]), x1 = std::log(s.freq[q]), x2 = std::log(s.freq[q + 1]);
    double y0 = s.db[q - 1], y1 = s.db[q], y2 = s.db[q + 1];
    double d01 = (y1 - y0) / (x1 - x0), d12 = (y2 - y1) / (x2 - x1);
    double a = (d12 - d01) / (x2 - x0);
    if (!(a < 0)) return "";
    // Newton's form y = y0 + d01 (x - x0) + a (x - x0)(x - x1); its vertex:
    double xv = (x0 + x1) / 2 - d01 / (2 * a);
    if (xv < x0 || xv > x2) return "";
    out = {std::exp(xv), y0 + d01 * (xv - x0) + a * (xv - x0) * (xv - x1)};
    return "";
}

// The bracket [j, j+1] where the response crosses `threshold`: the first one when `upward`
// (searching towards higher frequencies), else the last one.
std::optional<std::size_t> crossing(const Sampled& s, double threshold, bool upward) {
    std::optional<std::size_t> found;
    for (std::size_t j = 0; j + 1 < s.db.size(); ++j) {
        bool a = s.db[j] >= threshold, b = s.db[j + 1] >= threshold;
        if (a == b) continue;
        found = j;
        if (upward) break;
    }
    return found;
}

double interpolate(const Sampled& s, std::size_t j, double threshold) {
    double x0 = std::log(s.freq[j]), x1 = std::log(s.freq[j + 1]);
    double t = (threshold - s.db[j]) / (s.db[j + 1] - s.db[j]);
    return std::exp(x0 + t * (x1 - x0));
}

Measurement fail(Measurement m, std::string problem) {
    m.problem = std::move(problem);
    return m;
}

}  // namespace

const char* to_string(Feature f) {
    switch (f) {
        case Feature::corner:
            return "corner";
        case Feature::center:
            return "centre";
        case Feature::notch:
            return "notch";
    }
    return "";
}

Measurement measure(Feature feature, const AcSweep& coarse, const SweepRunner& run) {
    Measurement m;
    m.feature = feature;
    SweepResult first = run(coarse);
    ++m.sweeps;
    if (!first.problem.empty()) return fail(m, first.problem);
    const Sampled& s = first.response;
    if (s.freq.size() < 3) return fail(m, "the sweep gave fewer than 3 points; give a finer one");
    std::size_t top = extreme_index(s, true);
    if (!(s.db[top] > kNoResponseDb))
        return fail(m, fmt::format("the node has no response from {} (its magnitude is 0 "
                                   "throughout): is it connected to the driven part of the "
                                   "circuit?",
                                   range_text(s)));
    std::size_t n = s.freq.size();
    bool inside = top > 0 && top + 1 < n;
    const char* widen = "widen it with --sweep dec 50 F1 F2";
    if (feature == Feature::center || feature == Feature::notch) {
        bool highest = feature == Feature::center;
        std::size_t p = highest ? top : extreme_index(s, false);
        if (p == 0 || p + 1 >= n)
            return fail(m, fmt::format("the response's {} lies at the {} end of the sweep ({}, "
                                       "searched {}), so there is no {} inside it; {}",
                                       highest ? "highest point" : "lowest point",
                                       p == 0 ? "lower" : "upper", frequency_text(s.freq[p]),
                                       range_text(s), to_string(feature), widen));
        Extreme e;
        if (auto why = refine_extreme(s, p, highest, highest ? 3 : 4, run, m, e); !why.empty())
            return fail(m, why);
        m.freq = e.freq;
        m.level_db = e.db;
        return m;
    }
    Extreme peak{s.freq[top], s.db[top]};
    if (inside)
        if (auto why = refine_extreme(s, top, true, 2, run, m, peak); !why.empty())
            return fail(m, why);
    m.level_db = peak.db;
    double threshold = peak.db - kHalfPowerDb;
    Sampled above{{s.freq.begin() + top, s.freq.end()}, {s.db.begin() + top, s.db.end()}};
    Sampled below{{s.freq.begin(), s.freq.begin() + top + 1},
                  {s.db.begin(), s.db.begin() + top + 1}};
    bool upward = true;
    std::optional<std::size_t> j = crossing(above, threshold, true);
    Sampled bracket = above;
    if (!j) {
        upward = false;
        j = crossing(below, threshold, false);
        bracket = below;
    }
    if (!j)
        return fail(m, fmt::format("the response never falls 3.01 dB below its passband level "
                                   "({:.4g} dB) in the sweep searched ({}); {}",
                                   peak.db, range_text(s), widen));
    for (int level = 0; level < 2; ++level) {
        SweepResult r = run(fine_sweep(bracket.freq[*j], bracket.freq[*j + 1]));
        ++m.sweeps;
        if (!r.problem.empty()) return fail(m, r.problem);
        auto k = crossing(r.response, threshold, upward);
        if (!k) break;
        bracket = std::move(r.response);
        j = k;
    }
    m.freq = interpolate(bracket, *j, threshold);
    return m;
}

}  // namespace deckscale
