// Numbers as ngspice 39 reads them on element and dot cards (ngspice 39 manual, section
// 2.1.4, "Values"; shared notes deck-syntax.md §2), and respell(), which rewrites a value
// in the spelling style of the original.
#include "deck/spice_number.hpp"

#include <gtest/gtest.h>

#include <charconv>
#include <cmath>
#include <cstring>
#include <random>
#include <string>

namespace deckscale {
namespace {

struct GoodRow {
    int line;
    const char* text;
    double value;
    const char* mantissa;
    const char* suffix;
    const char* tail;
};

// ngspice 39 manual, section 2.1.4: integer, floating point, exponent and scale-suffix forms;
// suffixes T G MEG K M MIL U N P F in either case; letters after the suffix are ignored.
TEST(SpiceNumber, AcceptedForms) {
    const GoodRow rows[] = {
        {__LINE__, "12", 12, "12", "", ""},
        {__LINE__, "-44", -44, "-44", "", ""},
        {__LINE__, "+7", 7, "+7", "", ""},
        {__LINE__, "3.14", 3.14, "3.14", "", ""},
        {__LINE__, ".5", 0.5, ".5", "", ""},
        {__LINE__, "5.", 5, "5.", "", ""},
        {__LINE__, "1e-14", 1e-14, "1e-14", "", ""},
        {__LINE__, "2.65E3", 2650, "2.65E3", "", ""},
        {__LINE__, "2e+3", 2000, "2e+3", "", ""},
        {__LINE__, "1d3", 1000, "1d3", "", ""},  // Fortran exponent on element lines
        {__LINE__, "1T", 1e12, "1", "T", ""},
        {__LINE__, "1t", 1e12, "1", "t", ""},
        {__LINE__, "1G", 1e9, "1", "G", ""},
        {__LINE__, "1g", 1e9, "1", "g", ""},
        {__LINE__, "1MEG", 1e6, "1", "MEG", ""},
        {__LINE__, "2.2Meg", 2.2e6, "2.2", "Meg", ""},
        {__LINE__, "1meg", 1e6, "1", "meg", ""},
        {__LINE__, "1K", 1e3, "1", "K", ""},
        {__LINE__, "1k", 1e3, "1", "k", ""},
        {__LINE__, "1M", 1e-3, "1", "M", ""},  // M is milli, not mega
        {__LINE__, "1m", 1e-3, "1", "m", ""},
        {__LINE__, "1MIL", 25.4e-6, "1", "MIL", ""},
        {__LINE__, "1mil", 25.4e-6, "1", "mil", ""},
        {__LINE__, "1U", 1e-6, "1", "U", ""},
        {__LINE__, "1u", 1e-6, "1", "u", ""},
        {__LINE__, "1N", 1e-9, "1", "N", ""},
        {__LINE__, "1n", 1e-9, "1", "n", ""},
        {__LINE__, "1P", 1e-12, "1", "P", ""},
        {__LINE__, "1p", 1e-12, "1", "p", ""},
        {__LINE__, "1F", 1e-15, "1", "F", ""},  // femto, not farad
        {__LINE__, "1f", 1e-15, "1", "f", ""},
        {__LINE__, "10uF", 10e-6, "10", "u", "F"},
        {__LINE__, "1kOhm", 1e3, "1", "k", "Ohm"},
        {__LINE__, "1MEGOHM", 1e6, "1", "MEG", "OHM"},
        {__LINE__, "1e3Ohm", 1e3, "1e3", "", "Ohm"},
        {__LINE__, "159mHz", 159e-3, "159", "m", "Hz"},
        {__LINE__, "10V", 10, "10", "", "V"},
        {__LINE__, "1a", 1, "1", "", "a"},  // no atto in ngspice 39: a unit letter
        {__LINE__, "-4.7e-3uF", -4.7e-9, "-4.7e-3", "u", "F"},
        // Longer than 64 characters: the exponent must not be cut off (it once was).
        {__LINE__, "1.00000000000000000000000000000000000000000000000000000000000000001e5", 1e5,
         "1.00000000000000000000000000000000000000000000000000000000000000001e5", "", ""},
        {__LINE__, "1e308", 1e308, "1e308", "", ""},
        {__LINE__, "3e-308", 3e-308, "3e-308", "", ""},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line << ": " << row.text);
        auto p = parse_spice_number(row.text);
        EXPECT_EQ(p.problem, NumberProblem::none);
        ASSERT_TRUE(p.number.has_value());
        EXPECT_NEAR(p.number->value, row.value, std::fabs(row.value) * 1e-12);
        EXPECT_EQ(p.number->mantissa, row.mantissa);
        EXPECT_EQ(p.number->suffix, row.suffix);
        EXPECT_EQ(p.number->tail, row.tail);
    }
}

// Suffix-free numbers read to the very same double as std::from_chars gives (which rounds
// correctly), whichever path the reader takes: random digits, dots, exponents and signs,
// many beyond the limits of the fast path (15 digits, powers of ten up to 22).
TEST(SpiceNumber, ValuesEqualFromChars) {
    std::mt19937 rng(7);
    for (int it = 0; it < 200000; ++it) {
        std::string s;
        if (rng() % 4 == 0) s += rng() % 2 ? '-' : '+';
        int before = static_cast<int>(rng() % 20), after = static_cast<int>(rng() % 20);
        if (before == 0 && after == 0) before = 1;
        for (int i = 0; i < before; ++i) s += static_cast<char>('0' + rng() % 10);
        if (after > 0 || rng() % 2) {
            s += '.';
            if (before == 0 && after == 0) after = 1;
        }
        for (int i = 0; i < after; ++i) s += static_cast<char>('0' + rng() % 10);
        bool signed_d = false;
        if (rng() % 2) {
            char letter = "eEdD"[rng() % 4];
            s += letter;
            if (rng() % 2) {
                s += rng() % 2 ? '-' : '+';
                signed_d = letter == 'd' || letter == 'D';
            }
            s += std::to_string(rng() % 40);
        }
        auto p = parse_spice_number(s);
        if (signed_d) {  // refused: see RefusedForms
            ASSERT_EQ(p.problem, NumberProblem::signed_d_exponent) << s;
            continue;
        }
        ASSERT_TRUE(p.number) << s;
        std::string c = s.front() == '+' ? s.substr(1) : s;
        for (auto& ch : c)
            if (ch == 'd' || ch == 'D') ch = 'e';
        double want = 0;
        std::from_chars(c.data(), c.data() + c.size(), want);
        ASSERT_EQ(std::memcmp(&want, &p.number->value, sizeof want), 0)
            << s << ": " << want << " vs " << p.number->value;
    }
}

TEST(SpiceNumber, ExponentLetterIsKept) {
    struct {
        int line;
        const char* text;
        bool has_exponent;
        char letter;
    } rows[] = {
        {__LINE__, "1e3", true, 'e'},   {__LINE__, "1E3", true, 'E'},
        {__LINE__, "1d3", true, 'd'},   {__LINE__, "1D3", true, 'D'},
        {__LINE__, "1k", false, 'e'},   {__LINE__, "1dB", false, 'e'},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line << ": " << row.text);
        auto p = parse_spice_number(row.text);
        ASSERT_TRUE(p.number.has_value());
        EXPECT_EQ(p.number->has_exponent, row.has_exponent);
        EXPECT_EQ(p.number->exponent_letter, row.letter);
    }
}

struct BadRow {
    int line;
    const char* text;
    NumberProblem problem;
    const char* message;  // describe(problem, text)
};

// Spellings ngspice 39 reads differently from what they seem to say (deck-syntax.md §2;
// ngspice 39 manual, section 2.1.4): refused, each with its own reason.
TEST(SpiceNumber, RefusedForms) {
    using P = NumberProblem;
    const BadRow rows[] = {
        {__LINE__, "1.2.3", P::trailing_junk,
         "malformed number '1.2.3': ngspice 39 would silently read only '1.2'"},
        {__LINE__, "1.2.3k", P::trailing_junk,
         "malformed number '1.2.3k': ngspice 39 would silently read only '1.2'"},
        {__LINE__, "1_000", P::trailing_junk,
         "malformed number '1_000': ngspice 39 would silently read only '1'"},
        {__LINE__, "0x10", P::trailing_junk,
         "malformed number '0x10': ngspice 39 would silently read only '0x'"},
        {__LINE__, "4k7", P::rkm_style,
         "RKM-style value '4k7' is ambiguous: ngspice 39 reads '4k' in its default mode but the "
         "digits after the letter in its compatibility mode (ngbehavior=lt); write it with a "
         "decimal point"},
        {__LINE__, "4R7", P::rkm_style,
         "RKM-style value '4R7' is ambiguous: ngspice 39 reads '4R' in its default mode but the "
         "digits after the letter in its compatibility mode (ngbehavior=lt); write it with a "
         "decimal point"},
        {__LINE__, "2.2\xC2\xB5"
                   "F",
         P::non_ascii,
         "number '2.2\xC2\xB5"
         "F' has a non-ASCII character after '2.2': it is no SPICE scale suffix (write 'u' for "
         "micro) and ngspice 39 would ignore it"},
        // Beyond a double: ngspice 39 reads infinity or 0 (checked with ngspice -b 39: a
        // resistor of 1e999 reports resistance inf, one of 1e-999 is read as 0 and replaced
        // by its 1 mOhm minimum).
        {__LINE__, "1e999", P::out_of_range,
         "number '1e999' is outside the range of a double (about 2.2e-308 to 1.8e308): ngspice 39 "
         "would read infinity or 0"},
        {__LINE__, "-1e-999", P::out_of_range,
         "number '-1e-999' is outside the range of a double (about 2.2e-308 to 1.8e308): ngspice "
         "39 would read infinity or 0"},
        {__LINE__, "1e300T", P::out_of_range,
         "number '1e300T' is outside the range of a double (about 2.2e-308 to 1.8e308): ngspice "
         "39 would read infinity or 0"},
        // A signed Fortran exponent: ngspice 39 reads "1d3" as 1000 but stops at the sign of
        // "1d-14" (tried with libngspice 39: a diode model's is=1d-14 reads 1, "R1 a 0 1d-7"
        // is -7 Ohm, ".tran 1d-6 1d-5" is refused with "TSTOP is invalid").
        {__LINE__, "1d-14", P::signed_d_exponent,
         "Fortran-style exponent with a sign in '1d-14': ngspice 39 reads a D exponent only "
         "without one ('1d3' is 1000) and stops at the sign here, so it does not read the value "
         "meant; write '1e-14'"},
        {__LINE__, "2.5D+2k", P::signed_d_exponent,
         "Fortran-style exponent with a sign in '2.5D+2k': ngspice 39 reads a D exponent only "
         "without one ('1d3' is 1000) and stops at the sign here, so it does not read the value "
         "meant; write '2.5E+2k'"},
        {__LINE__, "abc", P::not_a_number, "'abc' is not a number"},
        {__LINE__, "", P::not_a_number, "'' is not a number"},
        {__LINE__, ".", P::not_a_number, "'.' is not a number"},
        {__LINE__, "-", P::not_a_number, "'-' is not a number"},
        {__LINE__, "{1k}", P::not_a_number, "'{1k}' is not a number"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line << ": " << row.text);
        auto p = parse_spice_number(row.text);
        EXPECT_FALSE(p.number.has_value());
        EXPECT_EQ(p.problem, row.problem);
        EXPECT_EQ(describe(p.problem, row.text), row.message);
    }
}

TEST(SpiceNumber, SuffixMultiplier) {
    struct {
        int line;
        const char* suffix;
        double multiplier;
    } rows[] = {
        {__LINE__, "", 1},      {__LINE__, "t", 1e12},   {__LINE__, "G", 1e9},
        {__LINE__, "Meg", 1e6}, {__LINE__, "k", 1e3},    {__LINE__, "M", 1e-3},
        {__LINE__, "Mil", 25.4e-6}, {__LINE__, "u", 1e-6}, {__LINE__, "N", 1e-9},
        {__LINE__, "p", 1e-12}, {__LINE__, "F", 1e-15},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line << ": " << row.suffix);
        EXPECT_DOUBLE_EQ(suffix_multiplier(row.suffix), row.multiplier);
    }
}

struct RespellRow {
    int line;
    const char* original;
    double factor;
    const char* expected;
};

TEST(SpiceNumber, RespellKeepsTheStyle) {
    const RespellRow rows[] = {
        // suffix kept, re-chosen so the mantissa lies in [1, 1000), its case kept
        {__LINE__, "4.7uF", 0.01, "47nF"},
        {__LINE__, "10k", 2, "20k"},
        {__LINE__, "10K", 100, "1MEG"},
        {__LINE__, "10k", 100, "1meg"},
        {__LINE__, "2.2Meg", 10, "22Meg"},
        {__LINE__, "2.2MEG", 1000, "2.2G"},
        {__LINE__, "47kOhm", 2, "94kOhm"},
        {__LINE__, "-4.7u", 0.01, "-47n"},
        {__LINE__, "100p", 1e-3, "100f"},
        {__LINE__, "1mil", 1, "25.4u"},  // MIL is never chosen
        {__LINE__, "999.99999k", 1, "1meg"},  // rounding first, then the suffix
        // milli is always a lower-case 'm', an upper-case M reads as mega to people
        {__LINE__, "1K", 1e-6, "1m"},
        {__LINE__, "1MEG", 1e-8, "10m"},
        {__LINE__, "5M", 1, "5m"},
        // from a suffix into the plain range
        {__LINE__, "1k", 1e-3, "1"},
        {__LINE__, "1kF", 1e-3, "0.001kF"},  // a bare "1F" would read as femto
        {__LINE__, "1kOhm", 1e-3, "1Ohm"},
        // beyond femto and tera: scientific notation, never exponent and suffix together
        {__LINE__, "1f", 3.18309886e-3, "3.183099e-18"},
        {__LINE__, "20fF", 1e-4, "2e-18"},  // "2e-18F" would read as femto
        {__LINE__, "2fOhm", 1e-4, "2e-19Ohm"},
        {__LINE__, "5T", 2000, "1e16"},
        {__LINE__, "60k", 1, "60k"},
        // exponent form keeps exponent form and the letter's case
        {__LINE__, "1e-14", 2, "2e-14"},
        {__LINE__, "2.65E3", 2, "5.3E3"},
        {__LINE__, "1e3Ohm", 2, "2e3Ohm"},
        // plain stays plain
        {__LINE__, "1000", 2, "2000"},
        {__LINE__, "0.5", 2, "1"},
        {__LINE__, "3.14", 0.5, "1.57"},
        {__LINE__, "10V", 3, "30V"},
        // milli before a tail that starts like the rest of MIL or MEG would read as them
        // (found by the number fuzz target): micro instead
        {__LINE__, "2020nil", 1e4, "20200uil"},
        {__LINE__, "5nEGG", 1e6, "5000uEGG"},
        {__LINE__, "5nF", 1e6, "5mF"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line << ": " << row.original
                                        << " x " << row.factor);
        auto p = parse_spice_number(row.original);
        ASSERT_TRUE(p.number.has_value());
        std::string text = respell(*p.number, p.number->value * row.factor, 7);
        EXPECT_EQ(text, row.expected);
        // What is written reads back as the intended value.
        auto back = parse_spice_number(text);
        ASSERT_TRUE(back.number.has_value()) << text;
        double want = p.number->value * row.factor;
        EXPECT_NEAR(back.number->value, want, std::fabs(want) * 1e-6);
    }
}

TEST(SpiceNumber, RespellWithFactorOneIsStableForTheTable) {
    // A value rewritten with factor 1 must read back as the same value.
    for (const char* text : {"4.7uF", "1MEG", "2.65E3", ".5", "159mHz", "1d3"}) {
        SCOPED_TRACE(text);
        auto p = parse_spice_number(text);
        ASSERT_TRUE(p.number.has_value());
        auto back = parse_spice_number(respell(*p.number, p.number->value, 7));
        ASSERT_TRUE(back.number.has_value());
        EXPECT_DOUBLE_EQ(back.number->value, p.number->value);
    }
}

TEST(SpiceNumber, RespellNeverWritesExponentAndSuffix) {
    // With 1 or 2 digits a %g-style mantissa of 60 would be "6e+01": before a suffix that reads
    // as 60e3 in dot cards but as 60 in the control language (ngspice-39.3
    // src/frontend/parser/numparse.c: exponent or suffix, not both).
    const RespellRow rows[] = {
        {__LINE__, "10k", 6, "60k"},
        {__LINE__, "1u", 470, "500u"},
        {__LINE__, "2MEG", 40, "80MEG"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line << ": " << row.original);
        auto p = parse_spice_number(row.original);
        ASSERT_TRUE(p.number.has_value());
        EXPECT_EQ(respell(*p.number, p.number->value * row.factor, 1), row.expected);
    }
}

TEST(SpiceNumber, FormatPlain) {
    EXPECT_EQ(format_plain(1.0 / (2 * 3.141592653589793 * 1e6), 7), "1.591549e-07");
    EXPECT_EQ(format_plain(2.2 * 3, 12), "6.6");
    EXPECT_EQ(format_plain(1000, 7), "1000");
}

}  // namespace
}  // namespace deckscale
