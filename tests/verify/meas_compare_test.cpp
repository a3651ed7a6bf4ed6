// The deck's own .meas results, compared between the original and the scaled run: what each
// measures, reading ngspice's printed results, and the verdicts; then through verify_pair
// with ngspice as the referee.
#include "verify/meas_compare.hpp"

#include <cmath>

#include <gtest/gtest.h>

#include "support/common.hpp"
#include "support/verify.hpp"

namespace deckscale {
namespace {

std::vector<MeasureSpec> specs_of(const std::string& text) {
    MemoryFileSystem fs;
    fs.add("m.cir", text);
    return find_measures(load_deck("m.cir", fs));
}

TEST(FindMeasures, EachKindHasTheQuantityOfItsResult) {
    auto m = specs_of(
        "m\nV1 in 0 ac 1\nR1 in out 1k\nC1 out 0 1n\n"
        ".meas tran t50 when v(out)=0.5\n"
        ".meas tran tr trig v(out) val=0.1 rise=1 targ v(out) val=0.9 rise=1\n"
        ".MEASURE TRAN Vend FIND v(out) AT=1m\n"
        ".meas tran ipk max i(v1)\n"
        ".meas tran q integ i(v1) from=0 to=1m\n"
        ".meas ac fpk max_at vdb(out)\n"
        ".meas ac ph find vp(out) at=1k\n"
        ".meas ac idb1 find idb(v1) at=1k\n"
        ".meas tran two param='t50*2'\n"
        ".meas dc vx when i(v1)=1m\n"
        ".end\n");
    ASSERT_EQ(m.size(), 10u);
    auto is = [](const MeasureSpec& s, const char* name, int axis, int current, const char* q) {
        SCOPED_TRACE(name);
        EXPECT_EQ(s.name, name);
        EXPECT_EQ(s.axis_power, axis);
        EXPECT_EQ(s.current_power, current);
        EXPECT_EQ(s.quantity, q);
        EXPECT_TRUE(s.not_judged.empty()) << s.not_judged;
    };
    is(m[0], "t50", 1, 0, "time");
    is(m[1], "tr", 1, 0, "time");
    is(m[2], "vend", 0, 0, "voltage");
    EXPECT_EQ(m[2].analysis, "tran");
    is(m[3], "ipk", 0, 1, "current");
    is(m[4], "q", 1, 1, "current x time");  // a charge: / Km / Kf
    is(m[5], "fpk", 1, 0, "frequency");
    is(m[6], "ph", 0, 0, "phase");
    EXPECT_NE(m[7].not_judged.find("-20 log10(Km)"), std::string::npos);
    EXPECT_NE(m[8].not_judged.find("expression"), std::string::npos);
    is(m[9], "vx", 1, 0, "sweep value");
}

// A .control block never runs in verification: its `meas` commands become .meas cards.
TEST(FindMeasures, ControlMeasCommandsComeAsCards) {
    auto m = specs_of("m\nV1 in 0 ac 1\nR1 in out 1k\nC1 out 0 1n\n.meas ac top max vdb(out)\n"
                      ".control\nac dec 10 1 1meg\nmeas ac f3 when vdb(out)=-3 $ corner\n"
                      "meas ac f6 when\n+ vdb(out)=-6 ; print f3\nlet x = 1\n"
                      "meas ac fx when vdb(out)=$&lim\n.endc\n.end\n");
    ASSERT_EQ(m.size(), 3u);
    EXPECT_EQ(m[0].card, "");
    EXPECT_EQ(m[1].name, "f3");
    EXPECT_EQ(m[1].card, ".meas ac f3 when vdb(out)=-3");
    EXPECT_EQ(m[1].quantity, "frequency");
    EXPECT_EQ(m[2].card, ".meas ac f6 when   vdb(out)=-6");
}

// Lines as ngspice 39 printed them on this machine for an RC step (NGSPICE_MEAS_PRECISION=15
// reaches INTEG and PARAM results only; the others keep 7 digits).
const std::vector<std::string> kLog = {
    "Measurements for Transient Analysis",
    "out of interval",
    ".meas tran never when v(out)=5 failed!",
    "Error: measure  dd failed:",
    "function 'deriv' currently not supported",
    ".meas tran dd deriv v(out) at=1m failed!",
    "pk                  =  0.000000e+00 at=  0.000000e+00",
    "tr                  =  2.197199e-03 targ=  2.303071e-03 trig=  1.058717e-04",
    "ar                  =   3.675655817366625e-04 from=  0.000000000000000e+00 to=  "
    "1.000000000000000e-03",
    "pp                  =   failed",
    "v_late              =  9.816757e-01",
};

TEST(MeasureResult, ReadsTheValueNgspicePrinted) {
    EXPECT_EQ(measure_result(kLog, "tr"), 2.197199e-03);
    EXPECT_EQ(measure_result(kLog, "ar"), 3.675655817366625e-04);
    EXPECT_EQ(measure_result(kLog, "v_late"), 9.816757e-01);
    EXPECT_EQ(measure_result(kLog, "pk"), 0.0);
    EXPECT_FALSE(measure_result(kLog, "pp"));     // "= failed"
    EXPECT_FALSE(measure_result(kLog, "never"));  // nothing printed
    EXPECT_FALSE(measure_result(kLog, "v"));      // a prefix of v_late is no result
    EXPECT_EQ(measure_failure(kLog, "never"), "out of interval");
    EXPECT_EQ(measure_failure(kLog, "dd"), "function 'deriv' currently not supported");
    EXPECT_EQ(measure_failure(kLog, "tr"), "");
}

SimOutcome printed(std::vector<std::string> lines) {
    SimOutcome o;
    o.log = std::move(lines);
    return o;
}

TEST(CompareMeasures, ResultsAreMappedBackByTheirQuantity) {
    const double km = 50, kf = 1000;
    auto specs = specs_of("m\nV1 in 0 ac 1\nR1 in out 1k\nC1 out 0 1n\n"
                          ".meas tran t50 when v(out)=0.5\n.meas tran ipk max i(v1)\n"
                          ".meas tran q integ i(v1) from=0 to=1m\n.meas tran vend find v(out) at=1m\n"
                          ".meas tran gone when v(out)=2\n.meas ac bw when vdb(out)=-3\n.end\n");
    SimOutcome o = printed({"t50 = 6.936486e-04", "ipk = 1.000000e-03", "q = 4.5e-07",
                            "vend = 9.816757e-01"});
    SimOutcome s = printed({"t50 = 6.936486e-07", "ipk = 2.000000e-05", "q = 9e-12",
                            "vend = 9.816757e-01"});
    Comparison c = compare_measures(specs, "tran", o, s, km, 1 / kf, 1e-6);
    EXPECT_EQ(c.analysis, "meas");
    EXPECT_EQ(c.part, "tran");
    EXPECT_EQ(c.label(), "meas (tran)");
    ASSERT_EQ(c.vectors.size(), 4u);  // "bw" belongs to the AC run
    EXPECT_TRUE(c.passed());
    ASSERT_EQ(c.notes.size(), 1u);
    EXPECT_EQ(c.notes[0], "gone: no result in either run");
    for (const auto& v : c.vectors) {
        if (v.name == "q") {
            EXPECT_EQ(v.quantity, "current x time (x 1/Kf 1/Km)");
            EXPECT_EQ(v.original_value, 4.5e-07);
            EXPECT_EQ(v.scaled_value, 9e-12);
        }
    }

    // A measurement that read at an unscaled AT= in the scaled deck, and one that found
    // nothing there.
    SimOutcome wrong = printed({"t50 = 6.936486e-07", "ipk = 2.000000e-05", "q = 9e-12",
                                "vend = 1.000000e+00"});
    c = compare_measures(specs, "tran", o, wrong, km, 1 / kf, 1e-3);
    EXPECT_FALSE(c.passed());
    EXPECT_EQ(c.worst()->name, "vend");
    SimOutcome missing = printed({"t50 = 6.936486e-07", "out of interval",
                                  ".meas tran ipk max i(v1) failed!", "q = 9e-12",
                                  "vend = 9.816757e-01"});
    c = compare_measures(specs, "tran", o, missing, km, 1 / kf, 1e-3);
    EXPECT_FALSE(c.passed());
    ASSERT_EQ(c.problems.size(), 1u);
    EXPECT_EQ(c.problems[0], "ipk: a result in the original run only (ngspice: out of interval)");
}

TEST(CompareMeasures, SevenPrintedDigitsAreWithinTolerance) {
    auto specs = specs_of("m\nV1 in 0 ac 1\nR1 in 0 1k\n.meas ac i1 find i(v1) at=1k\n.end\n");
    // -6.967503e-04 / 50 = -1.3935006e-05, printed by ngspice as -1.393501e-05 (2.9e-7 off).
    Comparison c = compare_measures(specs, "ac", printed({"i1 = -6.967503e-04"}),
                                    printed({"i1 = -1.393501e-05"}), 50, 1000, 1e-6);
    ASSERT_EQ(c.vectors.size(), 1u);
    EXPECT_GT(c.vectors[0].worst, 1e-7);
    EXPECT_TRUE(c.passed());
}

// An RC step through a 1 us ramp: v(out) = 1 - exp(-t/RC) (first-order response, common
// practice), so v(out) = 0.5 at RC ln 2 plus half the ramp = 693.647 us for RC = 1 ms
// (analytic, the ramp's delay from memory of the ramp response of a first-order lag).
const char* kRc =
    "rc step\n.param thr=0.5\nV1 in 0 PWL(0 0 1u 1)\nR1 in out 1k\nC1 out 0 1u\n.tran 10u 5m\n"
    ".meas tran t_half when v(out)=thr\n.meas tran v_late find v(out) at=4m\n"
    ".meas tran ipk max i(v1)\n.end\n";
// The same at Km = 10, Kf = 100 as scale writes it (ngspice's current and charge tolerances
// scaled too, so that both runs take the same steps), with the measurement's AT= rewritten
// (4m / Kf = 40u) or not.
const char* kRcScaled =
    "rc step\n.param thr=0.5\nV1 in 0 PWL(0 0 10n 1)\nR1 in out 10k\nC1 out 0 1n\n"
    ".tran 100n 50u\n.meas tran t_half when v(out)=thr\n.meas tran v_late find v(out) at=40u\n"
    ".meas tran ipk max i(v1)\n.options abstol=1e-13 chgtol=1e-17\n.end\n";

TEST(CompareMeasures, NgspiceMeasuresBothDecksAndCatchesAnUnscaledAt) {
    PairVerification v = test::verify_texts(kRc, kRcScaled, 10, 100);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    EXPECT_TRUE(v.report.passed());
    const Comparison* meas = nullptr;
    for (const auto& c : v.report.comparisons)
        if (c.analysis == "meas") meas = &c;
    ASSERT_NE(meas, nullptr);
    ASSERT_EQ(meas->vectors.size(), 3u);
    for (const auto& m : meas->vectors)
        if (m.name == "t_half") {
            EXPECT_NEAR(m.original_value, 1e-3 * std::log(2.0) + 0.5e-6, 1e-4 * 693.647e-6);
            EXPECT_NEAR(m.scaled_value, m.original_value / 100, 1e-6 * m.scaled_value);
        }

    std::string wrong = kRcScaled;  // at=4m lies past the scaled run's 50 us
    wrong.replace(wrong.find("at=40u"), 6, "at=4m ");
    v = test::verify_texts(kRc, wrong, 10, 100);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    EXPECT_FALSE(v.report.passed());
}

// A deck whose analysis and measurement live in a .control block: the corner of an RC
// low-pass, 1/(2 pi R C) = 1591.5 Hz at 1 kOhm, 100 nF (first-order low-pass, common practice;
// ngspice reads it off a 20-per-decade grid by straight lines in dB, so a little lower).
TEST(CompareMeasures, AControlBlocksMeasCommandIsComparedToo) {
    const char* deck = "rc\nV1 in 0 ac 1\nR1 in out {r}\nC1 out 0 {c}\n.control\n"
                       "ac dec 20 {f1} {f2}\nmeas ac f3db when vdb(out)=-3\nprint f3db\n.endc\n"
                       ".end\n";
    auto with = [&](const char* r, const char* c, const char* f1, const char* f2) {
        std::string d = deck;
        for (auto [key, value] : {std::pair{"{r}", r}, {"{c}", c}, {"{f1}", f1}, {"{f2}", f2}})
            d.replace(d.find(key), std::string(key).size(), value);
        return d;
    };
    PairVerification v = test::verify_texts(with("1k", "100n", "10", "100k"),
                                            with("10k", "100p", "1000", "10meg"), 10, 100);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    EXPECT_TRUE(v.report.passed());
    const Comparison& meas = v.report.comparisons.back();
    ASSERT_EQ(meas.analysis, "meas");
    ASSERT_EQ(meas.vectors.size(), 1u);
    EXPECT_NEAR(meas.vectors[0].original_value, 1591.5, 0.01 * 1591.5);
    EXPECT_NEAR(meas.vectors[0].scaled_value / meas.vectors[0].original_value, 100, 1e-9);
}

}  // namespace
}  // namespace deckscale
