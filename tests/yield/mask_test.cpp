// Tests of the mask and the key figures of a response.
#include "yield/mask.hpp"

#include <gtest/gtest.h>

#include <cmath>

namespace deckscale {
namespace {

// A first-order low-pass |H| = 1 / sqrt(1 + (f/fc)^2) (analytic), 40 points per decade.
struct LowPass {
    std::vector<double> f, db;
    explicit LowPass(double fc, double gain_db = 0) {
        for (int k = 0; k <= 160; ++k) {
            double x = 10 * std::pow(10, k / 40.0);
            f.push_back(x);
            db.push_back(gain_db - 10 * std::log10(1 + (x / fc) * (x / fc)));
        }
    }
};

TEST(YieldMask, CornerOfAFirstOrderLowPass) {
    // Corners at least two decades above the sweep's 10 Hz start: the peak is then 0 dB within
    // 0.0005 dB, and the corner is the -3 dB point of the analytic response.
    for (double fc : {1000.0, 4567.0, 20000.0}) {
        LowPass lp(fc);
        auto c = corner_of(lp.f, lp.db);
        ASSERT_TRUE(c.has_value()) << fc;
        // The -3 dB point is at fc * sqrt(10^0.3 - 1) = 0.99763 fc (3 dB, not 10 log10 2).
        EXPECT_NEAR(*c / (fc * std::sqrt(std::pow(10, 0.3) - 1)), 1, 1e-3) << fc;
    }
}

TEST(YieldMask, RelativeWindowOverThePassband) {
    LowPass nominal(1000);
    std::string error;
    Mask mask;
    mask.window_db = 0.5;
    MaskJudge judge = make_judge(mask, nominal.f, nominal.db, error);
    ASSERT_EQ(error, "");
    ResponseFigures same = judge.judge(nominal.db);
    EXPECT_TRUE(same.pass);
    EXPECT_EQ(same.deviation_db, 0);
    EXPECT_NEAR(same.margin_db, 0.5, 1e-12);
    EXPECT_EQ(same.ripple_db, 0);  // a monotonic roll-off has no dip
    // A dip of 0.4 dB at 100 Hz (where the low-pass is at -0.0432 dB): peak-to-valley 0.4432.
    std::vector<double> dipped = nominal.db;
    for (std::size_t k = 0; k < dipped.size(); ++k) {
        double x = std::log10(nominal.f[k] / 100);
        dipped[k] -= 0.4 * std::exp(-x * x / 0.02);
    }
    EXPECT_NEAR(judge.judge(dipped).ripple_db, 0.4432, 2e-3);
    struct Case {
        int line;
        double fc, gain_db;
        bool pass;
    };
    const Case cases[] = {
        {__LINE__, 1000, 0.4, true},    // a level shift inside the window
        {__LINE__, 1000, -0.6, false},  // outside it
        {__LINE__, 1100, 0, true},      // 10 % higher corner: 0.37 dB at the old corner
        {__LINE__, 800, 0, false},      // 20 % lower: 1.4 dB at the old corner
    };
    for (const Case& c : cases) {
        ResponseFigures r = judge.judge(LowPass(c.fc, c.gain_db).db);
        EXPECT_EQ(r.pass, c.pass) << c.line << " deviation " << r.deviation_db;
        EXPECT_EQ(r.margin_db >= 0, c.pass) << c.line;
    }
}

// A trial whose response the simulator could not compute at a point in the mask (NaN) fails:
// std::min passes over a NaN, so the trial counted as a pass.
TEST(YieldMask, AResponseWithNanInTheMaskFails) {
    LowPass nominal(1000);
    std::string error;
    Mask mask;
    mask.window_db = 0.5;
    MaskJudge judge = make_judge(mask, nominal.f, nominal.db, error);
    std::vector<double> broken = nominal.db;
    broken[3] = std::nan("");
    ResponseFigures r = judge.judge(broken);
    EXPECT_FALSE(r.pass);
    EXPECT_EQ(r.margin_db, -INFINITY);
    // Out of the band it judges nothing.
    broken = nominal.db;
    broken.back() = std::nan("");
    EXPECT_TRUE(judge.judge(broken).pass);
}

TEST(YieldMask, CornerWindowJudgesTheCorner) {
    LowPass nominal(1000);
    std::string error;
    Mask mask;
    mask.window_db = 100;
    mask.corner_low = 950;
    mask.corner_high = 1050;
    MaskJudge judge = make_judge(mask, nominal.f, nominal.db, error);
    EXPECT_TRUE(judge.judge(LowPass(1000).db).pass);
    EXPECT_TRUE(judge.judge(LowPass(1040).db).pass);
    EXPECT_FALSE(judge.judge(LowPass(1060).db).pass);
    EXPECT_FALSE(judge.judge(LowPass(930).db).pass);
}

TEST(YieldMask, MaskFileRowsLimitTheResponse) {
    LowPass nominal(1000);
    Mask mask;
    ASSERT_EQ(
        parse_mask_rows("# frequency min max\n100 -1 0.5\n1k -4 0.5\n\n* stopband\n10k -100 -15\n",
                        "m.txt", mask),
        "");
    ASSERT_EQ(mask.rows.size(), 3u);
    std::string error;
    MaskJudge judge = make_judge(mask, nominal.f, nominal.db, error);
    ASSERT_EQ(error, "");
    // Between rows the limits follow a straight line in log frequency: at 316 Hz, -2.5 dB.
    int checked = 0;
    for (std::size_t k = 0; k < nominal.f.size(); ++k)
        if (std::abs(nominal.f[k] / std::sqrt(1e5) - 1) < 1e-9) {
            EXPECT_NEAR(judge.lower[k], -2.5, 1e-9);
            ++checked;
        }
    EXPECT_EQ(checked, 1);
    EXPECT_TRUE(judge.judge(nominal.db).pass);
    EXPECT_FALSE(judge.judge(LowPass(3000).db).pass);  // too much left at 10 kHz
    EXPECT_TRUE(std::isnan(judge.lower.front()));      // 10 Hz is before the first row
}

TEST(YieldMask, MaskFileErrorsNameTheLine) {
    struct Case {
        int line;
        const char* text;
        const char* error;
    };
    const Case cases[] = {
        {__LINE__, "100 -1\n", "m.txt:1: a mask row is: frequency min_dB max_dB"},
        {__LINE__, "100 -1 0\n50 -1 0\n", "m.txt:2: frequencies must increase from row to row"},
        {__LINE__, "# nothing\n", "m.txt: the mask file has no rows"},
        {__LINE__, "1k 0 -1\n", "m.txt:1: min_dB is above max_dB"},
        {__LINE__, "1k x 1\n", "m.txt:1: not a number in this row"},
        {__LINE__, "0 -1 1\n", "m.txt:1: the frequency must be positive"},
    };
    for (const Case& c : cases) {
        Mask m;
        EXPECT_EQ(parse_mask_rows(c.text, "m.txt", m), c.error) << c.line;
    }
    double lo = 0, hi = 0;
    EXPECT_EQ(parse_range("1k:100k", lo, hi), "");
    EXPECT_EQ(lo, 1000);
    EXPECT_EQ(hi, 100000);
    EXPECT_EQ(parse_range("100k:1k", lo, hi), "'100k:1k' is not F1:F2 with 0 <= F1 < F2");
    EXPECT_EQ(parse_range("1k", lo, hi), "'1k' is not F1:F2");
}

}  // namespace
}  // namespace deckscale
