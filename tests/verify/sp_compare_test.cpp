// The .sp comparison: on synthetic plots named as ngspice 39 names them (read off a two-port
// `.sp lin` run of ngspice 39 on this machine: Z_i_j, Y_i_j, S_i_j, the ports' "v1#res"
// states, branch currents, node voltages and "frequency", every one but the currents and
// the frequency typed as a voltage), and on ngspice itself as the referee.
#include "verify/sp_compare.hpp"

#include <gtest/gtest.h>

#include "support/common.hpp"
#include "verify/pair.hpp"

namespace deckscale {
namespace {

TEST(ImpedanceMatrixVector, OnlyZAndYWithTwoPortNumbers) {
    for (const char* yes : {"Z_1_1", "Z_2_1", "y_1_2", "Y_10_3"})
        EXPECT_TRUE(impedance_matrix_vector(yes)) << yes;
    for (const char* no : {"S_1_1", "Z_1", "Z_1_", "Z__1_1", "z_a_1", "zout", "Z_1_1_1", "y_1_2x"})
        EXPECT_FALSE(impedance_matrix_vector(no)) << no;
}

SimPlot sp_plot(double f0, double s21, double z11, double node, double current) {
    SimPlot p{"sp1", "SP Analysis", {}};
    p.vectors.push_back({"frequency", VectorKind::frequency, {f0, 2 * f0}});
    p.vectors.push_back({"Z_1_1", VectorKind::voltage, {z11, z11}});
    p.vectors.push_back({"Y_1_1", VectorKind::voltage, {1 / z11, 1 / z11}});
    p.vectors.push_back({"S_2_1", VectorKind::voltage, {s21, {0, s21}}});
    p.vectors.push_back({"v1#res", VectorKind::voltage, {node, node}});
    p.vectors.push_back({"v1#branch", VectorKind::current, {current, current}});
    p.vectors.push_back({"out", VectorKind::voltage, {node, node}});
    return p;
}

TEST(CompareSp, SStaysZAndYAreLeftToItCurrentsMapBack) {
    const double km = 10, kf = 1e3;
    SimPlot o = sp_plot(1e9, 0.7, 50, 0.4, 2e-3);
    SimPlot s = sp_plot(1e12, 0.7, 500, 0.4, 2e-4);
    Comparison c = compare_sp(o, s, km, kf, Tolerances{});
    EXPECT_TRUE(c.passed());
    EXPECT_EQ(c.analysis, "sp");
    ASSERT_EQ(c.vectors.size(), 3u);  // S_2_1, v1#branch, out
    for (const auto& v : c.vectors) EXPECT_NE(v.name[0], 'Z');
    EXPECT_EQ(c.not_compared, (std::vector<std::string>{"v1#res"}));
    // S off by 1 % fails, whatever Z and Y say.
    SimPlot wrong = sp_plot(1e12, 0.707, 500, 0.4, 2e-4);
    Comparison w = compare_sp(o, wrong, km, kf, Tolerances{});
    EXPECT_FALSE(w.passed());
    EXPECT_EQ(w.worst()->name, "S_2_1");
    EXPECT_NEAR(w.worst()->worst, 0.01, 1e-9);
}

// A 2.4 GHz low-pass pi between two 50 Ohm ports (C 1.3 pF, L 3.3 nH, C 1.3 pF; an invented
// example) and its copy at Km = 10, Kf = 1000 by the laws (common practice: L x Km / Kf,
// C / (Km Kf)), with the ports' z0 x Km (shared notes "scaling-rules.md" §2). ngspice 39
// is the referee: the copy's S-parameters at Kf f are the original's, and the same copy with
// its ports left at 50 Ohm is caught.
TEST(CompareSp, NgspiceAgreesThatTheScaledTwoPortHasTheSameSParameters) {
    const std::string head = "pi\nV1 in 0 dc 0 ac 1 portnum 1 z0 ";
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"), head + "50\nV2 out 0 dc 0 ac 0 portnum 2 z0=50\n"
                                         "C1 in 0 1.3p\nL1 in out 3.3n\nC2 out 0 1.3p\n"
                                         ".sp lin 31 1g 4g\n.end\n");
    auto scaled = [&](const char* z0) {
        return head + z0 + "\nV2 out 0 dc 0 ac 0 portnum 2 z0=" + z0 +
               "\nC1 in 0 0.13f\nL1 in out 33p\nC2 out 0 0.13f\n.sp lin 31 1t 4t\n.end\n";
    };
    test::write_bytes(dir.file("s.cir"), scaled("500"));
    test::write_bytes(dir.file("w.cir"), scaled("50"));
    PairRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");
    DiskFileSystem disk;
    PairVerification v = verify_pair(r, disk);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    EXPECT_NEAR(v.report.kf, 1000, 1e-6);
    ASSERT_EQ(v.report.comparisons.size(), 1u);  // the .sp sweep alone
    const Comparison& c = v.report.comparisons[0];
    EXPECT_EQ(c.analysis, "sp");
    EXPECT_EQ(c.points, 31u);
    EXPECT_TRUE(c.passed()) << c.worst()->name << " " << c.worst()->worst;
    EXPECT_LT(c.worst()->worst, 1e-9);
    EXPECT_NE(std::find_if(c.vectors.begin(), c.vectors.end(),
                           [](const VectorResult& x) { return x.name == "S_2_1"; }),
              c.vectors.end());
    r.scaled = dir.file("w.cir");
    PairVerification w = verify_pair(r, disk);
    ASSERT_EQ(w.outcome, PairVerification::Outcome::compared);
    EXPECT_FALSE(w.report.passed());
}

}  // namespace
}  // namespace deckscale
