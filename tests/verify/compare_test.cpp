// Unit tests of the comparison of two simulations on synthetic plots: no simulator runs.
#include <algorithm>
#include <cmath>
#include <complex>
#include <limits>
#include <numbers>
#include <random>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "verify/compare.hpp"

namespace deckscale {
namespace {

using cd = std::complex<double>;

SimVector vec(std::string name, VectorKind kind, std::vector<cd> values) {
    return SimVector{std::move(name), kind, std::move(values)};
}

std::vector<cd> reals(const std::vector<double>& x) { return {x.begin(), x.end()}; }

// A one-pole response H(f) = 1 / (1 + j f / fc) on the given frequencies, and the current
// of a source driving 1 kOhm at that node (in amperes).
SimPlot ac_plot(const std::vector<double>& freqs, double fc, double current_scale = 1e-3) {
    SimPlot p{"ac1", "AC Analysis", {}};
    std::vector<cd> v, i;
    for (double f : freqs) {
        cd h = 1.0 / cd(1, f / fc);
        v.push_back(h);
        i.push_back(-h * current_scale);
    }
    p.vectors.push_back(vec("frequency", VectorKind::frequency, reals(freqs)));
    p.vectors.push_back(vec("out", VectorKind::voltage, v));
    p.vectors.push_back(vec("v1#branch", VectorKind::current, i));
    return p;
}

std::vector<double> times(const std::vector<double>& f, double k) {
    std::vector<double> out;
    for (double x : f) out.push_back(x * k);
    return out;
}

const std::vector<double> kFreqs{10, 100, 1000, 10000};

// A run that gives NaN (a model ngspice 39 cannot evaluate: a BSIM1 card of defaults gave NaN
// in every AC vector of both decks, and verify said PASS) shows no equivalence: the vector
// fails, comes first, and the comparison names it as a problem.
TEST(CompareAc, NanValuesFailInsteadOfPassing) {
    const double nan = std::numeric_limits<double>::quiet_NaN();
    SimPlot original = ac_plot(kFreqs, 1000), scaled = ac_plot(kFreqs, 1000);
    for (SimPlot* p : {&original, &scaled}) p->vectors[1].values[2] = {nan, 0};
    Comparison c = compare_ac(original, scaled, 1, 1, Tolerances{});
    EXPECT_FALSE(c.passed());
    ASSERT_EQ(c.vectors.size(), 2u);
    EXPECT_EQ(c.vectors[0].name, "out");
    EXPECT_FALSE(c.vectors[0].passed);
    ASSERT_EQ(c.problems.size(), 1u);
    EXPECT_EQ(c.problems[0], "no error can be computed for out (NaN or infinite values in a run: "
                             "the simulator could not evaluate the circuit there), so "
                             "equivalence is not shown");
}

TEST(CompareAc, CurrentsAreMultipliedByKmAndFrequenciesByKf) {
    const double km = 50, kf = 1e3;
    SimPlot original = ac_plot(kFreqs, 1000);
    SimPlot scaled = ac_plot(times(kFreqs, kf), 1000 * kf, 1e-3 / km);
    Comparison c = compare_ac(original, scaled, km, kf, Tolerances{});
    EXPECT_TRUE(c.problems.empty());
    EXPECT_TRUE(c.passed());
    ASSERT_EQ(c.vectors.size(), 2u);
    EXPECT_LT(c.worst()->worst, 1e-12);
    EXPECT_EQ(c.points, 4u);
    EXPECT_EQ(c.first, 10);
    EXPECT_EQ(c.last, 10000);

    // The same currents without the 1/Km: the current vector fails, the voltage passes.
    SimPlot unscaled_current = ac_plot(times(kFreqs, kf), 1000 * kf, 1e-3);
    Comparison d = compare_ac(original, unscaled_current, km, kf, Tolerances{});
    ASSERT_EQ(d.vectors.size(), 2u);
    EXPECT_EQ(d.vectors[0].name, "v1#branch");
    EXPECT_FALSE(d.vectors[0].passed);
    EXPECT_NEAR(d.vectors[0].worst, km - 1, 1e-9);
    EXPECT_TRUE(d.vectors[1].passed);
    EXPECT_FALSE(d.passed());
}

TEST(CompareAc, FrequencyGridMismatchIsAProblem) {
    struct Case {
        int line;
        std::vector<double> scaled_freqs;
        std::string problem;
    };
    const std::vector<Case> cases{
        {__LINE__, {10, 100, 1000, 10000}, "point 0: the scaled deck ran at 10 Hz, not at Kf x 10 Hz"},
        {__LINE__, {100, 1000, 10000, 100000, 1e6}, "the sweeps have 4 and 5 points"},
        {__LINE__, {100, 1000, 10001, 100000}, "point 2: the scaled deck ran at 10001 Hz, not at Kf x 1000 Hz"},
    };
    for (const auto& k : cases) {
        SCOPED_TRACE(k.line);
        Comparison c = compare_ac(ac_plot(kFreqs, 1000), ac_plot(k.scaled_freqs, 1e4), 1, 10, Tolerances{});
        ASSERT_FALSE(c.problems.empty());
        EXPECT_EQ(c.problems.front(), k.problem);
        EXPECT_FALSE(c.passed());
    }
}

TEST(CompareAc, MissingVectorsAreNamedBothWays) {
    SimPlot original = ac_plot(kFreqs, 1000);
    SimPlot scaled = ac_plot(kFreqs, 1000);
    scaled.vectors.pop_back();  // no v1#branch
    scaled.vectors.push_back(vec("extra", VectorKind::voltage, reals({1, 1, 1, 1})));
    Comparison c = compare_ac(original, scaled, 1, 1, Tolerances{});
    EXPECT_EQ(c.problems, (std::vector<std::string>{
                              "'v1#branch' exists in the original but not in the scaled deck",
                              "'extra' exists in the scaled deck but not in the original"}));
    EXPECT_FALSE(c.passed());
}

// ngspice 39 makes the device currents of `.options savecurrents` (@r1[i]) in an AC plot but
// fills none (tried: length 0 in both runs): named in a note, not shown as compared.
TEST(CompareAc, VectorsWithoutValuesAreNotedNotCompared) {
    SimPlot original = ac_plot(kFreqs, 1000);
    SimPlot scaled = ac_plot(kFreqs, 1000);
    for (SimPlot* p : {&original, &scaled}) {
        p->vectors.push_back(vec("@r1[i]", VectorKind::current, {}));
        p->vectors.push_back(vec("@c1[i]", VectorKind::current, {}));
    }
    Comparison c = compare_ac(original, scaled, 1, 1, Tolerances{});
    EXPECT_TRUE(c.passed());
    EXPECT_EQ(c.vectors.size(), 2u);
    EXPECT_EQ(c.notes, (std::vector<std::string>{
                           "ngspice gave no values for @r1[i], @c1[i] in either run: not compared"}));
    scaled.vectors.back().values = reals({1, 1, 1, 1});
    c = compare_ac(original, scaled, 1, 1, Tolerances{});
    EXPECT_EQ(c.problems, (std::vector<std::string>{"'@c1[i]' has values in the scaled run only"}));
    EXPECT_FALSE(c.passed());
}

TEST(CompareAc, NoFrequencyVector) {
    SimPlot original = ac_plot(kFreqs, 1000);
    original.vectors.erase(original.vectors.begin());
    Comparison c = compare_ac(original, ac_plot(kFreqs, 1000), 1, 1, Tolerances{});
    EXPECT_EQ(c.problems, std::vector<std::string>{"an AC plot without a frequency vector"});
    EXPECT_FALSE(c.passed());
}

// A scaled response whose gain is off by `gain` and whose phase is off by `deg` everywhere.
SimPlot distorted(double gain, double deg) {
    SimPlot p = ac_plot(kFreqs, 1000);
    cd factor = std::polar(gain, deg * std::numbers::pi / 180);
    for (auto& v : p.vectors)
        if (v.kind == VectorKind::voltage || v.kind == VectorKind::current)
            for (auto& x : v.values) x *= factor;
    return p;
}

TEST(CompareAc, DecibelAndDegreeTolerances) {
    const double g01 = std::pow(10, 0.01 / 20);  // +0.01 dB
    struct Case {
        int line;
        double gain, deg;
        Tolerances tol;
        bool passes;
    };
    const std::vector<Case> cases{
        // Only the relative tolerance: 0.01 dB is 1.2e-3 relative.
        {__LINE__, g01, 0, Tolerances{1e-2, 1e-3, 0, 0}, true},
        {__LINE__, g01, 0, Tolerances{1e-3, 1e-3, 0, 0}, false},
        // dB limit on top of a loose relative tolerance.
        {__LINE__, g01, 0, Tolerances{1, 1e-3, 0.02, 0}, true},
        {__LINE__, g01, 0, Tolerances{1, 1e-3, 0.005, 0}, false},
        // Phase limit on top of a loose relative tolerance.
        {__LINE__, 1, 0.5, Tolerances{1, 1e-3, 0, 1}, true},
        {__LINE__, 1, 0.5, Tolerances{1, 1e-3, 0, 0.25}, false},
        {__LINE__, 1, -0.5, Tolerances{1, 1e-3, 0, 0.25}, false},
        // A phase error near 360 degrees is a small error, not a large one.
        {__LINE__, 1, 359.9, Tolerances{1, 1e-3, 0, 0.2}, true},
    };
    for (const auto& k : cases) {
        SCOPED_TRACE(k.line);
        Comparison c = compare_ac(ac_plot(kFreqs, 1000), distorted(k.gain, k.deg), 1, 1, k.tol);
        EXPECT_EQ(c.passed(), k.passes);
        const VectorResult* out = nullptr;
        for (const auto& v : c.vectors)
            if (v.name == "out") out = &v;
        ASSERT_NE(out, nullptr);
        EXPECT_NEAR(out->db_error, 20 * std::log10(k.gain), 1e-9);
        double d = k.deg > 180 ? k.deg - 360 : k.deg;
        EXPECT_NEAR(out->deg_error, d, 1e-6);
    }
}

TEST(CompareAc, ZeroOriginalDoesNotHideANonZeroScaledVector) {
    SimPlot original = ac_plot(kFreqs, 1000);
    SimPlot scaled = ac_plot(kFreqs, 1000);
    original.vectors.push_back(vec("quiet", VectorKind::voltage, reals({0, 0, 0, 0})));
    scaled.vectors.push_back(vec("quiet", VectorKind::voltage, reals({0, 0, 1e-3, 0})));
    Comparison c = compare_ac(original, scaled, 1, 1, Tolerances{});
    EXPECT_FALSE(c.passed());
    EXPECT_EQ(c.worst()->name, "quiet");
    EXPECT_NEAR(c.worst()->worst, 1000, 1e-9);  // 1 mV against the 1 uV floor (VNTOL)

    // Zero in both is agreement.
    scaled.vectors.back().values = reals({0, 0, 0, 0});
    EXPECT_TRUE(compare_ac(original, scaled, 1, 1, Tolerances{}).passed());
}

// A current that is numerically zero in both decks (exactly 0 A in one, -3.4e-21 A in the
// other, -1.7e-19 A mapped back by Km = 50: a source feeding only a code model's input, seen in
// an ngspice 39 run) agrees: the
// error is measured against ngspice's ABSTOL (1e-12 A), not against the vector's own 0 peak.
TEST(CompareAc, NumericalZerosAgreeBelowTheSimulatorsAbsoluteTolerance) {
    SimPlot original = ac_plot(kFreqs, 1000);
    SimPlot scaled = ac_plot(kFreqs, 1000);
    original.vectors.push_back(vec("v2#branch", VectorKind::current, reals({0, 0, 0, 0})));
    scaled.vectors.push_back(
        vec("v2#branch", VectorKind::current, reals({-1.7e-19, -1.7e-19, -1.7e-19, -1.7e-19})));
    EXPECT_TRUE(compare_ac(original, scaled, 1, 1, Tolerances{}).passed());
    // A real current of 1 nA where the original has none is still an error.
    scaled.vectors.back().values = reals({0, 1e-9, 0, 0});
    EXPECT_FALSE(compare_ac(original, scaled, 1, 1, Tolerances{}).passed());
}

// A clamp diode's off current in an op-amp model: 1e-11 A, the GMIN shunts (1e-12 S) of two
// junctions at the model's 5 V. ngspice 39 resolves it only to ~1e-15 A (measured: it moved by
// up to 2.6e-4 of itself when an op-amp deck was scaled by Km = 1.000001, while every other
// vector moved by 1e-9), so there it is shown at the GMIN level, not judged.
TEST(CompareAc, CurrentsAtTheGminLevelAreShownNotJudged) {
    auto with_clamp = [](double clamp, double node) {
        SimPlot p = ac_plot(kFreqs, 1000);
        p.vectors.push_back(vec("big", VectorKind::voltage, reals({node, node, node, node})));
        p.vectors.push_back(
            vec("h1#branch", VectorKind::current, reals({clamp, clamp, clamp, clamp})));
        return p;
    };
    SimPlot original = with_clamp(1e-11, 5);
    Comparison c = compare_ac(original, with_clamp(1e-11 * (1 + 1e-4), 5), 1, 1, Tolerances{});
    EXPECT_TRUE(c.passed());
    ASSERT_EQ(c.vectors.size(), 4u);
    EXPECT_EQ(c.vectors.back().name, "h1#branch");  // listed after the judged vectors
    EXPECT_TRUE(c.vectors.back().gmin_level);
    EXPECT_FALSE(c.vectors.front().gmin_level);
    ASSERT_EQ(c.notes.size(), 1u);
    EXPECT_NE(c.notes[0].find("h1#branch: not judged"), std::string::npos) << c.notes[0];
    // A current that agrees keeps its plain verdict.
    Comparison same = compare_ac(original, with_clamp(1e-11, 5), 1, 1, Tolerances{});
    EXPECT_FALSE(same.vectors.back().gmin_level);
    EXPECT_TRUE(same.notes.empty());
    // Past 10 x GMIN x the largest node voltage (5e-10 A here) a current is judged.
    SimPlot larger = with_clamp(1e-9, 5);
    EXPECT_FALSE(compare_ac(larger, with_clamp(1e-9 * (1 + 1e-4), 5), 1, 1, Tolerances{}).passed());
    // So is one that reaches past the level in the scaled run only.
    EXPECT_FALSE(compare_ac(original, with_clamp(1e-9, 5), 1, 1, Tolerances{}).passed());
    // With a deck's GMIN of 1e-15 S the level is 5e-14 A: the clamp is judged.
    Tolerances small_gmin;
    small_gmin.gmin = 1e-15;
    EXPECT_FALSE(compare_ac(original, with_clamp(1e-11 * (1 + 1e-4), 5), 1, 1, small_gmin).passed());
    // Held parts: no exception is needed (the comparison is information).
    Tolerances held;
    held.held = true;
    EXPECT_FALSE(compare_ac(original, with_clamp(1e-11 * (1 + 1e-4), 5), 1, 1, held)
                     .vectors.back()
                     .gmin_level);
}

SimPlot op_plot(double vin, double vout, double i) {
    SimPlot p{"op1", "Operating Point", {}};
    p.vectors.push_back(vec("in", VectorKind::voltage, {vin}));
    p.vectors.push_back(vec("out", VectorKind::voltage, {vout}));
    p.vectors.push_back(vec("v1#branch", VectorKind::current, {i}));
    return p;
}

TEST(CompareOp, RelativeToEachValueWithAFloor) {
    struct Case {
        int line;
        SimPlot scaled;
        double km;
        std::string worst_name;
        double worst;
        bool passes;
    };
    // Original: 5 V in, 1e-9 V at out (nearly zero), -2 mA.
    const std::vector<Case> cases{
        {__LINE__, op_plot(5, 1e-9, -2e-3 / 10), 10, "in", 0, true},
        // 2e-12 V off on a node at 1e-9 V, with 5 V the largest voltage:
        // measured against the floor of 1e-6 x 5 V, so the relative error is 2e-12 / 5e-6.
        {__LINE__, op_plot(5, 1e-9 + 2e-12, -2e-3 / 10), 10, "out", 2e-12 / 5e-6, true},
        // The same node 1e-5 V off: beyond the floor.
        {__LINE__, op_plot(5, 1e-5, -2e-3 / 10), 10, "out", (1e-5 - 1e-9) / 5e-6, false},
        // A current not divided by Km.
        {__LINE__, op_plot(5, 1e-9, -2e-3), 10, "v1#branch", 9, false},
        {__LINE__, op_plot(5.00001, 1e-9, -2e-3 / 10), 10, "in", 2e-6, false},
    };
    for (const auto& k : cases) {
        SCOPED_TRACE(k.line);
        Comparison c = compare_op(op_plot(5, 1e-9, -2e-3), k.scaled, k.km, Tolerances{});
        EXPECT_EQ(c.analysis, "op");
        EXPECT_EQ(c.passed(), k.passes);
        ASSERT_NE(c.worst(), nullptr);
        if (k.worst > 0) {
            EXPECT_EQ(c.worst()->name, k.worst_name);
            EXPECT_NEAR(c.worst()->worst, k.worst, 1e-6 * k.worst);
        } else {
            EXPECT_LT(c.worst()->worst, 1e-12);
        }
    }
}

TEST(CompareOp, AllZeroOriginalAgainstNonZeroScaledFails) {
    // Found by this test: with every value of the original at zero, the floor was zero and
    // any scaled value compared as "no error".
    Comparison c = compare_op(op_plot(0, 0, 0), op_plot(1, 0.5, -5e-5), 10, Tolerances{});
    EXPECT_FALSE(c.passed());
    EXPECT_TRUE(compare_op(op_plot(0, 0, 0), op_plot(0, 0, 0), 10, Tolerances{}).passed());
}

TEST(CompareOp, MissingVector) {
    SimPlot scaled = op_plot(5, 1, 0);
    scaled.vectors.erase(scaled.vectors.begin() + 1);
    Comparison c = compare_op(op_plot(5, 1, 0), scaled, 1, Tolerances{});
    EXPECT_EQ(c.problems, std::vector<std::string>{"'out' exists in the original but not in the scaled deck"});
    EXPECT_FALSE(c.passed());
}

// An RC charging curve v(t) = 1 - exp(-t/tau) sampled on `t`, time axis scaled by 1/kf.
SimPlot tran_plot(const std::vector<double>& t, double tau, double kf, double current_scale) {
    SimPlot p{"tran1", "Transient Analysis", {}};
    std::vector<cd> tt, v, i;
    for (double x : t) {
        tt.push_back(x / kf);
        v.push_back(1 - std::exp(-x / tau));
        i.push_back(-std::exp(-x / tau) * current_scale);
    }
    p.vectors.push_back(vec("time", VectorKind::time, tt));
    p.vectors.push_back(vec("out", VectorKind::voltage, v));
    p.vectors.push_back(vec("v1#branch", VectorKind::current, i));
    return p;
}

std::vector<double> grid(double stop, int n, double warp = 1) {
    std::vector<double> t;
    for (int k = 0; k <= n; ++k) t.push_back(stop * std::pow(static_cast<double>(k) / n, warp));
    return t;
}

TEST(CompareTran, InterpolatesBetweenDifferingGrids) {
    const double km = 20, kf = 1e6, tau = 1e-3;
    SimPlot original = tran_plot(grid(5e-3, 500), tau, 1, 1e-3);
    // A finer, uneven grid in the scaled deck: linear interpolation error of a 1 - exp curve
    // with steps of at most ~4e-5 s is about (h/tau)^2 / 8 = 2e-4 of the peak.
    SimPlot scaled = tran_plot(grid(5e-3, 250, 1.3), tau, kf, 1e-3 / km);
    Comparison c = compare_tran(original, scaled, km, kf, Tolerances{});
    EXPECT_TRUE(c.problems.empty());
    EXPECT_TRUE(c.passed());
    ASSERT_EQ(c.vectors.size(), 2u);
    EXPECT_GT(c.worst()->worst, 1e-7);  // the grids really differ
    EXPECT_LT(c.worst()->worst, 1e-3);
    EXPECT_EQ(c.first, 0);
    EXPECT_NEAR(c.last, 5e-3, 1e-15);

    // A tighter transient tolerance than the interpolation error fails.
    Tolerances tight;
    tight.transient = 1e-7;
    EXPECT_FALSE(compare_tran(original, scaled, km, kf, tight).passed());

    // A different time constant in the scaled deck fails.
    SimPlot wrong = tran_plot(grid(5e-3, 500), 1.01 * tau, kf, 1e-3 / km);
    Comparison w = compare_tran(original, wrong, km, kf, Tolerances{});
    EXPECT_FALSE(w.passed());
    EXPECT_GT(w.worst()->worst, 3e-3);
}

// A sine sampled with long steps in one run and short ones in the other (a diode detector
// whose diode is off for most of a cycle): the straight line between the long steps misses
// the sine by up to (w h)^2 / 8 of its amplitude, 2e-3 at 50 points per period, which no
// rewrite caused. A parabola through the neighbouring point follows it; a wrong amplitude
// still fails. (Found on an invented 455 kHz detector deck that failed at 1.9e-3.)
TEST(CompareTran, LongStepsOverASmoothCurveAreNoError) {
    const double kf = 100, f0 = 455e3, w0 = 2 * std::numbers::pi * f0;
    auto sine = [&](const std::vector<double>& t, double scale, double amplitude) {
        SimPlot p{"tran1", "Transient Analysis", {}};
        std::vector<cd> tt, v;
        for (double x : t) {
            tt.push_back(x / scale);
            v.push_back(amplitude * std::sin(w0 * x));
        }
        p.vectors.push_back(vec("time", VectorKind::time, tt));
        p.vectors.push_back(vec("in", VectorKind::voltage, v));
        return p;
    };
    const double stop = 20 / f0;
    SimPlot original = sine(grid(stop, 20 * 300), 1, 1);
    SimPlot scaled = sine(grid(stop, 20 * 50, 1.0001), kf, 1);
    Comparison c = compare_tran(original, scaled, 1, kf, Tolerances{});
    EXPECT_TRUE(c.passed());
    EXPECT_LT(c.worst()->worst, 2e-4);  // the parabola's own error, ~(w h)^3 / 15
    SimPlot wrong = sine(grid(stop, 20 * 50, 1.0001), kf, 1.002);
    EXPECT_FALSE(compare_tran(original, wrong, 1, kf, Tolerances{}).passed());
}

TEST(CompareTran, AScaledRunThatEndsEarlyIsAProblem) {
    // Found by this test: samples past the end of the scaled run were compared against its
    // last value and nothing said that the run was short.
    SimPlot original = tran_plot(grid(5e-3, 100), 1e-3, 1, 1e-3);
    SimPlot scaled = tran_plot(grid(2.5e-3, 50), 1e-3, 1e3, 1e-3);
    Comparison c = compare_tran(original, scaled, 1, 1e3, Tolerances{});
    EXPECT_EQ(c.problems, std::vector<std::string>{
                              "the scaled run covers 0 s .. 0.0025 s of the original's time, not 0 s .. 0.005 s"});
    EXPECT_FALSE(c.passed());
}

// A capacitor current that rings from step to step (trapezoidal integration) in both runs,
// out of step with each other: the same waveform, +-1 % alternations in opposite phase.
// Compared by local averages and within the swing it agrees (with a note); an error larger
// than the swing (5 %) still fails.
TEST(CompareTran, TrapezoidalRingingIsComparedByLocalAverages) {
    auto ringing = [](double phase, double gain) {
        SimPlot p{"tran1", "Transient Analysis", {}};
        std::vector<cd> t, i;
        for (int k = 0; k < 200; ++k) {
            t.push_back(k * 1e-12);
            double wave = 1e-3 * (1 - std::exp(-k / 50.0));
            i.push_back(gain * wave * (1 + 0.01 * phase * (k % 2 ? 1 : -1)));
        }
        p.vectors.push_back(vec("time", VectorKind::time, t));
        p.vectors.push_back(vec("v1#branch", VectorKind::current, i));
        return p;
    };
    Comparison c = compare_tran(ringing(1, 1), ringing(-1, 1), 1, 1, Tolerances{});
    EXPECT_TRUE(c.passed()) << c.vectors[0].worst;
    ASSERT_EQ(c.notes.size(), 1u);
    EXPECT_NE(c.notes[0].find("v1#branch: trapezoidal ringing"), std::string::npos);
    c = compare_tran(ringing(1, 1), ringing(-1, 1.05), 1, 1, Tolerances{});
    EXPECT_FALSE(c.passed());
}

// A D/A bridge's output (0.5 V steps, 0.2 us edges) in two runs whose edges fall a time step
// apart, as ngspice's event-driven models give when Kf is not a power of two (measured on a
// sine -> adc_bridge -> dac_bridge deck: 0.2 us late with Kf = 2.5, verify/event_timing.hpp).
// Point by point that is a 0.5 error; with the deck's models marked event-driven the runs may
// be two steps apart, the waveforms agree and a note says so; a level 1 % off still fails.
TEST(CompareTran, EventDrivenEdgesAStepApartAgreeWithANote) {
    const double kf = 3, h = 0.2e-6;
    auto staircase = [&](double scale, double late, double level) {
        SimPlot p{"tran1", "Transient Analysis", {}};
        std::vector<cd> tt, v;
        for (int k = 0; k <= 500; ++k) {
            double x = k * h;
            // A 0.5 V step every 10 us, four up and back to 0.
            double n = std::floor((x - late) / 10e-6);
            double frac = std::clamp((x - late - 10e-6 * n) / h, 0.0, 1.0);
            tt.push_back(x / scale);
            v.push_back(n < 0 ? 0.0 : level * 0.5 * (std::fmod(n, 4) + frac));
        }
        p.vectors.push_back(vec("time", VectorKind::time, tt));
        p.vectors.push_back(vec("out", VectorKind::voltage, v));
        return p;
    };
    SimPlot original = staircase(1, 0, 1), scaled = staircase(kf, h, 1);
    Tolerances pointwise;
    Comparison strict = compare_tran(original, scaled, 1, kf, pointwise);
    EXPECT_FALSE(strict.passed());
    EXPECT_GT(strict.worst()->worst, 0.1);
    Tolerances events;
    events.event_driven = true;
    Comparison c = compare_tran(original, scaled, 1, kf, events);
    EXPECT_TRUE(c.passed()) << c.worst()->worst;
    // (The staircase's fall from 2 V to 0 also meets the ringing rule, with a note of its own.)
    auto shifted = std::find_if(c.notes.begin(), c.notes.end(), [](const std::string& n) {
        return n.starts_with("out: agrees at ");
    });
    ASSERT_NE(shifted, c.notes.end());
    EXPECT_NE(shifted->find("up to 4e-07 s (two of the longest time steps)"), std::string::npos)
        << *shifted;
    EXPECT_TRUE(compare_tran(original, original, 1, 1, events).notes.empty());
    Comparison off = compare_tran(original, staircase(kf, h, 1.01), 1, kf, events);
    EXPECT_FALSE(off.passed());
    // A failure in such a deck says how to tell the simulator's timing from the rewrite's.
    auto hint = [](const Comparison& x) {
        return std::any_of(x.notes.begin(), x.notes.end(), [](const std::string& n) {
            return n.starts_with("the deck's event-driven models place their edges only to "
                                 "within a time step (up to 2e-07 s here)");
        });
    };
    EXPECT_TRUE(hint(off));
    EXPECT_FALSE(hint(strict));
    EXPECT_FALSE(hint(c));
    EXPECT_FALSE(compare_tran(original, staircase(kf, 4 * h, 1), 1, kf, events).passed());
}

// A transient failure in a deck with analog code models (an integrator that clips, say) says
// how to tell the simulator's time resolution from the rewrite's error; without code models,
// nothing is said.
// A transient failure in a deck whose time resolution is its own (code models at the time
// points, lossless lines' breakpoints) says how to tell that from the rewrite's error.
TEST(CompareTran, AFailureInADeckWithCodeModelsOrLinesSaysHowToCheckTheStep) {
    SimPlot original = tran_plot(grid(5e-3, 500), 1e-3, 1, 1e-3);
    SimPlot wrong = tran_plot(grid(5e-3, 500), 1.01e-3, 1, 1e-3);
    struct Case {
        bool Tolerances::*flag;
        std::string start, step;
    };
    for (const Case& k :
         {Case{&Tolerances::code_models, "the deck's XSPICE code models integrate, limit or switch",
               "(steps up to 1e-05 s here)"},
          Case{&Tolerances::delay_lines, "the deck's lossless lines (T) set a breakpoint",
               "(up to 1e-05 s here)"}}) {
        auto noted = [&](const Comparison& c) {
            return std::any_of(c.notes.begin(), c.notes.end(), [&](const std::string& n) {
                return n.starts_with(k.start) && n.find(k.step) != std::string::npos;
            });
        };
        Tolerances with;
        with.*k.flag = true;
        EXPECT_TRUE(noted(compare_tran(original, wrong, 1, 1, with))) << k.start;
        EXPECT_FALSE(noted(compare_tran(original, original, 1, 1, with)));  // passes: no note
        EXPECT_FALSE(noted(compare_tran(original, wrong, 1, 1, Tolerances{})));
    }
}

TEST(CompareTran, NoTimeVector) {
    SimPlot original = tran_plot(grid(1, 10), 1, 1, 1);
    SimPlot scaled = original;
    scaled.vectors.erase(scaled.vectors.begin());
    Comparison c = compare_tran(original, scaled, 1, 1, Tolerances{});
    EXPECT_EQ(c.problems, std::vector<std::string>{"a transient plot without a time vector"});
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// Device-internal '#' vectors (transmission-line states such as "t1#i1") are listed as not
// compared, even when they differ; "#branch" currents are compared.
TEST(CompareAc, DeviceInternalStatesAreListedNotCompared) {
    std::vector<double> f{1, 10, 100};
    SimPlot o = ac_plot(f, 10);
    SimPlot s = ac_plot(times(f, 1000), 10000, 1e-3 / 50);
    o.vectors.push_back(vec("t1#i1", VectorKind::current, reals({1, 2, 3})));
    s.vectors.push_back(vec("t1#i1", VectorKind::current, reals({9, 9, 9})));
    Comparison c = compare_ac(o, s, 50, 1000, Tolerances{});
    EXPECT_TRUE(c.passed());
    EXPECT_EQ(c.not_compared, std::vector<std::string>{"t1#i1"});
    ASSERT_EQ(c.vectors.size(), 2u);
}

// compare_ac skips the costly magnitude, dB and phase of points that cannot be the worst. The
// reference is the plain loop that computes them at every point; both must agree exactly on
// random responses with ties, zeros, huge, tiny and NaN values.
VectorResult plain_worst(const SimVector& vo, const SimVector& vs, const SimVector& f, double km) {
    VectorResult r{vo.name, vo.kind};
    double back = vo.kind == VectorKind::current ? km : 1;
    for (cd x : vo.values) r.peak = std::max(r.peak, std::abs(x));
    double floor = r.peak > 0 ? r.peak : 1e-300;
    for (std::size_t k = 0; k < vo.values.size(); ++k) {
        cd a = vo.values[k], b = vs.values[k] * back;
        double e = std::abs(b - a) / floor;
        bool in_range = std::abs(a) > 1e-3 * r.peak && std::abs(b) > 0;
        double db = in_range ? 20 * std::log10(std::abs(b) / std::abs(a)) : 0;
        double deg = in_range ? (std::arg(b) - std::arg(a)) * 180 / std::numbers::pi : 0;
        while (deg > 180) deg -= 360;
        while (deg < -180) deg += 360;
        if (e > r.worst || k == 0) {
            r.worst = e;
            r.at = f.values[k].real();
            r.db_error = db;
            r.deg_error = deg;
        }
    }
    return r;
}

TEST(CompareAc, SkippingPointsThatCannotBeWorstChangesNothing) {
    std::mt19937_64 random(20261202);
    std::uniform_real_distribution<double> unit(-1, 1);
    const double specials[] = {0.0, 1e-310, 1e-160, 1e160, 1e300, std::nan(""), 1.0};
    for (int round = 0; round < 300; ++round) {
        SCOPED_TRACE(round);
        std::size_t n = 1 + random() % 40;
        std::vector<double> f;
        std::vector<cd> a, b;
        for (std::size_t k = 0; k < n; ++k) {
            f.push_back(100.0 * (k + 1));
            cd x(unit(random), unit(random));
            cd y = x * cd(1 + 1e-7 * unit(random), 1e-7 * unit(random));
            if (random() % 4 == 0) y = x;                 // exact ties
            if (random() % 5 == 0) y = a.empty() ? y : a.back() * 2.0;
            if (random() % 9 == 0) x *= specials[random() % 7];
            if (random() % 9 == 0) y *= specials[random() % 7];
            a.push_back(x);
            b.push_back(y);
        }
        SimPlot o{"ac1", "AC Analysis", {vec("frequency", VectorKind::frequency, reals(f)),
                                         vec("v(1)", VectorKind::voltage, a)}};
        SimPlot s{"ac1", "AC Analysis", {vec("frequency", VectorKind::frequency, reals(f)),
                                         vec("v(1)", VectorKind::voltage, b)}};
        Comparison c = compare_ac(o, s, 1.0, 1.0, Tolerances{});
        ASSERT_EQ(c.vectors.size(), 1u);
        VectorResult want = plain_worst(o.vectors[1], s.vectors[1], o.vectors[0], 1.0);
        const VectorResult& got = c.vectors[0];
        auto same = [](double x, double y) { return x == y || (std::isnan(x) && std::isnan(y)); };
        // A NaN anywhere in either run is no comparison at all (mark_non_finite): the vector
        // fails with an error that is no number.
        bool non_finite = false;
        for (const auto& v : {a, b})
            for (const cd& x : v)
                non_finite = non_finite || !std::isfinite(x.real()) || !std::isfinite(x.imag());
        if (non_finite) {
            EXPECT_TRUE(std::isnan(got.worst));
            EXPECT_FALSE(got.passed);
            continue;
        }
        EXPECT_TRUE(same(got.peak, want.peak)) << got.peak << " " << want.peak;
        EXPECT_TRUE(same(got.worst, want.worst)) << got.worst << " " << want.worst;
        EXPECT_TRUE(same(got.at, want.at)) << got.at << " " << want.at;
        EXPECT_TRUE(same(got.db_error, want.db_error)) << got.db_error << " " << want.db_error;
        EXPECT_TRUE(same(got.deg_error, want.deg_error)) << got.deg_error << " " << want.deg_error;
    }
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// With held parts equality is not expected: a scaled one-pole whose corner sits at 2x the
// mapped corner is judged only by --tolerance-db/--tolerance-deg, and the largest |dB| and
// |deg| over the sweep are those of the two analytic responses, 1/(1 + j f/fc).
TEST(CompareAc, HeldPartsReportTheLargestDeviation) {
    const double kf = 100;
    const std::vector<double> freqs{10, 100, 1000, 10000};
    SimPlot original = ac_plot(freqs, 1000);
    SimPlot scaled = ac_plot(times(freqs, kf), 2 * 1000 * kf);
    Tolerances held;
    held.held = true;
    Comparison c = compare_ac(original, scaled, 1, kf, held);
    EXPECT_TRUE(c.passed());
    const VectorResult* out = nullptr;
    for (const auto& v : c.vectors)
        if (v.name == "out") out = &v;
    ASSERT_NE(out, nullptr);
    double db = 0, deg = 0, db_at = 0, deg_at = 0;
    for (double f : freqs) {
        std::complex<double> a = 1.0 / std::complex<double>(1, f / 1000),
                             b = 1.0 / std::complex<double>(1, f / 2000);
        double d = std::fabs(20 * std::log10(std::abs(b) / std::abs(a)));
        double p = std::fabs(std::arg(b / a)) * 180 / std::numbers::pi;
        if (d > db) db = d, db_at = f;
        if (p > deg) deg = p, deg_at = f;
    }
    EXPECT_NEAR(out->max_db, db, 1e-12);
    EXPECT_EQ(out->max_db_at, db_at);
    EXPECT_NEAR(out->max_deg, deg, 1e-10);
    EXPECT_EQ(out->max_deg_at, deg_at);
    held.db = 1;  // the deviation is 5.3 dB at 10 kHz
    EXPECT_FALSE(compare_ac(original, scaled, 1, kf, held).passed());
    held.db = 6;
    EXPECT_TRUE(compare_ac(original, scaled, 1, kf, held).passed());
}

// A DC sweep of a current source into 1 kOhm (V = 1k I) and the same at Km: the source's
// values / Km, the resistor x Km, so every voltage stays and the branch current / Km.
SimPlot dc_plot(const std::vector<double>& amps, double ohms, std::string sweep = "i-sweep") {
    SimPlot p{"dc1", "DC transfer characteristic", {}};
    std::vector<cd> v, i;
    for (double a : amps) {
        v.push_back(a * ohms);
        i.push_back(a);
    }
    p.vectors.push_back(vec(sweep, VectorKind::current, reals(amps)));
    p.vectors.push_back(vec("out", VectorKind::voltage, v));
    p.vectors.push_back(vec("vm#branch", VectorKind::current, i));
    return p;
}

TEST(CompareDc, TheSweptValuesAndEveryPointFollowTheFactors) {
    const double km = 20;
    const std::vector<double> amps{-1e-3, -0.5e-3, 1e-20, 0.5e-3, 1e-3};  // through 0
    SimPlot original = dc_plot(amps, 1e3);
    SimPlot scaled = dc_plot(times(amps, 1 / km), 1e3 * km);
    Comparison c = compare_dc(original, scaled, km, 1 / km, "A", Tolerances{});
    EXPECT_TRUE(c.problems.empty()) << c.problems.front();
    EXPECT_TRUE(c.passed());
    EXPECT_EQ(c.analysis, "dc");
    EXPECT_EQ(c.axis_unit, "A");
    EXPECT_EQ(c.points, 5u);
    EXPECT_EQ(c.first, -1e-3);
    EXPECT_EQ(c.last, 1e-3);
    ASSERT_EQ(c.vectors.size(), 2u);  // the swept values themselves are not a vector compared
    EXPECT_LT(c.worst()->worst, 1e-12);
}

TEST(CompareDc, AWrongPointOrAWrongSweepFails) {
    const double km = 20;
    const std::vector<double> amps{0, 1e-3, 2e-3};
    SimPlot original = dc_plot(amps, 1e3);
    SimPlot scaled = dc_plot(times(amps, 1 / km), 1e3 * km);
    scaled.vectors[1].values[2] *= 1.001;  // one voltage 0.1 % off at the last point
    Comparison c = compare_dc(original, scaled, km, 1 / km, "A", Tolerances{});
    EXPECT_FALSE(c.passed());
    EXPECT_EQ(c.worst()->name, "out");
    EXPECT_NEAR(c.worst()->worst, 1e-3, 1e-9);
    EXPECT_EQ(c.worst()->at, 2e-3);
    // The scaled deck swept the source unscaled: the sweep check says so.
    SimPlot unswept = dc_plot(amps, 1e3 * km);
    Comparison d = compare_dc(original, unswept, km, 1 / km, "A", Tolerances{});
    ASSERT_FALSE(d.problems.empty());
    EXPECT_NE(d.problems[0].find("point 1: the scaled deck swept 0.001 A"), std::string::npos)
        << d.problems[0];
    // A point more in one run.
    SimPlot longer = dc_plot({0, 0.05e-3, 0.1e-3, 0.15e-3}, 1e3 * km);
    Comparison e = compare_dc(original, longer, km, 1 / km, "A", Tolerances{});
    ASSERT_FALSE(e.problems.empty());
    EXPECT_EQ(e.problems[0], "the sweeps have 3 and 4 points");
}

}  // namespace
}  // namespace deckscale
