// The model of ngspice 39's number reader and sweep stepping, against point counts that
// ngspice 39.3 itself produced (`ngspice -b`, the swept vector's length; rows named like
// "ac061" are cards of the shared sweep checks run with seed 39, the others were run for
// this test). Formulas: ngspice-39.3 src/spicelib/parser/inpeval.c, acan.c, noisean.c,
// dctrcurv.c, src/frontend/linear.c.
#include "deck/sweep_steps.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <string>

namespace deckscale {
namespace {

TEST(SweepSteps, ReadsNumbersLikeNgspice) {
    struct Row {
        int line;
        const char* text;
        double value;
    };
    const Row rows[] = {
        {__LINE__, "1", 1},
        {__LINE__, "0.1", 0.1},
        {__LINE__, "2.2e7", 2.2e7},
        // mantissa times a power of ten, rounded twice: `ac lin 1 470m 470m` and `2mil` in
        // ngspice 39.3 print 4.70000000000000029e-01 (not 0.47) and 5.07999999999999947e-05.
        {__LINE__, "470m", 470 * 1e-3},
        {__LINE__, "1meg", 1e6},
        {__LINE__, "1MEGHz", 1e6},
        {__LINE__, "2mil", 2 * 25.4 * 1e-6},
        {__LINE__, "-25n", -25 * 1e-9},
        {__LINE__, "1e3k", 1e6},  // exponent and suffix add on dot cards (inpeval.c:198)
        // `ac lin 1 X X` run in ngspice 39.3, frequency printed with 18 digits: not the
        // correctly rounded double (847.5863032002954 and 29.319129045484303).
        {__LINE__, "847.58630320029545", 847.5863032002953},
        {__LINE__, "29.319129045484303", 29.319129045484306},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "sweep_steps_test.cpp:" << r.line << ": " << r.text);
        EXPECT_EQ(ngspice_read(r.text), r.value);
    }
    EXPECT_TRUE(std::isnan(ngspice_read("abc")));
}

struct CountRow {
    int line;
    const char* kind;  // "ac", "noise", "dc"
    const char* type;  // dec|oct|lin; unused for dc
    const char* a;     // points (ac, noise) or start (dc)
    const char* b;     // fstart or stop
    const char* c;     // fstop or step
    long count;        // points ngspice 39.3 steps through; -1: it never stops
};

TEST(SweepSteps, CountsThePointsNgspiceSteps) {
    const CountRow rows[] = {
        {__LINE__, "ac", "dec", "10", "220", "2.2e7", 51},             // ac000
        {__LINE__, "ac", "dec", "1", "295309.709", "2953097.09", -1},  // ac061, 9 digits
        {__LINE__, "ac", "dec", "1000", "209.85570888284781", "20985.570888284776", 2000},  // ac135
        {__LINE__, "ac", "dec", "20", "8026338.23", "80263382.3", 20},                      // ac207
        {__LINE__, "ac", "dec", "1", "29530970.943744056", "2953097094.3744054", 2},  // acal405
        {__LINE__, "ac", "dec", "3000", "1", "10", 3002},        // points past fstop within reltol
        {__LINE__, "ac", "lin", "11", "150", "1.5e6", 11},       // ac001
        {__LINE__, "ac", "lin", "2", "1k", "2k", 1},             // delta 0 below 3 points
        {__LINE__, "ac", "oct", "20", "470m", "3.76", 61},       // ac003
        {__LINE__, "ac", "oct", "10", "884000", "3.18e8", 85},   // ac007
        {__LINE__, "noise", "oct", "20", "1k", "32000", 101},    // noise240
        {__LINE__, "noise", "dec", "1", "525000", "5.34e7", 3},  // noise241
        {__LINE__, "noise", "lin", "266", "7.13", "7660", 266},  // noise242
        {__LINE__, "noise", "oct", "5", "9370", "4.9e7", 62},    // noise243
        {__LINE__, "noise", "lin", "2", "1k", "2k", 2},
        {__LINE__, "dc", "", "4.975e-06", "0", "-25n", 200},                  // dc000
        {__LINE__, "dc", "", "6.21103208e-12", "0", "-3.12112165e-14", 207},  // dc000, 9 digits
        {__LINE__, "dc", "", "719.01907009949275", "11836.16007702242", "55.309159238422524",
         201},                                                                              // dc001
        {__LINE__, "dc", "", "4.04768524e-11", "-4.04768524e-12", "-1.49914268e-13", 299},  // dc005
        {__LINE__, "dc", "", "2638937.8290154263", "49197340.955216162", "188495.55921538759",
         247},                                      // dc009
        {__LINE__, "dc", "", "0", "1", "-0.1", 0},  // a step of the wrong sign: no point
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "sweep_steps_test.cpp:" << r.line << ": " << r.kind
                                        << " " << r.type << " " << r.a << " " << r.b << " " << r.c);
        std::string kind = r.kind;
        double a = ngspice_read(r.a), b = ngspice_read(r.b), c = ngspice_read(r.c);
        SweepPoints p = kind == "ac"      ? ac_points(r.type, a, b, c)
                        : kind == "noise" ? noise_points(r.type, a, b, c)
                                          : dc_points(a, b, c);
        if (r.count < 0) {
            EXPECT_TRUE(p.endless);
        } else {
            EXPECT_FALSE(p.endless);
            EXPECT_EQ(static_cast<long>(p.values.size()), r.count);
        }
    }
}

TEST(SweepSteps, LinearizeCountsLikeNgspice) {
    // `tran 1u 1m` then `linearize`: length(time) = 1001 in ngspice 39.3; linear.c:85-108.
    EXPECT_EQ(linearize_points(1e-6, 1e-3, 0), 1001);
    EXPECT_EQ(linearize_points(2e-6, 3e-3, 1e-3), 1001);
    EXPECT_EQ(linearize_points(1e-3, 1e-6, 0), 0);  // tstop - tstart < tstep: refused
    EXPECT_EQ(linearize_points(0, 1e-3, 0), 0);
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// Counts beyond a long are clamped, never converted (undefined behaviour; an ".ac lin 2e40"
// card found by the deck fuzz target).
TEST(SweepSteps, CountsBeyondALongAreClamped) {
    EXPECT_EQ(count_field(20.4), 20);
    EXPECT_EQ(count_field(20.5), 21);  // floor(0.5 + value), inpgval.c:31
    EXPECT_EQ(count_field(2e40), std::numeric_limits<long>::max());
    EXPECT_EQ(count_field(-2e40), std::numeric_limits<long>::min());
    EXPECT_EQ(clamped_long(std::nan("")), std::numeric_limits<long>::max());
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// A step too small to move the point is a sweep without end, known at the second point
// rather than at the point limit (ngspice's loops, acan.c:346-382, dctrcurv.c:453-466, keep no
// state but the point, so it would repeat forever). A slow input of the deck fuzz target.
TEST(SweepSteps, AStepThatDoesNotMoveThePointIsEndlessAtOnce) {
    // A step of 100 at 1e20, where neighbouring doubles are 16384 apart.
    SweepPoints lin = ac_points("lin", 1000, 1e20, 1e20 + 1e5);
    EXPECT_TRUE(lin.endless);
    EXPECT_FALSE(lin.over_limit);
    EXPECT_EQ(lin.values.size(), 1u);
    SweepPoints noise = noise_points("lin", 1000, 1e20, 1e20 + 1e5);
    EXPECT_TRUE(noise.endless);
    EXPECT_EQ(noise.values.size(), 1u);
    // More points than the limit: known from the count alone, nothing stepped.
    for (SweepPoints many : {ac_points("lin", 2e40, 0.01, 2), noise_points("lin", 1e30, 1, 2),
                             ac_points("dec", 1e9, 1, 1e3), ac_points("oct", 1e9, 1, 8),
                             noise_points("dec", 1e8, 1, 1e3)}) {
        EXPECT_TRUE(many.endless);
        EXPECT_TRUE(many.over_limit);
        EXPECT_TRUE(many.values.empty());
    }
    // A reltol of 1e9 (".options reltol=1g") lets a 201-point lin sweep's stop test run on for
    // about 1e9 steps: known from the count, nothing stepped (a fuzz target timeout, 14 s).
    SweepPoints loose = ac_points("lin", 201, 400e3, 510e3, 1e9);
    EXPECT_TRUE(loose.over_limit);
    EXPECT_TRUE(loose.values.empty());
    EXPECT_TRUE(noise_points("lin", 201, 400e3, 510e3, 1e9).over_limit);
    // A log sweep near the limit is still stepped: flagged from twice the limit only.
    SweepPoints near = ac_points("dec", 1.5e6, 1, 10, 1e-3, true);
    EXPECT_FALSE(near.over_limit);
    EXPECT_GE(near.count, 1500001u);  // the stop test lets reltol past fstop (acan.c)
    // A DC sweep just over the limit: from the count, nothing stepped; just under it, stepped.
    SweepPoints over = dc_points(10, 1000, 210e-6);
    EXPECT_TRUE(over.over_limit);
    EXPECT_TRUE(over.values.empty());
    SweepPoints under = dc_points(0, 4.19e6 - 1, 1);
    EXPECT_FALSE(under.over_limit);
    EXPECT_FALSE(under.endless);
    EXPECT_EQ(under.values.size(), 4190000u);
    EXPECT_GE(under.values.capacity(), 4190000u);
    EXPECT_LE(under.values.capacity(), 4190002u);  // reserved at once, not grown by doubling
    // Counted only: the same count, nothing stored.
    SweepPoints counted = dc_points(0, 4.19e6 - 1, 1, true);
    EXPECT_EQ(counted.count, 4190000u);
    EXPECT_TRUE(counted.values.empty());
    EXPECT_EQ(counted.last, under.values.back());
    // A sweep that moves away from its stop test's bound while the test passes (a falling
    // lin sweep with a negative reltol; a falling dec sweep with a huge one): endless at
    // once, nothing stepped (a slow input of the deck fuzz target, four million points per
    // card).
    for (SweepPoints away : {ac_points("lin", 201, 400e3, 51222, -3000),
                             noise_points("lin", 201, 400e3, 51222, -3000),
                             ac_points("dec", 10, 1e6, 1e3, 1e6)}) {
        EXPECT_TRUE(away.endless);
        EXPECT_FALSE(away.over_limit);
        EXPECT_EQ(away.values.size(), 1u);
    }
    // With ngspice's default reltol the same falling sweeps stop at once: no points.
    EXPECT_FALSE(ac_points("lin", 201, 400e3, 51222).endless);
    EXPECT_TRUE(ac_points("lin", 201, 400e3, 51222).values.empty());
    SweepPoints dc = dc_points(1e20, 1e20 + 1e5, 1);  // 1e20 + 1 == 1e20
    EXPECT_TRUE(dc.endless);
    EXPECT_EQ(dc.values.size(), 1u);
    // A DC level of 99 million points ('.dc v1 10 1k 10u', a fuzz target timeout): known from
    // the count, nothing stepped, either direction; a step of 0 is still endless, not counted.
    for (SweepPoints huge : {dc_points(10, 1e3, 1e-5), dc_points(1e3, 10, -1e-5)}) {
        EXPECT_TRUE(huge.over_limit);
        EXPECT_TRUE(huge.values.empty());
        EXPECT_NEAR(huge.asked, 99000001, 1);
    }
    SweepPoints still = dc_points(1, 2, 0);
    EXPECT_TRUE(still.endless);
    EXPECT_FALSE(still.over_limit);
    // A small step that still moves the point is not endless.
    SweepPoints fine = ac_points("lin", 100001, 1, 2);
    EXPECT_FALSE(fine.endless);
    EXPECT_EQ(fine.values.size(), 100001u);
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// `.ac dec 1e33 10 1k` (found by the deck fuzz target): the step rounds to a factor of exactly 1,
// so ngspice takes one point; the room reserved for the expected count was the 4-million-point
// limit (32 MB per sweep, seconds under the sanitizers), because inf passed the check meant for
// NaN and inf.
TEST(SweepSteps, ASweepOfOnePointReservesNoRoomForMillions) {
    SweepPoints p = ac_points("dec", 1.111e33, 10, 1e3, 1e-3, false);
    ASSERT_EQ(p.values.size(), 1u);
    EXPECT_LT(p.values.capacity(), 1000u);
}

}  // namespace
}  // namespace deckscale
