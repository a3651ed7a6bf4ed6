// The analyses of a deck, its AC-capable sources, and their images under frequency scaling.
#include <string>
#include <vector>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "deck/analyses.hpp"
#include "deck/load.hpp"
#include "deck/sweep_steps.hpp"

namespace deckscale {
namespace {

DeckAnalyses analyses_of(const std::string& text) {
    MemoryFileSystem fs;
    fs.add("a.cir", text);
    return find_analyses(load_deck("a.cir", fs));
}

TEST(FindAnalyses, AcTranOpAndSources) {
    auto a = analyses_of(
        "mixed\n"
        "V1 in 0 dc 0 ac 1\n"
        "I2 0 x dc 1m\n"
        "Vb x 0 0 AC 0.5 90\n"
        "R1 in x 1k\n"
        ".AC oct 12 2k 3meg\n"
        ".tran 1u 2m 0.5m 10n uic\n"
        ".op\n"
        ".end\n");
    ASSERT_TRUE(a.ac);
    EXPECT_EQ(a.ac->type, "oct");
    EXPECT_EQ(a.ac->points, 12);
    EXPECT_EQ(a.ac->fstart, 2e3);
    EXPECT_EQ(a.ac->fstop, 3e6);
    ASSERT_TRUE(a.tran);
    EXPECT_EQ(a.tran->tstep, 1e-6);
    EXPECT_EQ(a.tran->tstop, 2e-3);
    EXPECT_EQ(a.tran->tstart, 0.5e-3);
    EXPECT_EQ(a.tran->tmax, 10e-9);
    EXPECT_TRUE(a.tran->uic);
    EXPECT_TRUE(a.op);
    EXPECT_EQ(a.sources, (std::vector<std::string>{"v1", "i2", "vb"}));
    EXPECT_EQ(a.ac_sources, (std::vector<std::string>{"v1", "vb"}));
    EXPECT_TRUE(a.problems.empty());
}

TEST(FindAnalyses, NothingToRun) {
    auto a = analyses_of("plain\nV1 in 0 5\nR1 in 0 1k\n.end\n");
    EXPECT_FALSE(a.ac);
    EXPECT_FALSE(a.tran);
    EXPECT_FALSE(a.op);
    EXPECT_TRUE(a.ac_sources.empty());
}

TEST(FindAnalyses, UnreadableCardsAreProblems) {
    struct Case {
        int line;
        std::string card;
        std::string problem;
    };
    const std::vector<Case> cases{
        {__LINE__, ".ac dec 10 {fx} 1meg",
         ".ac card: the point count and frequencies must be numbers or expressions of the deck's "
         "top-level parameters"},
        {__LINE__, ".ac log 10 1 1meg", ".ac card: unknown sweep type 'log'"},
        {__LINE__, ".ac dec 10 1meg 1k", ".ac card: the sweep must have at least one point and 0 < fstart <= fstop"},
        {__LINE__, ".tran 1u {tend*time}",
         ".tran card: its times must be numbers or expressions of the deck's top-level "
         "parameters"},
    };
    for (const auto& k : cases) {
        SCOPED_TRACE(k.line);
        auto a = analyses_of("p\n.param fl=1 tend=1m\nV1 a 0 ac 1\nR1 a 0 1\n" + k.card + "\n.end\n");
        EXPECT_EQ(a.problems, std::vector<std::string>{k.problem});
    }
}

// Parameters a deck's analyses use are evaluated with its top-level .param cards (as ngspice
// does before it runs them), and the cards verify writes carry the values in full precision.
TEST(FindAnalyses, ParametersInAnalysesAreEvaluated) {
    auto a = analyses_of(
        "p\n.param fc=10k n=20 tend={10/fc}\nV1 a 0 ac 1\nR1 a 0 1\n"
        ".ac dec {n} {fc/10} 'fc*10'\n.tran {tend/1000} {tend}\n.end\n");
    EXPECT_TRUE(a.problems.empty());
    ASSERT_TRUE(a.ac);
    EXPECT_EQ(ac_card(*a.ac), ".ac dec 20 1000 100000");
    EXPECT_EQ(a.ac->points, 20);
    ASSERT_TRUE(a.tran);
    EXPECT_EQ(a.tran->tstop, 10 / 10e3);
    EXPECT_EQ(a.tran->tstep, 10 / 10e3 / 1000);
    // A bare name in a dot card is 0 to ngspice 39, so it is not a value here.
    auto b = analyses_of("p\n.param fl=1\nV1 a 0 ac 1\nR1 a 0 1\n.ac dec 10 fl 1meg\n.end\n");
    EXPECT_FALSE(b.ac);
}

TEST(FindAnalyses, AnalysesVerifyDoesNotMapAreNamedOnce) {
    auto a = analyses_of("t\nV1 a 0 1\nR1 a 0 1k\n.dc V1 0 1 0.1\n.dc V1 0 2 0.1\n.pz a 0 a 0 vol pz\n"
                         ".sens v(a)\n.disto dec 5 1 1k\n.sens v(a)\n.end\n");
    EXPECT_EQ(a.uncompared, (std::vector<std::string>{".pz", ".sens"}));
    EXPECT_TRUE(a.asks_disto);
    ASSERT_TRUE(a.disto);  // compared since verify maps it
    EXPECT_FALSE(a.ac);
    EXPECT_FALSE(a.op);
    ASSERT_TRUE(a.dc);  // the first .dc card
    EXPECT_EQ(dc_card(*a.dc), ".dc v1 0 1 0.1");
}

TEST(FindAnalyses, DcSweepsOfOneAndTwoLevels) {
    // ngspice 39 manual 15.3.2: .dc srcnam vstart vstop vincr [src2 start2 stop2 incr2]; the
    // item may be a V or I source, a resistor or TEMP.
    auto a = analyses_of("t\n.param vmax=5\nV1 a 0 1\nI1 0 a 1m\nR1 a 0 1k\n"
                         ".dc V1 0 {vmax} 0.25 I1 1m 3m 1m\n.end\n");
    ASSERT_TRUE(a.dc);
    ASSERT_EQ(a.dc->levels.size(), 2u);
    EXPECT_EQ(a.dc->levels[0].item, "v1");
    EXPECT_EQ(a.dc->levels[0].stop, "5");  // the expression's value in full precision
    EXPECT_EQ(a.dc->levels[1].item, "i1");
    EXPECT_EQ(dc_card(*a.dc), ".dc v1 0 5 0.25 i1 1m 3m 1m");
    auto t = analyses_of("t\nR1 a 0 1k\nI1 0 a 1m\n.dc TEMP -40 125 5\n.end\n");
    ASSERT_TRUE(t.dc);
    EXPECT_EQ(dc_card(*t.dc), ".dc temp -40 125 5");
    // A bare name reads as 0 in ngspice 39's dot cards: no value (a card of too few fields is
    // refused by the reader already).
    auto bad = analyses_of("t\nV1 a 0 1\nR1 a 0 1k\n.dc V1 0 x 1\n.end\n");
    EXPECT_FALSE(bad.dc);
    ASSERT_EQ(bad.problems.size(), 1u);
    EXPECT_NE(bad.problems[0].find(".dc card: its start, stop and step must be numbers"),
              std::string::npos)
        << bad.problems[0];
}

TEST(FindAnalyses, TransferFunctionCards) {
    // ngspice 39 manual 15.3.9: .tf outvar insrc, outvar V(O<,REF>) or I(VSRC).
    auto v = analyses_of("t\nV1 a 0 1\nR1 a b 1k\nR2 b 0 1k\n.tf V(b) V1\n.end\n");
    ASSERT_TRUE(v.tf);
    EXPECT_FALSE(v.tf->current_output);
    EXPECT_EQ(tf_card(*v.tf), ".tf v(b) v1");
    auto d = analyses_of("t\nV1 a 0 1\nR1 a b 1k\nR2 b 0 1k\n.tf v(a, b) V1\n.end\n");
    ASSERT_TRUE(d.tf);
    EXPECT_EQ(tf_card(*d.tf), ".tf v(a,b) v1");
    auto i = analyses_of("t\nI1 0 a 1m\nR1 a b 1k\nVm b 0 0\n.tf i(Vm) I1\n.end\n");
    ASSERT_TRUE(i.tf);
    EXPECT_TRUE(i.tf->current_output);
    EXPECT_EQ(i.tf->source, "i1");
    EXPECT_EQ(tf_card(*i.tf), ".tf i(Vm) i1");
    auto bad = analyses_of("t\nV1 a 0 1\nR1 a 0 1k\n.tf v(a)\n.end\n");
    EXPECT_FALSE(bad.tf);
    ASSERT_EQ(bad.problems.size(), 1u);
    EXPECT_NE(bad.problems[0].find(".tf card"), std::string::npos);
}

TEST(FindAnalyses, SParameterSweeps) {
    // ngspice 39 manual 15.3.8: .sp dec|oct|lin n fstart fstop [donoise]; the flag is dropped.
    auto a = analyses_of("t\nV1 a 0 dc 0 ac 1 portnum 1 z0=50\nR1 a 0 50\n"
                         ".param fhi=4g\n.sp lin 31 1g {fhi} 1\n.end\n");
    ASSERT_TRUE(a.sp);
    EXPECT_TRUE(a.uncompared.empty());
    EXPECT_EQ(sp_card(*a.sp), ".sp lin 31 1g 4000000000");
    EXPECT_EQ(sp_card(map_sweep(*a.sp, 1e-3)), ".sp lin 31 1meg 4000000");
    auto bad = analyses_of("t\nV1 a 0 dc 0 ac 1 portnum 1\nR1 a 0 50\n.sp lin 1g 2g\n.end\n");
    EXPECT_FALSE(bad.sp);
    ASSERT_EQ(bad.problems.size(), 1u);
    EXPECT_NE(bad.problems[0].find(".sp card"), std::string::npos) << bad.problems[0];
}

TEST(FindAnalyses, ControlBlockAnalysesCountWhenNoCardAsks) {
    // Read as the dot cards they stand for (ngspice-39.3 src/frontend/spiceif.c:241), never run.
    auto a = analyses_of("t\nV1 a 0 ac 1\nR1 a 0 1k\n.control\nset x = 1\nac dec 20 1 1meg\n"
                         "tran 1u\n+ 2m\ndc V1 0 1 0.1\ntf v(a) V1\npz a 0 a 0 vol pz\n.endc\n.end\n");
    ASSERT_TRUE(a.ac);
    EXPECT_EQ(ac_card(*a.ac), ".ac dec 20 1 1meg");  // the texts as written
    ASSERT_TRUE(a.tran);
    EXPECT_EQ(tran_card(*a.tran), ".tran 9.9999999999999995e-07 0.002");
    ASSERT_TRUE(a.dc);
    EXPECT_EQ(dc_card(*a.dc), ".dc v1 0 1 0.1");
    ASSERT_TRUE(a.tf);
    EXPECT_EQ(tf_card(*a.tf), ".tf v(a) v1");
    EXPECT_EQ(a.uncompared, (std::vector<std::string>{".pz"}));
    // A deck with an analysis card keeps only the card's.
    auto b = analyses_of("t\nV1 a 0 ac 1\nR1 a 0 1k\n.op\n.control\nac dec 20 1 1meg\n.endc\n.end\n");
    EXPECT_TRUE(b.op);
    EXPECT_FALSE(b.ac);
}

TEST(ParseSweep, WordsOfTheOption) {
    std::string e;
    auto s = parse_sweep({"lin", "7", "100", "1.6k"}, e);
    ASSERT_TRUE(s) << e;
    EXPECT_EQ(ac_card(*s), ".ac lin 7 100 1.6k");  // as written
    EXPECT_FALSE(parse_sweep({"dec", "x", "1", "2"}, e));
    EXPECT_EQ(e, "the point count and frequencies must be numbers");
}

TEST(MapAnalyses, TheMappedSweepStepsLikeTheOriginal) {
    // Issue 10 §3: ngspice 39 steps `dec 1 6283.18531 62831.8531` forever and `dec 1000` of
    // those 9-digit values through 1000 points instead of 1001 (acan.c:89).
    std::string e;
    for (const char* n : {"1", "1000"}) {
        auto s = parse_sweep({"dec", n, "1", "10"}, e);
        ASSERT_TRUE(s) << e;
        AcSweep m = map_sweep(*s, 2 * 3.141592653589793 * 1000);
        EXPECT_EQ(ac_card(m), fmt::format(".ac dec {} 6283.18530717959 62831.8530717959", n));
        EXPECT_EQ(ac_points("dec", m.points, m.fstart, m.fstop).values.size(),
                  ac_points("dec", s->points, s->fstart, s->fstop).values.size());
    }
}

TEST(MapAnalyses, ASweepNgspiceCannotStepIsMappedByValue) {
    // dec 1 over half a decade: no step in ngspice 39 (acan.c:89, 0 steps), so no texts to keep.
    std::string e;
    auto s = parse_sweep({"dec", "1", "1", "5"}, e);
    ASSERT_TRUE(s) << e;
    EXPECT_EQ(ac_card(map_sweep(*s, 1000)), ".ac dec 1 1000 5000");
}

TEST(MapAnalyses, TheDecksReltolStepsTheMappedSweep) {
    // acan.c:229: f <= fstop (1 + delta reltol); with reltol 0.3 ngspice 39.3 steps
    // `oct 1 1 2.5` through 3 points, and "0.142857142857143 0.357142857142857" through 2.
    auto a = analyses_of("t\nV1 a 0 ac 1\nR1 a 0 1\n.ac oct 1 1 2.5\n.options reltol=0.3\n.end\n");
    ASSERT_TRUE(a.ac);
    EXPECT_EQ(a.ac->reltol, 0.3);
    EXPECT_EQ(ac_card(map_sweep(*a.ac, 1.0 / 7)), ".ac oct 1 0.142857142857143 0.357142857142858");
}

TEST(MapAnalyses, FrequenciesTimesKfTimesOverKf) {
    AcSweep s{"dec", 20, 0.1, 10};
    EXPECT_EQ(ac_card(map_sweep(s, 1e6)), ".ac dec 20 100000 10000000");
    TranSpec t{1e-3, 2, 0, 0, false};
    EXPECT_EQ(tran_card(map_tran(t, 1e3)), ".tran 9.9999999999999995e-07 0.002");
    TranSpec u{1e-3, 2, 0.5, 1e-4, true};
    EXPECT_EQ(tran_card(map_tran(u, 10)), ".tran 0.0001 0.20000000000000001 0.050000000000000003 1.0000000000000001e-05 uic");
    TranSpec v{1, 4, 2, 0, false};
    EXPECT_EQ(tran_card(v), ".tran 1 4 2");
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// ngspice 39 manual 15.3.3: .disto dec|oct|lin np fstart fstop [f2overf1].
TEST(FindAnalyses, DistortionCardsWithAndWithoutTheSecondFrequency) {
    auto h = analyses_of("t\n.param f1=1k\nV1 a 0 dc 1 distof1 0.1\nR1 a 0 1k\n"
                         ".disto dec 5 {f1} 1meg\n.end\n");
    ASSERT_TRUE(h.disto);
    EXPECT_EQ(disto_card(*h.disto), ".disto dec 5 1000 1meg");
    auto im = analyses_of("t\nV1 a 0 dc 1 distof1 0.1 distof2 0.1\nR1 a 0 1k\n"
                          ".disto lin 10 1k 10k 0.9\n.end\n");
    ASSERT_TRUE(im.disto);
    EXPECT_EQ(im.disto->f2overf1, "0.9");
    EXPECT_EQ(disto_card(*im.disto), ".disto lin 10 1k 10k 0.9");
    // A mapped sweep keeps the ratio: both frequencies move by Kf.
    DistoSpec mapped = *im.disto;
    mapped.sweep = map_sweep(im.disto->sweep, 1000);
    EXPECT_EQ(disto_card(mapped), ".disto lin 10 1meg 10meg 0.9");
    // A card that cannot be read is a problem, and still a .disto the deck asks for.
    auto bad = analyses_of("t\nV1 a 0 dc 1\nR1 a 0 1k\n.disto dec 5 1k 1meg 0.9 7\n.end\n");
    EXPECT_FALSE(bad.disto);
    EXPECT_TRUE(bad.asks_disto);
    ASSERT_EQ(bad.problems.size(), 1u);
    EXPECT_NE(bad.problems[0].find(".disto card: needs"), std::string::npos) << bad.problems[0];
    // In .control, as a command.
    auto ctl = analyses_of("t\nV1 a 0 dc 1 distof1 0.1\nR1 a 0 1k\n.control\ndisto oct 3 1k 8k\n"
                           ".endc\n.end\n");
    ASSERT_TRUE(ctl.disto);
    EXPECT_EQ(disto_card(*ctl.disto), ".disto oct 3 1k 8k");
}

}  // namespace
}  // namespace deckscale
