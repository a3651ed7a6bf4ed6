// Tests of the best fit of the impedance level: a property over random prototypes (the best
// worst-part error is no larger than at either end of the range, nor at any Km tried
// independently) and hand-checked cases.
#include "retarget/fit.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

namespace deckscale {
namespace {

SnapSeries series(int r, int c, int l) { return SnapSeries{e_series(r), e_series(c), e_series(l)}; }

TEST(BestFit, NeverWorseThanEitherEndOfTheRange) {
    std::mt19937_64 rng(2026);
    std::uniform_real_distribution<double> log_value(-3, 3), log_km(1, 3.5), width(0.05, 1.5);
    const int sizes[] = {3, 6, 12, 24, 48, 96, 192};
    std::uniform_int_distribution<int> pick(0, 6), count(2, 9), kind(0, 2);
    for (int trial = 0; trial < 80; ++trial) {
        std::vector<FitPart> parts;
        int n = count(rng);
        for (int i = 0; i < n; ++i) {
            char letter = "rcl"[kind(rng)];
            parts.push_back({std::string(1, letter) + std::to_string(i), letter,
                             std::pow(10.0, log_value(rng))});
        }
        SnapSeries s = series(sizes[pick(rng)], sizes[pick(rng)], sizes[pick(rng)]);
        double lo = std::pow(10.0, log_km(rng)), hi = lo * std::pow(10.0, width(rng));
        FitChoice best = best_fit(parts, s, lo, hi);
        ASSERT_GE(best.km, lo) << "trial " << trial;
        ASSERT_LE(best.km, hi) << "trial " << trial;
        double at_lo = fit_score(parts, s, lo).worst, at_hi = fit_score(parts, s, hi).worst;
        EXPECT_LE(best.score.worst, at_lo + 1e-12) << "trial " << trial;
        EXPECT_LE(best.score.worst, at_hi + 1e-12) << "trial " << trial;
        EXPECT_NEAR(best.score.worst, fit_score(parts, s, best.km).worst, 1e-15)
            << "trial " << trial;
        // Nor worse than any of 50 random Km in the range.
        std::uniform_real_distribution<double> inside(std::log(lo), std::log(hi));
        for (int k = 0; k < 50; ++k)
            EXPECT_LE(best.score.worst, fit_score(parts, s, std::exp(inside(rng))).worst + 1e-9)
                << "trial " << trial;
    }
}

TEST(BestFit, HandCheckedCases) {
    // One 1 F capacitor of the 1 Ohm prototype and a 1 Ohm resistor: at Km = 1000 the
    // capacitor is 1 mF and the resistor 1 kOhm, both E12 members (error 0); 500 and 2000 are
    // worse, so the best Km in 500 ... 2000 is 1000.
    std::vector<FitPart> parts{{"C1", 'c', 1}, {"R1", 'r', 1}};
    FitChoice f = best_fit(parts, series(12, 12, 12), 500, 2000);
    EXPECT_NEAR(f.km, 1000, 1e-9);
    EXPECT_NEAR(f.score.worst, 0, 1e-12);
    EXPECT_GT(fit_score(parts, series(12, 12, 12), 500).worst, 0.01);
    // With a capacitor that cannot land exactly, ties on the worst error go to the capacitor.
    std::vector<FitPart> two{{"C1", 'c', 1}, {"L1", 'l', 1}};
    FitChoice g = best_fit(two, series(3, 3, 3), 1, 10);
    EXPECT_LE(g.score.worst_capacitor, fit_score(two, series(3, 3, 3), 1).worst_capacitor + 1e-12);
}

}  // namespace
}  // namespace deckscale
