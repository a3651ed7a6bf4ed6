// ngspice's helper vectors for behavioural G, C and L under comparison
// (verify/helper_vectors through verify/compare), on synthetic plots: no simulator runs.
#include <gtest/gtest.h>

#include <complex>
#include <string>
#include <utility>
#include <vector>

#include "verify/compare.hpp"

namespace deckscale {
namespace {

using cd = std::complex<double>;

// A one-pole response on the given frequencies and the current of its source (as in
// compare_test.cpp).
SimPlot ac_plot(const std::vector<double>& freqs, double fc, double current_scale) {
    SimPlot p{"ac1", "AC Analysis", {}};
    std::vector<cd> f, v, i;
    for (double x : freqs) {
        cd h = 1.0 / cd(1, x / fc);
        f.emplace_back(x);
        v.push_back(h);
        i.push_back(-h * current_scale);
    }
    p.vectors.push_back(SimVector{"frequency", VectorKind::frequency, f});
    p.vectors.push_back(SimVector{"out", VectorKind::voltage, v});
    p.vectors.push_back(SimVector{"v1#branch", VectorKind::current, i});
    return p;
}

const std::vector<double> kFreqs{10, 100, 1000, 10000};

std::vector<double> times(const std::vector<double>& f, double k) {
    std::vector<double> out;
    for (double x : f) out.push_back(x * k);
    return out;
}

SimVector constant(const std::string& name, VectorKind kind, double x) {
    return SimVector{name, kind, std::vector<cd>(kFreqs.size(), cd(x))};
}

// The internal node of a G source with an expression carries its current as a voltage
// (ngspice 39 `listing expand`: `g1 0 iout g1_int1 0 1`), so it is compared times Km; an
// E source's `e1_int1` and ordinary nodes stay voltages, and so does a G TABLE's `g1_int2`,
// the value of its controlling expression (an ngspice 39 run of `G2 0 n2 TABLE {i(Vs)*1k} =
// ...` scaled by Km = 7 agreed at 7.5e-9 with it compared as it is).
TEST(HelperVectors, InternalNodeOfAnExpressionGSourceIsACurrent) {
    struct Case {
        int line;
        std::string name;
        double scaled_by;  // the scaled deck's value / the original's
        bool passes;
    };
    const double km = 50, kf = 1e3;
    const Case cases[] = {
        {__LINE__, "g1_int1", 1 / km, true}, {__LINE__, "gload_int1", 1 / km, true},
        {__LINE__, "g1_int1", 1, false},     {__LINE__, "e1_int1", 1, true},
        {__LINE__, "g1_int2", 1, true},      {__LINE__, "g1_int2", 1 / km, false},
        {__LINE__, "g1_intx", 1, true},      {__LINE__, "gate", 1, true},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "helper_vectors_test.cpp:" << c.line << ": " << c.name);
        SimPlot original = ac_plot(kFreqs, 1000, 1e-3);
        SimPlot scaled = ac_plot(times(kFreqs, kf), 1000 * kf, 1e-3 / km);
        original.vectors.push_back(constant(c.name, VectorKind::voltage, 2e-3));
        scaled.vectors.push_back(constant(c.name, VectorKind::voltage, 2e-3 * c.scaled_by));
        EXPECT_EQ(compare_ac(original, scaled, km, kf, Tolerances{}).passed(), c.passes);
    }
}

// The helpers ngspice 39 makes for `C1 a 0 Q='…'` and `L1 a b L='…'` (`listing expand`:
// `lc1 c1_int1 0 1` carries the charge, `l1_int2` holds 1 H times di/dt): not compared, and
// listed; `c1_int1` (dQ/dt) is a current. A user's inductor named lc… without a c…_int1 node
// is compared as usual.
TEST(HelperVectors, StatesOfBehaviouralCapacitorsAndInductors) {
    struct Case {
        int line;
        std::vector<std::pair<std::string, VectorKind>> extra;  // added to both plots
        double scaled_by;                                       // scaled / original value
        bool passes;
        std::vector<std::string> not_compared;
    };
    const double km = 50, kf = 1e3;
    const auto V = VectorKind::voltage, I = VectorKind::current;
    const Case cases[] = {
        {__LINE__, {{"c1_int1", V}}, 1 / km, true, {}},
        {__LINE__, {{"c1_int1", V}}, 1, false, {}},
        {__LINE__, {{"l1_int2", V}}, 20, true, {"l1_int2"}},
        {__LINE__, {{"c1_int1", V}, {"lc1#branch", I}}, 1 / km, true, {"lc1#branch"}},
        {__LINE__, {{"lcoil#branch", I}}, 1, false, {}},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "helper_vectors_test.cpp:" << c.line);
        SimPlot original = ac_plot(kFreqs, 1000, 1e-3);
        SimPlot scaled = ac_plot(times(kFreqs, kf), 1000 * kf, 1e-3 / km);
        for (const auto& [name, kind] : c.extra) {
            original.vectors.push_back(constant(name, kind, 2e-3));
            scaled.vectors.push_back(constant(name, kind, 2e-3 * c.scaled_by));
        }
        Comparison r = compare_ac(original, scaled, km, kf, Tolerances{});
        EXPECT_EQ(r.passed(), c.passes);
        EXPECT_EQ(r.not_compared, c.not_compared);
    }
}

}  // namespace
}  // namespace deckscale
