// Tests of the statistics of a yield run against published values and exact cases.
#include "yield/stats.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "yield/draw.hpp"

namespace deckscale {
namespace {

// Wilson score intervals at 95 % from Newcombe, "Two-sided confidence intervals for the single
// proportion: comparison of seven methods", Statistics in Medicine 17 (1998) 857-872, Table II
// (method 3, score interval without continuity correction), given to 4 decimals there.
TEST(YieldStats, WilsonIntervalMatchesPublishedValues) {
    struct Case {
        int line;
        std::uint64_t passed, trials;
        double low, high;
    };
    const Case cases[] = {
        {__LINE__, 81, 263, 0.2553, 0.3662},
        {__LINE__, 15, 148, 0.0624, 0.1605},
        {__LINE__, 0, 20, 0.0, 0.1611},
        {__LINE__, 1, 29, 0.0061, 0.1718},
    };
    for (const Case& c : cases) {
        Interval i = wilson_interval(c.passed, c.trials);
        EXPECT_NEAR(i.low, c.low, 5e-5) << c.line;
        EXPECT_NEAR(i.high, c.high, 5e-5) << c.line;
    }
    // All passed: the interval reaches 1 and its lower end is the mirror of 0 of n.
    Interval all = wilson_interval(20, 20);
    EXPECT_DOUBLE_EQ(all.high, 1);
    EXPECT_NEAR(all.low, 1 - 0.1611, 5e-5);
}

TEST(YieldStats, SummaryQuantilesInterpolateBetweenOrderStatistics) {
    // 1..21: mean 11, sample sd sqrt(38.5), type-7 quantiles at 1 + 20 q.
    std::vector<double> v;
    for (int i = 21; i >= 1; --i) v.push_back(i);
    Summary s = summarize(v);
    EXPECT_EQ(s.count, 21u);
    EXPECT_DOUBLE_EQ(s.mean, 11);
    EXPECT_NEAR(s.sd, std::sqrt(38.5), 1e-12);
    EXPECT_DOUBLE_EQ(s.min, 1);
    EXPECT_DOUBLE_EQ(s.p5, 2);
    EXPECT_DOUBLE_EQ(s.median, 11);
    EXPECT_DOUBLE_EQ(s.p95, 20);
    EXPECT_DOUBLE_EQ(s.max, 21);
}

TEST(YieldStats, SensitivitiesRankTheParts) {
    // y = 2 a - 0.5 b exactly, c unrelated: slopes 2 and -0.5, c ranked last with no share.
    // a, b, c are independent uniform draws; with 4000 of them their sample correlations are
    // about 0.016, which moves each slope by less than 0.05.
    std::vector<double> a, b, c, y;
    for (std::uint64_t t = 0; t < 4000; ++t) {
        a.push_back(unit_uniform(1, t, 1) - 0.5);
        b.push_back(unit_uniform(1, t, 2) - 0.5);
        c.push_back(unit_uniform(1, t, 3) - 0.5);
        y.push_back(2 * a.back() - 0.5 * b.back());
    }
    auto r = rank_sensitivities({"b", "c", "a"}, {b, c, a}, y);
    ASSERT_EQ(r.size(), 3u);
    EXPECT_EQ(r[0].part, "a");
    EXPECT_EQ(r[1].part, "b");
    EXPECT_EQ(r[2].part, "c");
    EXPECT_NEAR(r[0].slope, 2, 0.05);
    EXPECT_NEAR(r[1].slope, -0.5, 0.05);
    EXPECT_NEAR(r[0].share + r[1].share, 1, 0.05);
    EXPECT_LT(r[2].share, 0.01);
}

}  // namespace
}  // namespace deckscale
