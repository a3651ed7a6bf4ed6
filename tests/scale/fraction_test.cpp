// Exact rationals for the exponents of Km and Kf (scale/fraction).
#include "scale/fraction.hpp"

#include <gtest/gtest.h>

namespace deckscale {
namespace {

TEST(Fraction, StaysExactAndReduced) {
    EXPECT_EQ(Fraction::of(2, -4), (Fraction{-1, 2}));
    EXPECT_EQ(Fraction::of(1, 3) + Fraction::of(1, 6), Fraction::of(1, 2));
    EXPECT_EQ(Fraction::of(3, 4) / Fraction::of(3, 8), Fraction::of(2));
    EXPECT_THROW(Fraction::of(INT64_MAX) * Fraction::of(2), ExponentOverflow);
}

TEST(Fraction, LinearFormsDropTermsThatCancel) {
    LinearForm f{{0, Fraction::of(1)}, {1, Fraction::of(1, 2)}};
    add_scaled(f, LinearForm{{1, Fraction::of(1)}, {2, Fraction::of(3)}}, Fraction::of(-1, 2));
    EXPECT_EQ(f, (LinearForm{{0, Fraction::of(1)}, {2, Fraction::of(-3, 2)}}));
}

}  // namespace
}  // namespace deckscale
