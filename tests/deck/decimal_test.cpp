// Fast significant-digit formatting against the C++ standard library's exact conversion
// (std::to_chars, which follows printf's %g/%e rules).
#include <gtest/gtest.h>

#include <charconv>
#include <cmath>
#include <random>
#include <string>

#include "deck/decimal.hpp"

namespace deckscale {
namespace {

std::string reference_general(double v, int p) {
    char buf[64];
    auto r = std::to_chars(buf, buf + sizeof buf, v, std::chars_format::general, p);
    return std::string(buf, r.ptr);
}

TEST(Decimal, GeneralMatchesPrintfStyle) {
    struct Row {
        int line;
        double value;
        int precision;
        const char* text;
    };
    const Row rows[] = {
        {__LINE__, 0, 7, "0"},
        {__LINE__, 1000, 7, "1000"},
        {__LINE__, 0.5, 9, "0.5"},
        {__LINE__, 1.0 / (2 * 3.141592653589793 * 1e6), 7, "1.591549e-07"},
        {__LINE__, 1e13, 7, "1e+13"},
        {__LINE__, -2.5e-5, 3, "-2.5e-05"},
        {__LINE__, 9.9999999999, 7, "10"},
        {__LINE__, 999.99995, 7, "1000"},
        {__LINE__, 0.0001234567, 7, "0.0001234567"},
        {__LINE__, 123456789, 9, "123456789"},
        {__LINE__, 1234567890, 9, "1.23456789e+09"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << r.line);
        EXPECT_EQ(general_text(to_decimal(r.value, r.precision), r.precision), r.text);
    }
}

TEST(Decimal, ScientificHasABareExponent) {
    EXPECT_EQ(scientific_text(to_decimal(1.5e-7, 7), 'e'), "1.5e-7");
    EXPECT_EQ(scientific_text(to_decimal(2e4, 7), 'E'), "2E4");
    EXPECT_EQ(scientific_text(to_decimal(-3.25, 9), 'e'), "-3.25e0");
}

// Random values over the whole range a deck uses: the fast path agrees with the exact
// conversion except, very rarely, by one unit in the last digit of a near-tie.
TEST(Decimal, AgreesWithExactConversion) {
    std::mt19937_64 rng(12345);
    std::uniform_real_distribution<double> mant(1.0, 10.0);
    std::uniform_int_distribution<int> expo(-18, 15);
    int mismatches = 0, total = 0;
    for (int p = 3; p <= 15; ++p) {
        for (int i = 0; i < 4000; ++i) {
            double v = mant(rng) * std::pow(10.0, expo(rng));
            ++total;
            std::string fast = general_text(to_decimal(v, p), p);
            std::string exact = reference_general(v, p);
            if (fast == exact) continue;
            ++mismatches;
            double a = std::stod(fast), b = std::stod(exact);
            EXPECT_LE(std::fabs(a - b), std::fabs(b) * 1.01 * std::pow(10.0, 1 - p))
                << v << " p=" << p << ": " << fast << " vs " << exact;
        }
    }
    EXPECT_LE(mismatches, total / 1000) << mismatches << " of " << total;
}

// The decade of a value comes from its binary exponent: check it over the whole range the
// fast path takes, and at decade boundaries where rounding carries into the next decade.
TEST(Decimal, DecadeIsRightOverTheWholeRange) {
    std::mt19937_64 rng(99);
    std::uniform_real_distribution<double> mant(1.0, 10.0);
    std::uniform_int_distribution<int> expo(-279, 279);
    for (int i = 0; i < 20000; ++i) {
        double v = mant(rng) * std::pow(10.0, expo(rng));
        int p = 1 + static_cast<int>(rng() % 12);
        Decimal d = to_decimal(v, p);
        double back = std::stod(d.digits.substr(0, 1) + "." + d.digits.substr(1) + "e" +
                                std::to_string(d.exponent));
        EXPECT_LE(std::fabs(back - v), std::fabs(v) * 1.01 * std::pow(10.0, 1 - p))
            << v << " p=" << p;
        EXPECT_NE(d.digits.front(), '0') << v;
    }
    for (int x = -270; x <= 270; x += 7) {
        double decade = std::stod("1e" + std::to_string(x));  // the double nearest 10^x
        EXPECT_EQ(to_decimal(decade, 9).exponent, x);
        EXPECT_EQ(to_decimal(decade, 9).digits, "1");
        Decimal up = to_decimal(decade * 0.99999999999, 6);  // rounds up to the decade
        EXPECT_EQ(up.digits, "1") << x;
        EXPECT_EQ(up.exponent, x) << x;
    }
}

}  // namespace
}  // namespace deckscale
