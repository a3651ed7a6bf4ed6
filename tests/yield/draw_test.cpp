// Tests of the draws of a yield run: reproducible from (seed, trial, part) alone, with the
// moments of the distributions they stand for, and of reading --tolerance.
#include "yield/draw.hpp"

#include <gtest/gtest.h>

#include <cmath>

namespace deckscale {
namespace {

TEST(YieldDraw, ADrawDependsOnlyOnSeedTrialAndPart) {
    double a = draw(7, 12, "c3", Spread::uniform);
    // Draws of other trials and parts in between change nothing (no generator state).
    for (int t = 0; t < 100; ++t) draw(7, static_cast<std::uint64_t>(t), "r1", Spread::uniform);
    EXPECT_EQ(draw(7, 12, "c3", Spread::uniform), a);
    EXPECT_NE(draw(8, 12, "c3", Spread::uniform), a);
    EXPECT_NE(draw(7, 13, "c3", Spread::uniform), a);
    EXPECT_NE(draw(7, 12, "c4", Spread::uniform), a);
}

// Moments of 200000 draws against the distributions' (uniform on [-1, 1): mean 0, variance
// 1/3; normal with sigma 1/3: variance 1/9, 0.27 % beyond 3 sigma), common practice. The
// bounds are about 5 standard errors wide: a correct generator fails them with odds below
// one in a million.
TEST(YieldDraw, MomentsMatchTheDistributions) {
    struct Case {
        int line;
        Spread spread;
        double variance;
        double beyond_one;  // fraction of draws with |x| > 1
    };
    const Case cases[] = {{__LINE__, Spread::uniform, 1.0 / 3, 0.0},
                          {__LINE__, Spread::gauss, 1.0 / 9, 0.0027}};
    const int n = 200000;
    for (const Case& c : cases) {
        double sum = 0, sum2 = 0, beyond = 0;
        for (int t = 0; t < n; ++t) {
            double x = draw(1, static_cast<std::uint64_t>(t), "r1", c.spread);
            if (c.spread == Spread::uniform) {
                EXPECT_GE(x, -1) << c.line;
                EXPECT_LT(x, 1) << c.line;
            }
            sum += x;
            sum2 += x * x;
            beyond += std::abs(x) > 1;
        }
        double mean = sum / n, var = sum2 / n - mean * mean;
        EXPECT_NEAR(mean, 0, 5 * std::sqrt(c.variance / n)) << c.line;
        EXPECT_NEAR(var / c.variance, 1, 5 * std::sqrt(2.0 / n)) << c.line;
        EXPECT_NEAR(beyond / n, c.beyond_one, 5 * std::sqrt(0.0027 / n) + 1e-12) << c.line;
    }
}

TEST(YieldDraw, ToleranceTextsAreReadOrRefused) {
    struct Case {
        int line;
        const char* text;
        const char* error;  // "" when accepted
        const char* part;
        double tolerance;
    };
    const Case cases[] = {
        {__LINE__, "R=1%,C=5%,L=5%", "", "r7", 0.01},
        {__LINE__, "C=2%", "", "c1", 0.02},
        {__LINE__, "C=2%", "", "l1", 0.05},  // L keeps its default
        {__LINE__, "C3=0.5%", "", "c3", 0.005},
        {__LINE__, "C3=0.5%", "", "c4", 0.05},
        {__LINE__, "r=0.001", "", "r1", 0.001},
        {__LINE__, "R=0", "", "r1", 0},
        {__LINE__, "Q=1%", "'Q=1%': a kind is R, C or L", "", 0},
        {__LINE__, "R1", "'R1' is not NAME=VALUE (e.g. R=1%, C3=0.5%)", "", 0},
        {__LINE__, "R=x%", "'R=x%': the tolerance must be a number of 0 or more (1% or 0.01)", "",
         0},
        {__LINE__, "R=-1%", "'R=-1%': the tolerance must be a number of 0 or more (1% or 0.01)", "",
         0},
        {__LINE__, "R=100%", "'R=100%': a tolerance of 100% or more leaves no part value", "", 0},
    };
    for (const Case& c : cases) {
        ToleranceSpec spec;
        EXPECT_EQ(parse_tolerances(c.text, spec), c.error) << c.line;
        if (*c.error == 0) {
            EXPECT_DOUBLE_EQ(spec.of(c.part), c.tolerance) << c.line;
        }
    }
}

}  // namespace
}  // namespace deckscale
