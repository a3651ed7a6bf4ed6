// Unit tests of the shifted comparison used for decks with event-driven models: synthetic
// waveforms, no simulator runs.
#include <cmath>
#include <complex>
#include <limits>
#include <vector>

#include <gtest/gtest.h>

#include "verify/event_timing.hpp"

namespace deckscale {
namespace {

using cd = std::complex<double>;

// A 0 -> 1 step whose edge (one step wide) starts at `edge`, sampled every `h` up to `stop`.
struct Wave {
    std::vector<double> t;
    std::vector<cd> y;
};

Wave step_run(double h, double stop, double edge, double high = 1) {
    Wave r;
    for (int k = 0; k * h <= stop * (1 + 1e-12); ++k) {
        double x = k * h;
        r.t.push_back(x);
        r.y.push_back(x <= edge ? 0.0 : x >= edge + h ? high : high * (x - edge) / h);
    }
    return r;
}

double error_at(const Wave& o, double t, const Wave& s, double shift) {
    std::size_t k = 0;
    while (k + 1 < o.t.size() && o.t[k] < t) ++k;
    return shifted_error(Trace{o.t, o.y}, k, Trace{s.t, s.y}, shift);
}

double worst(const Wave& o, const Wave& s, double shift) {
    double w = 0;
    for (std::size_t k = 0; k < o.t.size(); ++k)
        w = std::max(w, shifted_error(Trace{o.t, o.y}, k, Trace{s.t, s.y}, shift));
    return w;
}

TEST(EventTiming, LongestStep) {
    EXPECT_EQ(longest_step({}), 0);
    EXPECT_EQ(longest_step({1}), 0);
    EXPECT_DOUBLE_EQ(longest_step({0, 1, 1.5, 4, 4.5}), 2.5);
}

// An edge one step late in the scaled run is forgiven with a window of two steps, at every
// point (those on the edge included), and not with a window of half a step.
TEST(EventTiming, AnEdgeAStepLateAgreesWithinTheWindow) {
    const double h = 0.2e-6;
    Wave o = step_run(h, 20e-6, 5e-6), s = step_run(h, 20e-6, 5e-6 + h);
    EXPECT_EQ(worst(o, s, 2 * h), 0);
    EXPECT_GT(worst(o, s, 0.5 * h), 0.4);
    // Early, too, and on a different grid.
    Wave early = step_run(0.13e-6, 20e-6, 5e-6 - 0.15e-6);
    EXPECT_EQ(worst(o, early, 2 * h), 0);
}

// An edge further apart than the window is still an error.
TEST(EventTiming, AnEdgeBeyondTheWindowIsCaught) {
    const double h = 0.2e-6;
    Wave o = step_run(h, 20e-6, 5e-6), s = step_run(h, 20e-6, 5e-6 + 4 * h);
    EXPECT_NEAR(worst(o, s, 2 * h), 1, 1e-12);
}

// A level 1 % too high or too low shows at the plateau whichever run is larger: each run's
// extreme lies outside the range of the other.
TEST(EventTiming, AWrongLevelIsCaughtBothWays) {
    const double h = 0.2e-6;
    Wave o = step_run(h, 20e-6, 5e-6);
    for (double level : {1.01, 0.99}) {
        Wave s = step_run(h, 20e-6, 5e-6 + h, level);
        EXPECT_NEAR(worst(o, s, 2 * h), 0.01, 1e-12) << level;
        EXPECT_NEAR(worst(s, o, 2 * h), 0.01, 1e-12) << level;
        EXPECT_NEAR(error_at(o, 15e-6, s, 2 * h), 0.01, 1e-12) << level;
    }
}

// A current of the scaled run is multiplied back by its factor (Km) before comparing.
TEST(EventTiming, TheScaledRunsFactorApplies) {
    const double h = 1;
    Wave o = step_run(h, 20, 5), s = step_run(h, 20, 5, 0.25);
    EXPECT_EQ(worst(o, s, 2 * h), 0.75);
    double w = 0;
    for (std::size_t k = 0; k < o.t.size(); ++k)
        w = std::max(w, shifted_error(Trace{o.t, o.y}, k, Trace{s.t, s.y, 4}, 2 * h));
    EXPECT_EQ(w, 0);
}

// Near a run's end the window reaches past it: an edge in the last step of one run has no
// counterpart in the other, and the smaller of the two distances counts there.
TEST(EventTiming, AtTheEndOneDirectionCounts) {
    const double h = 1;
    Wave o = step_run(h, 20, 19), s = step_run(h, 20, 25);  // the scaled edge is past the end
    EXPECT_EQ(error_at(o, 20, s, 2 * h), 0);
    // Away from the end the same pair fails, so the end rule does not spread.
    Wave o2 = step_run(h, 20, 10);
    EXPECT_EQ(error_at(o2, 15, s, 2 * h), 1);
}

TEST(EventTiming, BadInputIsInfinite) {
    const double inf = std::numeric_limits<double>::infinity();
    Wave o = step_run(1, 10, 5), empty;
    EXPECT_EQ(shifted_error(Trace{o.t, o.y}, 0, Trace{empty.t, empty.y}, 1), inf);
    EXPECT_EQ(shifted_error(Trace{empty.t, empty.y}, 0, Trace{o.t, o.y}, 1), inf);
    EXPECT_EQ(shifted_error(Trace{o.t, o.y}, o.t.size(), Trace{o.t, o.y}, 1), inf);
    Wave short_values = o;
    short_values.y.pop_back();
    EXPECT_EQ(shifted_error(Trace{o.t, o.y}, 0, Trace{short_values.t, short_values.y}, 1), inf);
}

// A window holding far more points than the scan looks at (a run that refined its steps
// around an edge) finds a smaller range: stricter, never laxer.
TEST(EventTiming, AVeryDenseWindowIsNeverLaxer) {
    Wave o = step_run(1, 20, 10);
    Wave dense = step_run(1e-3, 20, 10.5);
    EXPECT_EQ(worst(o, dense, 2), 0);  // the ends of the window still bound the range
    Wave late = step_run(1e-3, 20, 13);
    EXPECT_NEAR(worst(o, late, 2), 1, 1e-9);
}

}  // namespace
}  // namespace deckscale
