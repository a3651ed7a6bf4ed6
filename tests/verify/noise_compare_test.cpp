// Unit tests of the noise comparison on synthetic plots: no simulator runs. The laws are
// those of the shared notes "scaling-rules.md" §8 (thermal noise: density x sqrt(Km) at
// Kf f, integrated x sqrt(Km Kf)) and the input-referred noise of a current input derived in
// verify/noise_compare.hpp (divided by a transimpedance x Km: x 1/sqrt(Km)).
#include <cmath>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "verify/noise_compare.hpp"

namespace deckscale {
namespace {

using cd = std::complex<double>;

// A first-order noise spectrum S(f) = s0 / sqrt(1 + (f/fc)^2) of ngspice's kinds, on the
// given frequencies, and its integrated plot.
struct NoisePlots {
    SimPlot spectra, totals;
};

NoisePlots plots(const std::vector<double>& freqs, double fc, double out0, double in0,
                 VectorKind density_in = VectorKind::voltage_density) {
    NoisePlots p{{"noise1", "Noise Spectral Density Curves", {}},
                 {"noise2", "Integrated Noise", {}}};
    std::vector<cd> f, on, in, flick;
    for (double x : freqs) {
        f.emplace_back(x, 0);
        on.emplace_back(out0 / std::sqrt(1 + (x / fc) * (x / fc)), 0);
        in.emplace_back(in0, 0);
        flick.emplace_back(0, 0);
    }
    p.spectra.vectors = {{"frequency", VectorKind::frequency, f},
                         {"onoise_spectrum", VectorKind::voltage_density, on},
                         {"inoise_spectrum", density_in, in},
                         {"onoise_r1_1overf", VectorKind::voltage_density, flick}};
    bool current_in = density_in == VectorKind::current_density;
    double band = std::sqrt(fc * 3.141592653589793 / 2);
    p.totals.vectors = {{"onoise_total", VectorKind::voltage, {cd(out0 * band, 0)}},
                        {"inoise_total",
                         current_in ? VectorKind::current : VectorKind::voltage,
                         {cd(in0 * band, 0)}}};
    return p;
}

std::vector<double> times(std::vector<double> f, double k) {
    for (double& x : f) x *= k;
    return f;
}

const std::vector<double> kFreqs{1, 10, 100, 1e3, 1e4, 1e5};

TEST(NoiseFactor, TheLawOfEachKind) {
    const double km = 100, kf = 1e4;
    struct Case {
        int line;
        VectorKind kind;
        bool integrated;
        double expected;
    };
    const Case cases[] = {
        {__LINE__, VectorKind::voltage_density, false, 10},
        {__LINE__, VectorKind::current_density, false, 0.1},
        {__LINE__, VectorKind::voltage_squared_density, false, 100},
        {__LINE__, VectorKind::current_squared_density, false, 0.01},
        {__LINE__, VectorKind::voltage, true, 1000},
        {__LINE__, VectorKind::current, true, 10},
        {__LINE__, VectorKind::voltage_squared, true, 1e6},
        {__LINE__, VectorKind::current_squared, true, 100},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(c.line);
        auto k = noise_factor(c.kind, c.integrated, km, kf);
        ASSERT_TRUE(k);
        EXPECT_NEAR(*k / c.expected, 1, 1e-15);
    }
    EXPECT_FALSE(noise_factor(VectorKind::voltage, false, km, kf));  // not in a noise spectrum
    EXPECT_FALSE(noise_factor(VectorKind::frequency, false, km, kf));
    EXPECT_FALSE(noise_factor(VectorKind::other, true, km, kf));
}

TEST(CompareNoise, ThermalLawPassesAndIsReportedPerVector) {
    const double km = 10, kf = 1000, fc = 1e3;
    for (VectorKind in : {VectorKind::voltage_density, VectorKind::current_density}) {
        SCOPED_TRACE(in == VectorKind::current_density ? "current input" : "voltage input");
        bool current = in == VectorKind::current_density;
        NoisePlots o = plots(kFreqs, fc, 4e-9, current ? 4e-12 : 4e-9, in);
        // The scaled deck: densities x sqrt(Km) at Kf f (a current input's / sqrt(Km)), and
        // integrated over a Kf times wider band.
        double in_k = current ? 1 / std::sqrt(km) : std::sqrt(km);
        NoisePlots s = plots(times(kFreqs, kf), fc * kf, 4e-9 * std::sqrt(km),
                             (current ? 4e-12 : 4e-9) * in_k, in);
        Comparison c =
            compare_noise(o.spectra, s.spectra, &o.totals, &s.totals, km, kf, Tolerances{});
        EXPECT_TRUE(c.problems.empty()) << c.problems.front();
        EXPECT_TRUE(c.passed());
        EXPECT_EQ(c.analysis, "noise");
        EXPECT_EQ(c.points, kFreqs.size());
        EXPECT_EQ(c.first, 1);
        EXPECT_EQ(c.last, 1e5);
        ASSERT_EQ(c.vectors.size(), 5u);  // three spectra and two totals
        EXPECT_LT(c.worst()->worst, 1e-14);
    }
}

TEST(CompareNoise, ADensityOffByAFactorFailsWhereItIsWorst) {
    const double km = 10, kf = 1;
    NoisePlots o = plots(kFreqs, 1e3, 4e-9, 4e-9);
    NoisePlots s = plots(kFreqs, 1e3, 4e-9 * std::sqrt(km), 4e-9 * std::sqrt(km));
    // The output density of the scaled deck 1 % high at 10 Hz only.
    s.spectra.vectors[1].values[1] *= 1.01;
    Comparison c = compare_noise(o.spectra, s.spectra, &o.totals, &s.totals, km, kf, Tolerances{});
    EXPECT_FALSE(c.passed());
    const VectorResult* w = c.worst();
    ASSERT_TRUE(w);
    EXPECT_EQ(w->name, "onoise_spectrum");
    EXPECT_EQ(w->at, 10);
    EXPECT_NEAR(w->db_error, 20 * std::log10(1.01), 1e-9);
    EXPECT_FALSE(w->passed);
}

TEST(CompareNoise, AZeroPartThatIsNotZeroInTheScaledDeckFails) {
    NoisePlots o = plots(kFreqs, 1e3, 4e-9, 4e-9);
    NoisePlots s = plots(kFreqs, 1e3, 4e-9, 4e-9);
    s.spectra.vectors[3].values[0] = cd(1e-15, 0);
    Comparison c = compare_noise(o.spectra, s.spectra, &o.totals, &s.totals, 1, 1, Tolerances{});
    EXPECT_FALSE(c.passed());
    EXPECT_EQ(c.worst()->name, "onoise_r1_1overf");
    EXPECT_EQ(c.worst()->worst, 1);
}

TEST(CompareNoise, SquaredKindsFollowTheSquaredLaw) {
    const double km = 4, kf = 9;
    NoisePlots o = plots(kFreqs, 1e3, 1e-17, 1e-17);
    NoisePlots s = plots(times(kFreqs, kf), 1e3 * kf, 1e-17 * km, 1e-17 * km);
    for (auto* p : {&o, &s})
        for (auto& v : p->spectra.vectors)
            if (v.kind == VectorKind::voltage_density) v.kind = VectorKind::voltage_squared_density;
    // Squared totals: a V^2 value scales by Km Kf.
    o.totals.vectors = {{"onoise_total", VectorKind::voltage_squared, {cd(2e-12, 0)}}};
    s.totals.vectors = {{"onoise_total", VectorKind::voltage_squared, {cd(2e-12 * km * kf, 0)}}};
    Comparison c = compare_noise(o.spectra, s.spectra, &o.totals, &s.totals, km, kf, Tolerances{});
    EXPECT_TRUE(c.passed()) << (c.worst() ? c.worst()->name : "");
    EXPECT_LT(c.worst()->worst, 1e-14);
}

TEST(CompareNoise, SweepAndVectorMismatchesAreProblems) {
    NoisePlots o = plots(kFreqs, 1e3, 4e-9, 4e-9);
    NoisePlots s = plots(times(kFreqs, 10), 1e4, 4e-9, 4e-9);
    Comparison c = compare_noise(o.spectra, s.spectra, &o.totals, &s.totals, 1, 100, Tolerances{});
    ASSERT_FALSE(c.problems.empty());
    EXPECT_EQ(c.problems.front(), "point 0: the scaled deck ran at 10 Hz, not at Kf x 1 Hz");
    s = plots(kFreqs, 1e3, 4e-9, 4e-9);
    s.spectra.vectors.pop_back();
    c = compare_noise(o.spectra, s.spectra, &o.totals, nullptr, 1, 1, Tolerances{});
    EXPECT_EQ(c.problems,
              (std::vector<std::string>{
                  "'onoise_r1_1overf' exists in the original but not in the scaled deck",
                  "only one of the runs integrated its noise"}));
    EXPECT_FALSE(c.passed());
}

// ngspice's integration floor (verify/noise_compare.cpp): a part whose PSD dips below
// 1e-38 V^2/Hz may integrate differently in the two runs; its integrated noise is then named
// in a note instead of failing. Parts above the floor are judged as ever.
TEST(CompareNoise, PartsBelowTheIntegrationFloorAreNotJudgedWhereTheyDiffer) {
    NoisePlots o = plots(kFreqs, 1e3, 4e-9, 4e-9);
    NoisePlots s = plots(kFreqs, 1e3, 4e-9, 4e-9);
    for (auto* p : {&o, &s}) {
        p->spectra.vectors.push_back({"onoise_r1", VectorKind::voltage_density,
                                      std::vector<cd>(kFreqs.size(), cd(1e-9, 0))});
        p->spectra.vectors.back().values.back() = cd(3e-20, 0);  // 9e-40 V^2/Hz
        p->totals.vectors.push_back({"inoise_total_r1", VectorKind::voltage, {cd(1e-6, 0)}});
        p->totals.vectors.push_back({"onoise_total_r1", VectorKind::voltage, {cd(1e-6, 0)}});
    }
    s.totals.vectors[2].values[0] *= 1.001;  // inoise_total_r1
    Comparison c = compare_noise(o.spectra, s.spectra, &o.totals, &s.totals, 1, 1, Tolerances{});
    EXPECT_TRUE(c.passed());
    ASSERT_EQ(c.notes.size(), 1u);
    EXPECT_NE(c.notes[0].find("integration floor"), std::string::npos) << c.notes[0];
    EXPECT_NE(c.notes[0].find("inoise_total_r1 (0.000999)"), std::string::npos) << c.notes[0];
    for (const auto& v : c.vectors) EXPECT_NE(v.name, "inoise_total_r1");
    // The same difference on a part above the floor fails.
    s.spectra.vectors.back().values.back() = o.spectra.vectors.back().values.back() = cd(1e-9, 0);
    c = compare_noise(o.spectra, s.spectra, &o.totals, &s.totals, 1, 1, Tolerances{});
    EXPECT_FALSE(c.passed());
    EXPECT_TRUE(c.notes.empty());
}

}  // namespace
}  // namespace deckscale
