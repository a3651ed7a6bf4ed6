// Trapezoidal ringing: telling a waveform that swings from step to step from a smooth one,
// and the average and band it is compared by.
#include "verify/ringing.hpp"

#include <cmath>

#include <gtest/gtest.h>

namespace deckscale {
namespace {

using Values = std::vector<std::complex<double>>;

Values even_times(std::size_t n, double step = 1e-12) {
    Values t;
    for (std::size_t i = 0; i < n; ++i) t.push_back(static_cast<double>(i) * step);
    return t;
}

TEST(Ringing, AlternatingValuesAndAlternatingStepsRing) {
    Values t = even_times(8);
    Values flat{1.0, 1.01, 1.0, 1.01, 1.0, 1.01, 1.0, 1.01};
    EXPECT_TRUE(rings_at(flat, t, 1));
    // A ramp climbed in steep and shallow steps (as a C dv/dt current on an edge rang, read
    // off ngspice 39: 7.963e-4, 8.073e-4, 8.078e-4, 8.203e-4, 8.218e-4, ...).
    Values ramp{7.963e-4, 8.073e-4, 8.078e-4, 8.203e-4, 8.218e-4, 8.351e-4, 8.369e-4, 8.505e-4};
    EXPECT_TRUE(rings_at(ramp, t, 1));
    EXPECT_TRUE(rings_at(ramp, t, 2));
    Values sine;
    for (std::size_t i = 0; i < 8; ++i) sine.push_back(std::sin(0.3 * static_cast<double>(i)));
    for (std::size_t i = 1; i + 3 < 8; ++i) EXPECT_FALSE(rings_at(sine, t, i)) << i;
    EXPECT_FALSE(rings_at(flat, t, 0));  // no point before
    EXPECT_FALSE(rings_at(flat, t, 5));  // no point i + 3
}

TEST(Ringing, AJumpWrittenAsTwoNearPointsIsNoRinging) {
    // ngspice 39 wrote an edge's corner at 7.1 ns and the value after the jump 9e-18 s later.
    Values t{0.0, 1e-12, 2e-12, 3e-12, 3e-12 + 9e-18, 4e-12};
    Values y{1.0, 1.01, 1.0, 1.01, 0.4, 0.41};
    EXPECT_FALSE(rings_at(y, t, 1));
    EXPECT_DOUBLE_EQ(ringing_average(y, t, 3), (1.0 + 1.01) / 2);  // the side before the jump
    EXPECT_DOUBLE_EQ(ringing_average(y, t, 4), (0.4 + 0.41) / 2);  // the side after it
    EXPECT_DOUBLE_EQ(ringing_average(y, t, 1), (1.0 + 2 * 1.01 + 1.0) / 4);
    auto [lo, hi] = ringing_band(y, t, 2);  // points 1..3; the jump's far side left out
    EXPECT_DOUBLE_EQ(lo, 1.0);
    EXPECT_DOUBLE_EQ(hi, 1.01);
}

}  // namespace
}  // namespace deckscale
