// Sweep cards through the scaling pass (scale/sweep_cards.cpp): the numbers of a sweep are
// written together so that ngspice 39 steps exactly (issue 10 §3), refused with the card's
// location when that is impossible; and the default transient tolerances written scaled
// (scale/tran_tolerances.cpp; ngspice 39 manual §15.1.1: ABSTOL 1e-12 A, CHGTOL 1e-14 C).
#include <gtest/gtest.h>

#include <numbers>

#include "deck/diagnostic.hpp"
#include "deck/sweep_steps.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

using std::numbers::pi;

struct DeckRow {
    int line;
    double km, kf;
    std::string in, out;
};

TEST(SweepCards, SweepsAreWrittenSoNgspiceStepsExactly) {
    const DeckRow rows[] = {
        // Issue 10 §3: with 9 digits the first never stops and the second loses a point.
        {__LINE__, 1, 2 * pi * 1000,
         "t\nV1 a 0 ac 1\nR1 a 0 1k\n.ac dec 1 1 10\n.ac dec 1000 1 10\n.noise v(a) V1 dec 10 1 "
         "1k\n.end\n",
         "t\nV1 a 0 ac 1\nR1 a 0 1k\n.ac dec 1 6283.18530717959 62831.8530717959\n"
         ".ac dec 1000 6283.18530717959 62831.8530717959\n"
         ".noise v(a) V1 dec 10 6283.18530717959 6.28318530717959meg\n.end\n"},
        // A DC level whose last point sits at 0: the stop value is moved into the interval
        // that keeps ngspice's 200 points (dctrcurv.c:218, an absolute 2.2e-13 tolerance).
        {__LINE__, 801000, 1,
         "t\nI1 0 a 0\nR1 a 0 1k\n.dc I1 4.975e-06 0 -25n R1 1k 2k 250\n.end\n",
         "t\nI1 0 a 0\nR1 a 0 801meg\n"
         ".dc I1 6.21098626716604e-12 1.90833618657864e-13 -31.210986267166f R1 801meg 1.602g "
         "200250000\n"
         ".end\n"},
        // The deck's reltol widens the stop test f <= fstop (1 + delta reltol) (acan.c:229):
        // 4 sits on its edge. ngspice 39.3 steps the original and this card through 3 points,
        // and "0.142857142857143 0.357142857142857" (no nudge) through 2.
        {__LINE__, 1, 1.0 / 7,
         "t\nV1 a 0 ac 1\nR1 a 0 1k\n.options reltol=0.3\n.ac oct 1 1 2.5\n.end\n",
         "t\nV1 a 0 ac 1\nR1 a 0 1k\n.options reltol=0.3\n.ac oct 1 0.142857142857143 "
         "0.357142857142858\n.end\n"},
        // Voltage and temperature sweeps do not move.
        {__LINE__, 7, 1000, "t\nV1 a 0 1\nR1 a 0 1k\n.dc V1 0 1.3 0.1 TEMP -40 85 5\n.end\n",
         "t\nV1 a 0 1\nR1 a 0 7k\n.dc V1 0 1.3 0.1 TEMP -40 85 5\n.end\n"},
        // Parameters keep the one-by-one path (fa, a frequency only, scaled where defined).
        {__LINE__, 1, 1000, "t\n.param fa=1\nV1 a 0 ac 1\nR1 a 0 1k\n.ac dec 10 {fa} 1k\n.end\n",
         "t\n.param fa=1000\nV1 a 0 ac 1\nR1 a 0 1k\n.ac dec 10 {fa} 1meg\n.end\n"},
        {__LINE__, 1, 1000, "t\n.param fa=1\nV1 a 0 ac 1\nR1 a 0 fa\n.ac dec 10 {fa} 1k\n.end\n",
         "t\n.param fa=1\nV1 a 0 ac 1\nR1 a 0 fa\n.ac dec 10 {(fa)*1000} 1meg\n.end\n"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "sweep_cards_test.cpp:" << r.line);
        auto s = test::scale_text(r.in, r.km, r.kf, 9);
        for (const auto& d : s.result.unscalable) ADD_FAILURE() << render(d);
        EXPECT_EQ(s.text(), r.out);
    }
    // The DC row keeps its 200 points (the stepping model, checked against ngspice 39.3 in
    // tests/deck/sweep_steps_test.cpp).
    EXPECT_EQ(dc_points(ngspice_read("6.21098626716604e-12"), ngspice_read("1.90833618657864e-13"),
                        ngspice_read("-31.210986267166f"))
                  .values.size(),
              200u);
}

TEST(SweepCards, AReltolSetAfterTheSweepCountsInOnePass) {
    // load_and_scale meets the sweep before the .options: it scales the deck again.
    MemoryFileSystem fs;
    fs.add("deck.cir", "t\nV1 a 0 ac 1\n.ac oct 1 1 2.5\n.options reltol=0.3\n.end\n");
    ScaleSettings settings;
    settings.factors = {1, 1.0 / 7};
    ScaledDeck one = load_and_scale("deck.cir", fs, settings);
    EXPECT_EQ(apply_edits(one.deck.top().text(), one.result.edits[0]),
              "t\nV1 a 0 ac 1\n.ac oct 1 0.142857142857143 0.357142857142858\n"
              ".options reltol=0.3\n.end\n");
}

// The same with a second sweep after the .options: the last lookup of RELTOL then agreed with
// the final one, and the first sweep kept the rewrite made for the default (found by the deck
// fuzz target: the pass while reading and the pass over the finished deck disagreed).
TEST(SweepCards, AReltolSetBetweenTwoSweepsCountsForBoth) {
    const std::string deck =
        "t\nV1 a 0 ac 1\n.ac oct 1 1 2.5\n.options reltol=0.3\n.ac oct 1 1 2.5\n.end\n";
    MemoryFileSystem fs;
    fs.add("deck.cir", deck);
    ScaleSettings settings;
    settings.factors = {1, 1.0 / 7};
    ScaledDeck one = load_and_scale("deck.cir", fs, settings);
    ScaleResult two = scale_deck(one.deck, settings);
    std::string streamed = apply_edits(one.deck.top().text(), one.result.edits[0]);
    EXPECT_EQ(streamed, apply_edits(one.deck.top().text(), two.edits[0]));
    EXPECT_EQ(streamed,
              "t\nV1 a 0 ac 1\n.ac oct 1 0.142857142857143 0.357142857142858\n"
              ".options reltol=0.3\n.ac oct 1 0.142857142857143 0.357142857142858\n.end\n");
}

TEST(SweepCards, ASweepNgspiceCannotStepIsReportedAtItsCard) {
    auto s = test::scale_text("t\nV1 a 0 ac 1\nR1 a 0 1k\n.ac dec 1 1 5\n.dc R1 1k 2k 0\n.end\n", 2,
                              1000);
    EXPECT_EQ(
        render(s.result.unscalable),
        "deck.cir:4:11: error: ngspice 39 never ends this sweep (its frequency runs away): the "
        "original card itself does not work\n  .ac dec 1 1 5\n            ^\n"
        "deck.cir:5:8: error: ngspice 39 never ends this DC sweep (a step of 0?): the original "
        "card itself does not work\n  .dc R1 1k 2k 0\n         ^~\n");
}

TEST(SweepCards, DefaultTransientTolerancesAreWrittenScaled) {
    const DeckRow rows[] = {
        {__LINE__, 7, 1000, "t\nV1 a 0 1\nR1 a 0 1k\nC1 a 0 1u\n.tran 1u 2m\n.end\n",
         "t\nV1 a 0 1\nR1 a 0 7k\nC1 a 0 142.857143p\n.tran 1n 2u\n"
         ".options abstol=1.42857143e-13 chgtol=1.42857143e-18\n.end\n"},
        // Set by the deck: scaled by the rule table (abstol A / Km); only chgtol is added.
        {__LINE__, 7, 1000, "t\nR1 a 0 1k\n.options abstol=1p\n.tran 1u 2m 0 1u uic\n.end\n",
         "t\nR1 a 0 7k\n.options abstol=142.857143f\n.tran 1n 2u 0 1n uic\n"
         ".options chgtol=1.42857143e-18\n.end\n"},
        {__LINE__, 7, 1000, "t\nR1 a 0 1k\n.tran 1u 2m\n.opt ABSTOL=1p chgtol=1e-14\n.end\n",
         "t\nR1 a 0 7k\n.tran 1n 2u\n.opt ABSTOL=142.857143f chgtol=1.42857143e-18\n.end\n"},
        // Km = 1: abstol keeps its meaning; chgtol / Kf.
        {__LINE__, 1, 1000, "t\nR1 a 0 1k\n.tran 1u 2m\n.end\n",
         "t\nR1 a 0 1k\n.tran 1n 2u\n.options chgtol=1e-17\n.end\n"},
        // No .end: at the end of the file, in its line-end style.
        {__LINE__, 10, 10, "t\r\nR1 a 0 1k\r\n.tran 1u 2m",
         "t\r\nR1 a 0 10k\r\n.tran 100n 200u\r\n"
         ".options abstol=1e-13 chgtol=1e-16\r\n"},
        // No transient: nothing to add.
        {__LINE__, 7, 1000, "t\nV1 a 0 ac 1\nR1 a 0 1k\n.ac lin 3 1 3\n.end\n",
         "t\nV1 a 0 ac 1\nR1 a 0 7k\n.ac lin 3 1000 3000\n.end\n"},
        // Factors of 1 reproduce the deck byte for byte.
        {__LINE__, 1, 1, "t\nR1 a 0 1k\n.tran 1u 2m\n.end\n", "t\nR1 a 0 1k\n.tran 1u 2m\n.end\n"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "sweep_cards_test.cpp:" << r.line);
        auto s = test::scale_text(r.in, r.km, r.kf, 9);
        for (const auto& d : s.result.unscalable) ADD_FAILURE() << render(d);
        EXPECT_EQ(s.text(), r.out);
    }
}

TEST(SweepCards, TolerancesSetInAControlBlockCount) {
    // `tran` as a command, `set chgtol=...` in the script: only abstol is written.
    auto s = test::scale_text("t\nR1 a 0 1k\n.control\nset chgtol=1e-15\ntran 1u 2m\n.endc\n.end\n",
                              7, 1000, 9, true);
    EXPECT_EQ(s.text(),
              "t\nR1 a 0 7k\n.control\nset chgtol=1.42857143e-19\ntran 1n 2u\n.endc\n"
              ".options abstol=1.42857143e-13\n.end\n");
}

TEST(SweepCards, InductorsWithKmOtherThanOneGetANote) {
    // ngspice-39.3 src/spicelib/analysis/cktterr.c: the inductor's truncation error uses the
    // same ABSTOL and CHGTOL; an ngspice 39.3 run of an RLC pulse deck at Km = 0.04 gave 527
    // time points instead of 529.
    const std::string deck = "t\nR1 a b 1k\nL1 b 0 1m\n.tran 1u 2m\n.end\n";
    EXPECT_EQ(render(test::scale_text(deck, 7, 1000, 9).result.notes),
              "deck.cir:4:1: note: with inductors and Km != 1 ngspice's transient error control "
              "cannot be scaled exactly (it applies ABSTOL and CHGTOL to inductor voltages and "
              "fluxes too): time points can differ slightly from the original's / Kf\n"
              "  .tran 1u 2m\n  ^\n");
    EXPECT_EQ(render(test::scale_text(deck, 1, 1000, 9).result.notes), "");
}

TEST(SweepCards, TheAddedOptionsAreInTheChangeList) {
    auto s = test::scale_text("t\nR1 a 0 1k\n.tran 1u 2m\n.end\n", 7, 1000, 9);
    ASSERT_EQ(s.result.changes.size(), 4u);
    const Change& c = s.result.changes.back();
    EXPECT_EQ(c.element, ".options");
    EXPECT_EQ(c.field, "abstol, chgtol (defaults written out for the transient)");
    EXPECT_EQ(c.old_text, "");
    EXPECT_EQ(c.new_text, ".options abstol=1.42857143e-13 chgtol=1.42857143e-18");
    EXPECT_EQ(s.result.change_count, 4u);
}

}  // namespace
}  // namespace deckscale
