// The .disto comparison: on synthetic plots named as ngspice 39 names them (read off runs on
// this machine: type names "disto1", "disto2" (and "disto3" with f2overf1), titles
// "DISTORTION - 2nd harmonic" ..., a "frequency" vector of f1 and complex node voltages and
// branch currents), and on ngspice itself as the referee.
#include "verify/disto_compare.hpp"

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "support/common.hpp"
#include "verify/pair.hpp"

namespace deckscale {
namespace {

TEST(DistoPart, TheProductAfterNgspicesPrefix) {
    EXPECT_EQ(disto_part("DISTORTION - 2nd harmonic"), "2nd harmonic");
    EXPECT_EQ(disto_part("distortion - IM: f1+f2"), "IM: f1+f2");
    EXPECT_EQ(disto_part("disto1"), "disto1");
}

SimPlot disto_plot(const char* name, const char* title, double f0, double v, double i) {
    SimPlot p{name, title, {}};
    p.vectors.push_back({"frequency", VectorKind::frequency, {f0, 10 * f0}});
    p.vectors.push_back({"a", VectorKind::voltage, {{v, 0.1 * v}, {v, -0.2 * v}}});
    p.vectors.push_back({"v1#branch", VectorKind::current, {i, {0, i}}});
    return p;
}

TEST(CompareDisto, EachProductIsComparedAsAnAcSweep) {
    const double km = 10, kf = 100;
    std::vector<SimPlot> o{disto_plot("disto2", "DISTORTION - 3rd harmonic", 1e3, 2e-6, 2e-9),
                           disto_plot("disto1", "DISTORTION - 2nd harmonic", 1e3, 1e-4, 1e-7),
                           {"op1", "Operating Point", {}}};
    std::vector<SimPlot> s{disto_plot("disto1", "DISTORTION - 2nd harmonic", 1e5, 1e-4, 1e-8),
                           disto_plot("disto2", "DISTORTION - 3rd harmonic", 1e5, 2e-6, 2e-10)};
    std::string problem;
    auto cs = compare_disto(o, s, km, kf, Tolerances{}, problem);
    EXPECT_EQ(problem, "");
    ASSERT_EQ(cs.size(), 2u);
    EXPECT_EQ(cs[0].analysis, "disto");
    EXPECT_EQ(cs[0].part, "3rd harmonic");  // paired by type name, not by order
    EXPECT_EQ(cs[1].part, "2nd harmonic");
    for (const auto& c : cs) {
        EXPECT_TRUE(c.passed());
        EXPECT_EQ(c.points, 2u);
    }
    // A harmonic 1 % off fails that product alone.
    s[0] = disto_plot("disto1", "DISTORTION - 2nd harmonic", 1e5, 1.01e-4, 1e-8);
    cs = compare_disto(o, s, km, kf, Tolerances{}, problem);
    ASSERT_EQ(cs.size(), 2u);
    EXPECT_TRUE(cs[0].passed());
    EXPECT_FALSE(cs[1].passed());
    EXPECT_NEAR(cs[1].worst()->worst, 0.01, 1e-9);
    // Different sets of plots are a problem, not a comparison.
    s.pop_back();
    EXPECT_TRUE(compare_disto(o, s, km, kf, Tolerances{}, problem).empty());
    EXPECT_NE(problem.find("2 distortion plot(s) for the original and 1"), std::string::npos)
        << problem;
    s[0].name = "disto3";
    s.push_back(disto_plot("disto1", "x", 1e5, 1e-4, 1e-8));
    EXPECT_TRUE(compare_disto(o, s, km, kf, Tolerances{}, problem).empty());
    EXPECT_EQ(problem, "the scaled deck's run has no distortion plot 'disto2'");
}

PairVerification verify_texts(const std::string& original, const std::string& scaled) {
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"), original);
    test::write_bytes(dir.file("s.cir"), scaled);
    PairRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");
    r.factors_given = true;
    r.km = 10;
    r.kf = 100;
    DiskFileSystem disk;
    return verify_pair(r, disk);
}

// A common-emitter stage (invented example) and its copy at Km = 10, Kf = 100 by the laws
// (common practice: R x Km, C / (Km Kf); the BJT by m = 1/Km, its model's capacitances and
// transit time / Kf, shared notes "scaling-rules.md" §4). ngspice 39 is the referee: the
// copy's harmonics at Kf f1 are the original's (its .disto follows a BJT's m, ibid. §6).
// A copy whose BJT kept its transit time is caught in the products, not the bias.
TEST(CompareDisto, NgspiceAgreesThatAScaledStageDistortsAlike) {
    auto deck = [](bool scaled, const char* m, const char* tf) {
        return fmt::format(
            "ce\nVcc vcc 0 12\nVin in 0 dc 0 ac 1 distof1 0.01\nCin in b {}\nRb1 vcc b {}\n"
            "Rb2 b 0 {}\nRc vcc c {}\nRe e 0 {}\nQ1 c b e qm{}\n"
            ".model qm npn (is=1e-14 bf=150 vaf=80 cje={} cjc={} tf={})\n"
            ".disto dec 5 {} {}\n.end\n",
            scaled ? "1n" : "1u", scaled ? "470k" : "47k", scaled ? "100k" : "10k",
            scaled ? "47k" : "4.7k", scaled ? "10k" : "1k", m, scaled ? "100f" : "10p",
            scaled ? "50f" : "5p", tf, scaled ? "100k" : "1k", scaled ? "100meg" : "1meg");
    };
    std::string original = deck(false, "", "0.3n");
    PairVerification v = verify_texts(original, deck(true, " m=0.1", "3p"));
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    std::vector<std::string> parts;
    for (const auto& c : v.report.comparisons) {
        if (c.analysis != "disto") continue;
        parts.push_back(c.part);
        EXPECT_TRUE(c.passed()) << c.part << " " << c.worst()->name << " " << c.worst()->worst;
        EXPECT_EQ(c.points, 16u);
    }
    EXPECT_EQ(parts, (std::vector<std::string>{"2nd harmonic", "3rd harmonic"}));
    EXPECT_TRUE(v.report.passed());
    PairVerification w = verify_texts(original, deck(true, " m=0.1", "0.3n"));
    ASSERT_EQ(w.outcome, PairVerification::Outcome::compared);
    EXPECT_FALSE(w.report.passed());
}

}  // namespace
}  // namespace deckscale
