// The .tf comparison on synthetic plots named as ngspice 39 names them (the vector names were
// read off `tf v(m) V1` and `tf i(V1) I1` runs of ngspice 39 on this machine).
#include "verify/tf_compare.hpp"

#include <gtest/gtest.h>

namespace deckscale {
namespace {

SimPlot tf_plot(double transfer, double zin, double zout, const std::string& in,
                const std::string& out_name) {
    SimPlot p{"tf1", "Transfer Function", {}};
    p.vectors.push_back({"Transfer_function", VectorKind::voltage, {transfer}});
    p.vectors.push_back({in + "#Input_impedance", VectorKind::voltage, {zin}});
    p.vectors.push_back({out_name, VectorKind::voltage, {zout}});
    return p;
}

TEST(TfBackFactor, TheTransferFunctionTakesTheUnitsOfOutOverIn) {
    const double km = 8;
    TfSpec vv{"v(m)", false, "v1"}, vi{"v(m)", false, "i1"}, iv{"i(vm)", true, "v1"},
        ii{"i(vm)", true, "i1"};
    EXPECT_EQ(tf_back_factor("Transfer_function", vv, km), 1);       // V/V
    EXPECT_EQ(tf_back_factor("Transfer_function", vi, km), 1 / km);  // V/A: ohms grow by Km
    EXPECT_EQ(tf_back_factor("Transfer_function", iv, km), km);      // A/V: siemens / Km
    EXPECT_EQ(tf_back_factor("Transfer_function", ii, km), 1);       // A/A
    EXPECT_EQ(tf_back_factor("v1#Input_impedance", vv, km), 1 / km);
    EXPECT_EQ(tf_back_factor("output_impedance_at_V(m)", vv, km), 1 / km);
    EXPECT_EQ(tf_back_factor("vm#Output_impedance", iv, km), 1 / km);
    EXPECT_EQ(tf_back_factor("m", vv, km), 0);
}

TEST(CompareTf, ATransimpedanceStageScaledByKm) {
    const double km = 8;
    TfSpec t{"v(m)", false, "i1"};
    SimPlot o = tf_plot(2e3, 1e3, 500, "i1", "output_impedance_at_V(m)");
    SimPlot s = tf_plot(2e3 * km, 1e3 * km, 500 * km, "i1", "output_impedance_at_V(m)");
    Comparison c = compare_tf(o, s, t, km, Tolerances{});
    EXPECT_TRUE(c.passed());
    EXPECT_EQ(c.analysis, "tf");
    ASSERT_EQ(c.vectors.size(), 3u);
    EXPECT_LT(c.worst()->worst, 1e-15);
    // The scaled transimpedance left unscaled: a failure of (Km - 1) / Km.
    SimPlot wrong = tf_plot(2e3, 1e3 * km, 500 * km, "i1", "output_impedance_at_V(m)");
    Comparison w = compare_tf(o, wrong, t, km, Tolerances{});
    EXPECT_FALSE(w.passed());
    EXPECT_EQ(w.worst()->name, "Transfer_function");
    EXPECT_NEAR(w.worst()->worst, (km - 1) / km, 1e-12);
}

TEST(CompareTf, AMissingResultIsAProblem) {
    TfSpec t{"v(m)", false, "v1"};
    SimPlot o = tf_plot(0.5, 1e3, 500, "v1", "output_impedance_at_V(m)");
    SimPlot s{"tf1", "Transfer Function", {}};
    Comparison c = compare_tf(o, s, t, 2, Tolerances{});
    EXPECT_FALSE(c.passed());
    EXPECT_EQ(c.problems.size(), 4u);  // three missing, and nothing compared
}

}  // namespace
}  // namespace deckscale
