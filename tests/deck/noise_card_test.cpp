// Reading the noise analysis of a deck (.noise card or `noise` command of .control; ngspice
// 39 manual §15.3.4: `.noise v(output <,ref>) src (dec | lin | oct) pts fstart fstop
// <pts_per_summary>`), and its image under frequency scaling.
#include <string>
#include <vector>

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

const std::string kCircuit = "n\nV1 a 0 dc 0 ac 1\nI1 0 b dc 1m\nR1 a b 1k\nR2 b 0 1k\n";

TEST(NoiseCard, ReadsOutputSourceSweepAndSummary) {
    struct Case {
        int line;
        std::string card, output, source, type, points, fstart, fstop, summary;
    };
    const std::vector<Case> cases{
        {__LINE__, ".noise v(b) V1 dec 10 1 1meg", "v(b)", "v1", "dec", "10", "1", "1meg", ""},
        {__LINE__, ".NOISE V(b, a) v1 OCT 8 10 20k 4", "v(b,a)", "v1", "oct", "8", "10", "20k",
         "4"},
        {__LINE__, ".noise v(b) I1 lin 5 1k 2k", "v(b)", "i1", "lin", "5", "1k", "2k", ""},
        // Top-level parameters are evaluated; verify writes their values in full precision.
        {__LINE__, ".param fn=3k np=7\n.noise v(b) V1 dec {np} {fn/3} 'fn*10' {np}", "v(b)", "v1",
         "dec", "7", "1000", "30000", "7"},
    };
    for (const auto& k : cases) {
        SCOPED_TRACE(k.line);
        auto a = analyses_of(kCircuit + k.card + "\n.end\n");
        ASSERT_TRUE(a.noise) << (a.problems.empty() ? "" : a.problems.front());
        EXPECT_EQ(a.noise->output, k.output);
        EXPECT_EQ(a.noise->source, k.source);
        EXPECT_EQ(a.noise->type, k.type);
        EXPECT_EQ(a.noise->points_text, k.points);
        EXPECT_EQ(a.noise->fstart_text, k.fstart);
        EXPECT_EQ(a.noise->fstop_text, k.fstop);
        EXPECT_EQ(a.noise->summary_text, k.summary);
        EXPECT_TRUE(a.uncompared.empty());
    }
}

TEST(NoiseCard, UnreadableCardsAreProblems) {
    struct Case {
        int line;
        std::string card, problem;
    };
    const std::vector<Case> cases{
        {__LINE__, ".noise i(V1) V1 dec 10 1 1k",
         ".noise card: the output must be v(node) or v(node,ref)"},
        {__LINE__, ".noise v(b V1 dec 10 1 1k",
         ".noise card: the output must be v(node) or v(node,ref)"},
        {__LINE__, ".noise v(b) R1 dec 10 1 1k",
         ".noise card: the input 'R1' is not an independent V or I source"},
        {__LINE__, ".noise v(b) V1 log 10 1 1k", ".noise card: unknown sweep type 'log'"},
        {__LINE__, ".noise v(b) V1 dec 10 1",
         ".noise card: needs an input source, dec|oct|lin, a point count and two frequencies"},
        {__LINE__, ".noise v(b) V1 dec 10 {fx} 1k",
         ".noise card: the point counts and frequencies must be numbers or expressions of the "
         "deck's top-level parameters"},
        {__LINE__, ".noise v(b) V1 dec 10 1k 1",
         ".noise card: the sweep must have at least one point and 0 < fstart <= fstop"},
    };
    for (const auto& k : cases) {
        SCOPED_TRACE(k.line);
        auto a = analyses_of(kCircuit + ".param fl=1\n" + k.card + "\n.end\n");
        EXPECT_FALSE(a.noise);
        EXPECT_EQ(a.problems, std::vector<std::string>{k.problem});
    }
}

TEST(NoiseCard, ControlBlockNoiseCountsWhenNoCardAsks) {
    auto a = analyses_of(kCircuit + ".control\nnoise v(b) V1 dec 10 10 100k\nrun\n.endc\n.end\n");
    ASSERT_TRUE(a.noise);
    EXPECT_EQ(noise_card(*a.noise), ".noise v(b) v1 dec 10 10 100k");
    auto b = analyses_of(kCircuit + ".op\n.control\nnoise v(b) V1 dec 10 10 100k\n.endc\n.end\n");
    EXPECT_FALSE(b.noise);
}

TEST(NoiseCard, TheMappedSweepStepsLikeTheOriginal) {
    // noisean.c steps f *= 10^(1/N) while f <= fstop (1 + delta reltol) (shared notes
    // control-and-sweeps.md Part B): the mapped texts must step through as many points.
    auto a = analyses_of(kCircuit + ".noise v(b) V1 dec 7 3.3 47k 2\n.end\n");
    ASSERT_TRUE(a.noise);
    for (double kf : {1000.0, 2 * 3.141592653589793 * 1e6, 1.0 / 7}) {
        SCOPED_TRACE(kf);
        NoiseSpec m = map_noise(*a.noise, kf);
        EXPECT_EQ(m.output, "v(b)");
        EXPECT_EQ(m.summary_text, "2");
        EXPECT_NEAR(m.fstart / (3.3 * kf), 1, 1e-14);
        auto po = noise_points("dec", 7, a.noise->fstart, a.noise->fstop).values;
        auto pm = noise_points("dec", 7, m.fstart, m.fstop).values;
        ASSERT_EQ(po.size(), pm.size());
        for (std::size_t k = 0; k < po.size(); ++k) EXPECT_NEAR(pm[k] / (po[k] * kf), 1, 1e-12);
    }
    // Each number keeps its spelling: plain stays plain, a suffix stays a suffix.
    EXPECT_EQ(noise_card(map_noise(*a.noise, 1000)), ".noise v(b) v1 dec 7 3300 47meg 2");
}

}  // namespace
}  // namespace deckscale
