#include "verify/event_timing.hpp"

#include <algorithm>
#include <limits>
#include <utility>

namespace deckscale {
namespace {

// A window may hold many points where a run refined its steps around an edge; beyond this
// many the scan stops (the range found is then smaller: stricter, never laxer).
constexpr std::size_t kMaxScan = 512;

double value(const Trace& r, std::size_t i) { return r.y[i].real() * r.factor; }

// The index of the last point at or before x (0 when none is).
std::size_t before(const Trace& r, double x) {
    auto it = std::upper_bound(r.t.begin(), r.t.end(), x);
    return it == r.t.begin() ? 0 : static_cast<std::size_t>(it - r.t.begin()) - 1;
}

// The straight line through the run's points at time x (clamped to its ends).
double at(const Trace& r, double x) {
    if (x <= r.t.front()) return value(r, 0);
    if (x >= r.t.back()) return value(r, r.t.size() - 1);
    std::size_t i = before(r, x);
    double t0 = r.t[i], t1 = r.t[i + 1];
    double w = t1 > t0 ? (x - t0) / (t1 - t0) : 1;
    return (1 - w) * value(r, i) + w * value(r, i + 1);
}

// The lowest and highest value the run's waveform takes in [lo, hi].
std::pair<double, double> range_within(const Trace& r, double lo, double hi) {
    double a = at(r, lo), b = at(r, hi);
    double low = std::min(a, b), high = std::max(a, b);
    std::size_t i = before(r, lo) + 1;
    for (std::size_t n = 0; i < r.t.size() && r.t[i] < hi && n < kMaxScan; ++i, ++n) {
        low = std::min(low, value(r, i));
        high = std::max(high, value(r, i));
    }
    return {low, high};
}

double outside(double y, std::pair<double, double> range) {
    return std::max({0.0, range.first - y, y - range.second});
}

}  // namespace

double longest_step(const std::vector<double>& t) {
    double h = 0;
    for (std::size_t i = 1; i < t.size(); ++i) h = std::max(h, t[i] - t[i - 1]);
    return h;
}

double shifted_error(const Trace& original, std::size_t k, const Trace& scaled, double shift) {
    if (original.t.empty() || scaled.t.empty() || k >= original.t.size() ||
        original.y.size() < original.t.size() || scaled.y.size() < scaled.t.size())
        return std::numeric_limits<double>::infinity();
    double t = original.t[k];
    double lo = t - shift, hi = t + shift;
    double a = outside(value(original, k), range_within(scaled, lo, hi));
    double b = outside(at(scaled, t), range_within(original, lo, hi));
    // Where the window reaches past an end of a run, the run that is behind (or ahead) has no
    // values there to match the other's: one direction is all that can be asked.
    bool cut = lo < std::max(original.t.front(), scaled.t.front()) ||
               hi > std::min(original.t.back(), scaled.t.back());
    return cut ? std::min(a, b) : std::max(a, b);
}

}  // namespace deckscale
