// Tests of the stress of a rescaled deck's parts, checked by hand against P = V^2 / R and
// I = V / R (common practice), with ngspice computing the node voltages.
#include "stress/measure.hpp"

#include <gtest/gtest.h>

#include <cmath>

#include "support/common.hpp"

namespace deckscale {
namespace {

// A divider of two 1 kOhm resistors from 10 V DC (AC 1), 100 nF across the lower one, and
// the same at Km = 0.1, Kf = 1 (R' = Km R, C' = C / Km; common practice). The midpoint sits
// at 5 V in both, so each resistor dissipates 25 mW, and 250 mW scaled: x10 = 1/Km.
const char* kOriginal =
    "rc network\nV1 in 0 DC 10 AC 1\nR1 in mid 1k\nR2 mid 0 1k\nC1 mid 0 100n\n"
    ".ac dec 10 10 100k\n.end\n";
const char* kScaled =
    "rc network\nV1 in 0 DC 10 AC 1\nR1 in mid 100\nR2 mid 0 100\nC1 mid 0 1u\n"
    ".ac dec 10 10 100k\n.end\n";

TEST(StressMeasure, KmOfOneTenthMultipliesResistorPowerByTen) {
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"), kOriginal);
    test::write_bytes(dir.file("s.cir"), kScaled);
    StressRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");
    ASSERT_EQ(parse_ratings("R=0.1W,R2=1W", r.ratings), "");
    DiskFileSystem disk;
    StressResult s = run_stress(r, disk);
    ASSERT_EQ(s.outcome, StressResult::Outcome::done) << (s.problems.empty() ? "" : s.problems[0]);
    ASSERT_TRUE(s.ac);
    ASSERT_EQ(s.rows.size(), 3u);
    struct Case {
        int line;
        std::size_t row;
        const char* part;
        double dc_voltage, dc_power_original, dc_power_scaled;
    };
    const Case cases[] = {
        {__LINE__, 0, "r1", 5, 25.0 / 1000, 25.0 / 100},  // P = V^2 / R
        {__LINE__, 1, "r2", 5, 25.0 / 1000, 25.0 / 100},
        {__LINE__, 2, "c1", 5, 0, 0},
    };
    for (const Case& c : cases) {
        const PartStressRow& row = s.rows[c.row];
        EXPECT_EQ(row.part, c.part) << c.line;
        ASSERT_TRUE(row.original.has_value()) << c.line;
        EXPECT_NEAR(row.scaled.dc_voltage, c.dc_voltage, 1e-9) << c.line;
        EXPECT_NEAR(row.original->dc_power, c.dc_power_original, 1e-12) << c.line;
        EXPECT_NEAR(row.scaled.dc_power, c.dc_power_scaled, 1e-12) << c.line;
        // Every current grows by 1/Km at the same voltages; a resistor's power too.
        EXPECT_NEAR(row.current_ratio, 10, 1e-6) << c.line;
        if (c.part[0] == 'r') {
            EXPECT_NEAR(row.power_ratio, 10, 1e-6) << c.line;
        }
    }
    // At 10 Hz C1 barely loads the divider: 0.5 V amplitude across R2, |V|^2/(2R) on top.
    EXPECT_NEAR(s.rows[1].scaled.ac_power, 0.25 / 200, 1e-6);
    // R1 is over the kind's 0.1 W rating; R2 has its own 1 W rating and is only flagged for
    // its growth.
    ASSERT_EQ(s.rows[0].flags.size(), 3u);
    EXPECT_EQ(s.rows[0].flags[0], "power x10 (limit x2)");
    EXPECT_EQ(s.rows[0].flags[1], "current x10 (limit x2)");
    EXPECT_EQ(s.rows[0].flags[2],
              fmt::format("{:.4g} W over its 0.1 W rating", s.rows[0].scaled.power()));
    EXPECT_EQ(s.rows[1].flags.size(), 2u);
}

// A 10 V sine on 1 kOhm, and on 100 Ohm at Km = 0.1: average power Vpk^2 / (2 R) = 50 mW and
// 0.5 W over whole periods (common practice), peak current 10 mA and 100 mA.
TEST(StressMeasure, ATransientGivesPeaksAndAveragePower) {
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"),
                      "sine\nV1 in 0 SIN(0 10 1k)\nR1 in 0 1k\n.tran 1u 10m\n.end\n");
    test::write_bytes(dir.file("s.cir"),
                      "sine\nV1 in 0 SIN(0 10 1k)\nR1 in 0 100\n.tran 1u 10m\n.end\n");
    StressRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");
    DiskFileSystem disk;
    StressResult s = run_stress(r, disk);
    ASSERT_EQ(s.outcome, StressResult::Outcome::done) << (s.problems.empty() ? "" : s.problems[0]);
    EXPECT_TRUE(s.tran);
    EXPECT_FALSE(s.ac);
    ASSERT_EQ(s.rows.size(), 1u);
    const PartStressRow& row = s.rows[0];
    ASSERT_TRUE(row.original.has_value());
    EXPECT_NEAR(row.original->tran_power, 0.05, 0.05 * 1e-3);
    EXPECT_NEAR(row.scaled.tran_power, 0.5, 0.5 * 1e-3);
    EXPECT_NEAR(row.scaled.peak_voltage(), 10, 1e-3);
    EXPECT_NEAR(row.scaled.peak_current(), 0.1, 1e-5);
    EXPECT_NEAR(row.power_ratio, 10, 1e-6);
    EXPECT_NEAR(row.current_ratio, 10, 1e-6);
}

// The divider in the field spellings ngspice 39 accepts (manual §2.1.4.1: ',', '(' and ')'
// separate fields) and with a value from a top-level parameter: every part is measured. 10 V
// over 1k in series with 1k || 1k gives 10/3 V at the midpoint, 1.667 mA in each lower
// resistor (Ohm's law, common practice).
TEST(StressMeasure, EveryFieldSpellingAndAParameterValueIsMeasured) {
    test::TempDir dir;
    const char* deck =
        "spellings\nV1 in 0 DC 10\nR1 (in mid) 1k\nR2 mid,0,1k\n.param rv=1k\nR3 mid 0 {rv}\n"
        "C1 mid 0 c=1n\n.end\n";
    test::write_bytes(dir.file("o.cir"), deck);
    test::write_bytes(dir.file("s.cir"), deck);
    StressRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");
    DiskFileSystem disk;
    StressResult s = run_stress(r, disk);
    ASSERT_EQ(s.outcome, StressResult::Outcome::done) << (s.problems.empty() ? "" : s.problems[0]);
    EXPECT_TRUE(s.held.empty()) << s.held[0];
    ASSERT_EQ(s.rows.size(), 4u);
    EXPECT_EQ(s.rows[0].part, "r1");
    EXPECT_NEAR(s.rows[0].scaled.dc_current, 20.0 / 3 / 1000, 1e-9);
    EXPECT_NEAR(s.rows[1].scaled.dc_voltage, 10.0 / 3, 1e-6);
    EXPECT_NEAR(s.rows[1].scaled.dc_current, 10.0 / 3 / 1000, 1e-9);
    EXPECT_EQ(s.rows[2].part, "r3");
    EXPECT_NEAR(s.rows[2].scaled.dc_power, 100.0 / 9 / 1000, 1e-9);
    EXPECT_NEAR(s.rows[3].value, 1e-9, 1e-21);
}

// A part in an included file is measured like one in the deck; one whose file is included
// inside a .subckt is listed as not measured.
// 10 V over 1k and 1k || 1k: 10/3 V at the midpoint (Ohm's law, common practice).
TEST(StressMeasure, PartsOfIncludedFilesAreMeasured) {
    test::TempDir dir;
    const char* deck =
        "included\nV1 in 0 DC 10\nR1 in mid 1k\n.include lower.inc\n.subckt arm a b\n"
        ".include arm.inc\n.ends\nX1 mid 0 arm\n.end\n";
    test::write_bytes(dir.file("o.cir"), deck);
    test::write_bytes(dir.file("lower.inc"), "R2 mid 0 1k\n");
    test::write_bytes(dir.file("arm.inc"), "R3 a b 1k\n");
    StressRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("o.cir");
    DiskFileSystem disk;
    StressResult s = run_stress(r, disk);
    ASSERT_EQ(s.outcome, StressResult::Outcome::done) << (s.problems.empty() ? "" : s.problems[0]);
    ASSERT_EQ(s.rows.size(), 2u);
    EXPECT_EQ(s.rows[1].part, "r2");
    EXPECT_NEAR(s.rows[1].scaled.dc_voltage, 10.0 / 3, 1e-6);
    EXPECT_EQ(s.held, std::vector<std::string>{"r3 (inside a subcircuit, arm.inc:1)"});
}

TEST(StressMeasure, RatingTextsAreReadOrRefused) {
    struct Case {
        int line;
        const char* text;
        const char* error;
    };
    const Case cases[] = {
        {__LINE__, "R=0.25W,C=50V,L=1A,R3=1W", ""},
        {__LINE__, "R=250mW", ""},
        {__LINE__, "R=0.25",
         "'R=0.25' is not NAME=VALUE with a unit W, V or A (e.g. R=0.25W, C=50V)"},
        {__LINE__, "R=xW", "'R=xW': the rating must be a positive number"},
        {__LINE__, "=1W", "'=1W' is not NAME=VALUE with a unit W, V or A (e.g. R=0.25W, C=50V)"},
    };
    for (const Case& c : cases) {
        Ratings r;
        EXPECT_EQ(parse_ratings(c.text, r), c.error) << c.line;
    }
    Ratings r;
    ASSERT_EQ(parse_ratings("R=250mW,C3=50V", r), "");
    EXPECT_DOUBLE_EQ(r.power.at("r"), 0.25);
    EXPECT_DOUBLE_EQ(r.voltage.at("c3"), 50);
}

}  // namespace
}  // namespace deckscale
