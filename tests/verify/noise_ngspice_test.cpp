// Noise before and after scaling, against the outside: ngspice (the `ngspice -b` program, an
// independent referee of the embedded runs verify makes) on invented decks under
// netlists/noise/ (and netlists/devices/ for the diode), each scaled by the tool, and
// textbook noise formulas.
//
// Constants: the SI values, exact since the 2019 redefinition: k = 1.380649e-23 J/K,
// q = 1.602176634e-19 C. ngspice 39 uses CODATA 2014 values in its device code
// (src/include/ngspice/const.h: CONSTboltz = 1.38064852e-23, CHARGE = 1.6021766208e-19;
// ngspice 39.3 prints `const.boltz = 1.38064852e-23` and a 1 kOhm resistor's noise density
// 4.071371529487329e-09 V/sqrt(Hz) = sqrt(4 k 300.15 K 1 kOhm) with that k to all 16 digits),
// 3.5e-7 below the exact k: 1.7e-7 in an rms value, within every tolerance below. Its default
// temperature is 27 C = 300.15 K (REFTEMP = 27 + CONSTCtoK in the same header; a run prints
// "Doing analysis at TEMP = 27.000000").
#include <cmath>
#include <numbers>
#include <string>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "support/noise.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

constexpr double kBoltzmann = 1.380649e-23;  // J/K, exact (SI 2019)
constexpr double kCharge = 1.602176634e-19;  // C, exact (SI 2019)
constexpr double kTemp = 300.15;             // K, ngspice's default 27 C

std::string noise_deck(const std::string& name) {
    return test::source_dir() + "/netlists/noise/" + name;
}

struct Pair {
    test::NoiseRun original, scaled;
};

// Scales the deck with the library (12 digits), runs both with their own .noise card mapped.
Pair run_pair(const std::string& name, double km, double kf, const std::string& card,
              const std::string& mapped, const test::TempDir& dir) {
    std::string path = noise_deck(name);
    auto s = test::scale_text(test::read_bytes(path), km, kf, 12);
    EXPECT_TRUE(s.result.unscalable.empty());
    test::write_bytes(dir.file("scaled.cir"), s.text());
    return {test::run_noise(path, {}, card, dir, "o"),
            test::run_noise(dir.file("scaled.cir"), {km, kf}, mapped, dir, "s")};
}

// The law of shared notes "scaling-rules.md" §8 on every vector of both plots: frequencies
// x Kf, voltage densities x sqrt(Km), a current input's input-referred density / sqrt(Km),
// integrated noise x sqrt(Km Kf) (x sqrt(Kf / Km) for a current input's inoise_total).
// Returns the worst relative deviation.
double worst_law_deviation(const Pair& p, double km, double kf, bool current_input) {
    double worst = 0;
    const auto& fo = p.original.spectra.at("frequency");
    const auto& fs = p.scaled.spectra.at("frequency");
    EXPECT_EQ(fo.size(), fs.size());
    for (std::size_t k = 0; k < fo.size() && k < fs.size(); ++k)
        EXPECT_NEAR(fs[k] / (fo[k] * kf), 1, 1e-9);
    for (const auto& [name, vo] : p.original.spectra) {
        if (name == "frequency") continue;
        double law =
            name.rfind("inoise", 0) == 0 && current_input ? 1 / std::sqrt(km) : std::sqrt(km);
        const auto& vs = p.scaled.spectra.at(name);
        EXPECT_EQ(vs.size(), vo.size()) << name;
        for (std::size_t k = 0; k < vo.size() && k < vs.size(); ++k) {
            if (vo[k] == 0 && vs[k] == 0) continue;  // a flicker part with KF = 0
            double d = std::fabs(vs[k] / (vo[k] * law) - 1);
            EXPECT_LE(d, 1e-6) << name << " at " << fo[k] << " Hz";
            worst = std::max(worst, d);
        }
    }
    for (const auto& [name, xo] : p.original.totals) {
        double law =
            name.rfind("inoise", 0) == 0 && current_input ? std::sqrt(kf / km) : std::sqrt(km * kf);
        if (xo == 0) continue;
        double d = std::fabs(p.scaled.totals.at(name) / (xo * law) - 1);
        EXPECT_LE(d, 1e-6) << name;
        worst = std::max(worst, d);
    }
    return worst;
}

// A resistor into a capacitor: integrated output noise sqrt(kT/C), whatever R (common
// practice). The sweep, 0.01 Hz .. 1e13 Hz around a 159 kHz corner, leaves out 6e-7 of the
// noise power below and above it (the Lorentzian's tails, (2/pi)(f1/fc) and (2/pi)(fc/f2));
// ngspice integrates each interval as a power law, measured to be 1.1e-5 low at 100 points
// per decade (1.1e-3 at 10, 2.8e-4 at 20, 4.4e-5 at 50: second order in the step). So 3e-5.
TEST(NoiseReferenceTest, ResistorIntoCapacitorGivesKtOverCBeforeAndAfterScaling) {
    const double km = 10, kf = 1000, c = 1e-9;
    test::TempDir dir;
    Pair p = run_pair("rc_ktc.cir", km, kf, ".noise v(out) Vsrc dec 100 0.01 1e13",
                      ".noise v(out) Vsrc dec 100 10 1e16", dir);
    double ktc = std::sqrt(kBoltzmann * kTemp / c);
    double ktc_scaled = std::sqrt(kBoltzmann * kTemp / (c / (km * kf)));
    EXPECT_NEAR(p.original.totals.at("onoise_total") / ktc, 1, 3e-5);
    EXPECT_NEAR(p.scaled.totals.at("onoise_total") / ktc_scaled, 1, 3e-5);
    // Below the corner the density is the resistor's own sqrt(4kTR) (Johnson-Nyquist).
    EXPECT_NEAR(
        p.original.spectra.at("onoise_spectrum").front() / std::sqrt(4 * kBoltzmann * kTemp * 1e3),
        1, 1e-6);
    double worst = worst_law_deviation(p, km, kf, false);
    RecordProperty("ktc", fmt::format("original {:.9g} V, sqrt(kT/C) {:.9g} V; law {:.2g}",
                                      p.original.totals.at("onoise_total"), ktc, worst));
}

// A diode fed 1 mA from a current source: its output noise below any corner is the shot
// noise current sqrt(2qI) across its small-signal resistance n k T / (q I) (common practice;
// ngspice 39's diode noise source is 2 q |I|, src/spicelib/devices/dio/dionoise.c). The
// scaled diode (m = 1/Km) carries I / Km: sqrt(Km) more noise. The input is a current source,
// so the input-referred noise is divided by sqrt(Km).
TEST(NoiseReferenceTest, DiodeShotNoiseIsTwoQIAndFollowsTheLaw) {
    const double km = 10, kf = 1000, n = 1, current = 1e-3;
    test::TempDir dir;
    Pair p = run_pair("../devices/diode_shot.cir", km, kf, ".noise v(a) Ibias dec 10 1 1meg 1",
                      ".noise v(a) Ibias dec 10 1k 1g 1", dir);
    auto shot = [&](double i) {
        return std::sqrt(2 * kCharge * i) * n * kBoltzmann * kTemp / (kCharge * i);
    };
    EXPECT_NEAR(p.original.spectra.at("onoise_d1_id").front() / shot(current), 1, 1e-6);
    EXPECT_NEAR(p.scaled.spectra.at("onoise_d1_id").front() / shot(current / km), 1, 1e-6);
    EXPECT_NEAR(shot(current / km) / shot(current), std::sqrt(km), 1e-12);
    double worst = worst_law_deviation(p, km, kf, true);
    RecordProperty(
        "shot",
        fmt::format("2qI {:.2g}, law {:.2g}",
                    p.original.spectra.at("onoise_d1_id").front() / shot(current) - 1, worst));
}

// A three-section RC ladder with a load, parts per device reported: every density and every
// integrated value follows the law.
TEST(NoiseReferenceTest, RcLadderFollowsTheLaw) {
    const double km = 10, kf = 1000;
    test::TempDir dir;
    Pair p = run_pair("rc_ladder.cir", km, kf, ".noise v(out) Vin dec 20 1 10meg 5",
                      ".noise v(out) Vin dec 20 1k 10g 5", dir);
    EXPECT_GE(p.original.spectra.size(), 10u);  // frequency, spectra and each resistor's parts
    double worst = worst_law_deviation(p, km, kf, false);
    RecordProperty("ladder", fmt::format("law {:.2g}", worst));
}

}  // namespace
}  // namespace deckscale
