// Rewriting a sweep so that ngspice 39 steps through the same points times the factor. The
// counts are those of the stepping model (deck/sweep_steps, checked against ngspice in
// sweep_steps_test.cpp); tests/scale/sweep_ngspice_test.cpp runs the rewritten cards in ngspice.
#include "deck/sweep_rewrite.hpp"

#include <fmt/format.h>
#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <string>

#include "deck/sweep_steps.hpp"

namespace deckscale {
namespace {

using std::numbers::pi;

std::vector<std::string_view> views(const std::vector<std::string>& v) {
    return {v.begin(), v.end()};
}

SweepPoints frequencies(SweepKind kind, const std::vector<std::string>& f) {
    double n = ngspice_read(f[1]), a = ngspice_read(f[2]), b = ngspice_read(f[3]);
    std::string type = f[0] == "DEC" ? "dec" : f[0];
    return kind == SweepKind::ac ? ac_points(type, n, a, b) : noise_points(type, n, a, b);
}

// Same count, every point within 1e-9 of factor x the original's.
void expect_same_points(const SweepPoints& got, const SweepPoints& want, double factor) {
    ASSERT_FALSE(got.endless);
    ASSERT_EQ(got.values.size(), want.values.size());
    for (std::size_t i = 0; i < got.values.size(); ++i)
        EXPECT_NEAR(got.values[i], want.values[i] * factor,
                    1e-9 * std::fabs(want.values[i] * factor))
            << i;
}

struct FreqRow {
    int line;
    SweepKind kind;
    std::vector<std::string> fields;
    double factor;
    std::vector<std::string> expected;
};

TEST(SweepRewrite, FrequencySweepsKeepTheirPoints) {
    const double kf = 2 * pi * 1000;
    const FreqRow rows[] = {
        // Issue 10 §3: with 9 digits "dec 1 6283.18531 62831.8531" never stops in ngspice 39
        // and "dec 1000" loses a point; the ratio of the written pair stays exactly 10 here.
        {__LINE__,
         SweepKind::ac,
         {"dec", "1", "1", "10"},
         kf,
         {"dec", "1", "6283.18530717959", "62831.8530717959"}},
        {__LINE__,
         SweepKind::ac,
         {"dec", "1000", "1", "10"},
         kf,
         {"dec", "1000", "6283.18530717959", "62831.8530717959"}},
        {__LINE__, SweepKind::ac, {"DEC", "10", "1k", "1MEG"}, 1000, {"DEC", "10", "1meg", "1G"}},
        {__LINE__, SweepKind::ac, {"oct", "20", "470m", "3.76"}, 0.76582589708163662, {}},  // ac003
        {__LINE__, SweepKind::ac, {"lin", "11", "150", "1.5e6"}, 0.62831853071795862, {}},  // ac001
        {__LINE__,
         SweepKind::ac,
         {"dec", "20", "30.97", "309.7"},
         267.54460782970375,
         {}},  // ac207
        {__LINE__,
         SweepKind::noise,
         {"oct", "20", "1k", "32000"},
         0.038946207541535958,
         {}},  // noise240
        {__LINE__,
         SweepKind::noise,
         {"dec", "1", "525000", "5.34e7"},
         406088.17547277932,
         {}},  // noise241
        {__LINE__,
         SweepKind::noise,
         {"lin", "266", "7.13", "7660"},
         7.2044625010308483,
         {}},  // noise242
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "sweep_rewrite_test.cpp:" << r.line);
        SweepRewrite w = rewrite_sweep(r.kind, views(r.fields), r.factor);
        ASSERT_EQ(w.refusal, "");
        if (!r.expected.empty()) EXPECT_EQ(w.fields, r.expected);
        for (std::size_t i = 2; i < 4; ++i) {
            std::string digits;
            for (char c : w.fields[i])
                if (c >= '0' && c <= '9') digits += c;
            EXPECT_LE(digits.size(), 15u + 2) << w.fields[i];  // 15 significant + leading zeros
        }
        expect_same_points(frequencies(r.kind, w.fields), frequencies(r.kind, r.fields), r.factor);
    }
}

TEST(SweepRewrite, WholeDecadesKeepTheirCount) {
    // `dec N f 10^d f` with Kf from 2 pi 10^k: the shape that lost or gained a point most often
    // with 9 or 17 digits (in ngspice 39.3, acal353, acal378, acal405: 100 -> 101 and the like).
    for (int n : {1, 2, 5, 10, 19, 20, 50, 100, 1000})
        for (double f : {1.0, 2.2, 10.0, 47.0, 159.0})
            for (int d : {1, 2, 3})
                for (double kf :
                     {2 * pi, 2 * pi * 1e3, 2 * pi * 1e6, 0.2 * pi, 1 / (2 * pi), 7.0}) {
                    std::vector<std::string> card = {"dec", std::to_string(n), fmt::format("{}", f),
                                                     fmt::format("{}e{}", f, d)};
                    SCOPED_TRACE(testing::Message()
                                 << "dec " << n << " " << card[2] << " " << card[3] << " x " << kf);
                    SweepRewrite w = rewrite_sweep(SweepKind::ac, views(card), kf);
                    ASSERT_EQ(w.refusal, "");
                    expect_same_points(frequencies(SweepKind::ac, w.fields),
                                       frequencies(SweepKind::ac, card), kf);
                }
}

struct DcRow {
    int line;
    std::vector<std::string> fields;  // start, stop, step
    double factor;
};

TEST(SweepRewrite, DcLevelsKeepTheirPoints) {
    const DcRow rows[] = {
        {__LINE__,
         {"4.975e-06", "0", "-25n"},
         1.2484486597699104e-06},                               // dc000: 9 digits 207 points
        {__LINE__, {"325", "5350", "25"}, 2.2123663695369009},  // dc001: 17 digits 201
        {__LINE__, {"2.7u", "-2.7e-07", "-1e-08"}, 1.4991426820020121e-05},  // dc005: 9 digits 299
        {__LINE__, {"4.2k", "78.3k", "300"}, 628.31853071795865},            // dc009 shape
        {__LINE__, {"0", "1m", "0.05m"}, 1.0 / 7},
        {__LINE__, {"-0.0002", "-760u", "-2e-05"}, 0.0030272603266159807},  // dc006
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "sweep_rewrite_test.cpp:" << r.line);
        SweepRewrite w = rewrite_sweep(SweepKind::dc, views(r.fields), r.factor);
        ASSERT_EQ(w.refusal, "");
        auto points = [](const std::vector<std::string>& f) {
            return dc_points(ngspice_read(f[0]), ngspice_read(f[1]), ngspice_read(f[2]));
        };
        SweepPoints want = points(r.fields), got = points(w.fields);
        ASSERT_EQ(got.values.size(), want.values.size());
        double step = std::fabs(ngspice_read(r.fields[2]) * r.factor);
        for (std::size_t i = 0; i < got.values.size(); ++i) {
            double target = want.values[i] * r.factor;
            EXPECT_LE(std::fabs(got.values[i] - target), 1e-9 * std::max(std::fabs(target), step))
                << i;
        }
    }
}

TEST(SweepRewrite, TransientKeepsTheLinearizeCount) {
    const std::vector<std::vector<std::string>> cards = {
        {"1u", "2m"}, {"2u", "3m", "1m", "1u"}, {"10n", "1.7u"}, {"1e-7", "3.3e-5", "0"}};
    for (const auto& c : cards)
        for (double kf : {7.0, 1000.0, 2 * pi * 1e6, 1 / (2 * pi), 3.3}) {
            SCOPED_TRACE(testing::Message() << c[0] << " " << c[1] << " / " << kf);
            SweepRewrite w = rewrite_sweep(SweepKind::tran, views(c), 1 / kf);
            ASSERT_EQ(w.refusal, "");
            ASSERT_EQ(w.fields.size(), c.size());
            auto count = [](const std::vector<std::string>& f) {
                return linearize_points(ngspice_read(f[0]), ngspice_read(f[1]),
                                        f.size() > 2 ? ngspice_read(f[2]) : 0);
            };
            EXPECT_EQ(count(w.fields), count(c));
            for (std::size_t i = 0; i < c.size(); ++i)
                EXPECT_NEAR(ngspice_read(w.fields[i]) * kf, ngspice_read(c[i]),
                            1e-9 * ngspice_read(c[i]) + 1e-300);
        }
}

TEST(SweepRewrite, RefusesWhatNgspiceCannotStep) {
    struct Row {
        int line;
        SweepKind kind;
        std::vector<std::string> fields;
        const char* why;
    };
    const Row rows[] = {
        {__LINE__,
         SweepKind::ac,
         {"dec", "1", "1", "5"},
         "ngspice 39 never ends this sweep (its frequency runs away): the original card itself "
         "does not work"},
        {__LINE__,
         SweepKind::dc,
         {"0", "1", "0"},
         "ngspice 39 never ends this DC sweep (a step of 0?): the original card itself does not "
         "work"},
        {__LINE__,
         SweepKind::ac,
         {"dec", "10", "{fa}", "1k"},
         "the sweep's fields are not plain numbers"},
        {__LINE__, SweepKind::ac, {"log", "10", "1", "1k"}, "unknown sweep type 'log'"},
        // 201.t is 2.01e14 points (t = tera; found by the deck fuzz target): known from the
        // count, without stepping millions of points first.
        {__LINE__,
         SweepKind::ac,
         {"lin", "201.t", "400k", "510k"},
         "this sweep asks for 2.01e+14 points, more than the 4194304 this check steps through: "
         "write fewer points"},
        {__LINE__,
         SweepKind::noise,
         {"lin", "5e6", "1", "2"},
         "this sweep asks for 5e+06 points, more than the 4194304 this check steps through: "
         "write fewer points"},
        // A log sweep by its count, about 463366804 x 2 points over two decades and the stop
        // tolerance's overshoot (a slow input of the deck fuzz target: 2.7 s stepping to the
        // limit under its sanitizers).
        {__LINE__,
         SweepKind::ac,
         {"dec", "463366804", "10", "1k"},
         "this sweep asks for 9.26935e+08 points, more than the 4194304 this check steps "
         "through: write fewer points"},
        // 4.7 million points, between the limit and twice it: also from the count (a slow
        // input of the deck fuzz target, 14 s stepping to the limit under its sanitizers).
        {__LINE__,
         SweepKind::dc,
         {"10", "1k", "210u"},
         "this DC sweep asks for 4.71429e+06 points, more than the 4194304 this check steps "
         "through: write fewer points"},
        {__LINE__,
         SweepKind::noise,
         {"oct", "1e7", "1", "4"},
         "this sweep asks for 2.00144e+07 points, more than the 4194304 this check steps through: "
         "write fewer points"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "sweep_rewrite_test.cpp:" << r.line);
        EXPECT_EQ(rewrite_sweep(r.kind, views(r.fields), 1000).refusal, r.why);
    }
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// A value the factor pushes past the largest double (or to zero) is refused with the value
// named; the nudge search once met an infinite stop and stopped the tool (found by the deck
// fuzz run; tests/fuzz/regressions/deck-sweep-value-scaled-to-infinity.bin).
TEST(SweepRewrite, AValueScaledOutOfRangeIsRefused) {
    SweepRewrite r = rewrite_sweep(SweepKind::ac, {"lin", "20", "1", "4d300k"}, 6.283185307179586e7);
    EXPECT_TRUE(r.fields.empty());
    EXPECT_EQ(r.refusal, "'4d300k' times 6.28319e+07 is out of the range of numbers");
    r = rewrite_sweep(SweepKind::tran, {"1e-300", "1e-290"}, 1e-30);
    EXPECT_EQ(r.refusal, "'1e-300' times 1e-30 is out of the range of numbers");
}

}  // namespace
}  // namespace deckscale
