// ngspice as referee of the noise-following rule (scale/flicker.hpp): each invented one-device
// stage has flicker noise (AF = 1.4, and EF = 1.2 on the resistor, exponents that tell the
// laws apart); scaled with --follow-flicker, the device's flicker part of the output noise
// (`onoise_<device>_1overf`, reported with points per summary) at Kf f must be sqrt(Km)
// times the original's at f, like thermal noise (shared notes "scaling-rules.md" §8), and
// the integrated output noise sqrt(Km Kf) times. Without the rule it must not be.
#include <cmath>
#include <string>
#include <vector>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "support/noise.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

struct Stage {
    int line;
    std::string name;
    std::string deck;  // the circuit with its model; the noise output is v(o), input V1
    double km, kf;
};

// A supply, a gate or base drive with AC 1, and the device between o and ground.
std::string stage(const std::string& device, const std::string& model,
                  const std::string& drive = "1.5") {
    return fmt::format(
        "flicker stage\nVDD vdd 0 DC 5\nV1 in 0 DC {} AC 1\nRG in g 10k\nRD vdd o 5k\n"
        "{}\n{}\n.end\n",
        drive, device, model);
}

// The largest relative difference of the device's flicker part from the thermal law, and
// of the integrated output noise.
struct Deviation {
    double flicker = 0, total = 0;
};

Deviation deviation(const Stage& s, bool follow) {
    test::TempDir dir;
    std::string original = dir.file("original.cir");
    test::write_bytes(original, s.deck);
    ScaleSettings settings;
    settings.factors = {s.km, s.kf};
    settings.digits = 12;  // the rounding of written values stays far below 1e-6
    settings.follow_flicker = follow;
    auto scaled = test::scale_with(s.deck, settings);
    for (const auto& d : scaled.result.unscalable) ADD_FAILURE() << d.message;
    test::write_bytes(dir.file("scaled.cir"), scaled.text());
    auto a = test::run_noise(original, {}, ".noise v(o) V1 dec 2 10 1e5 1", dir, "o");
    auto b = test::run_noise(
        dir.file("scaled.cir"), {s.km, s.kf},
        fmt::format(".noise v(o) V1 dec 2 {:.17g} {:.17g} 1", 10 * s.kf, 1e5 * s.kf), dir, "s");
    Deviation d;
    std::string part;
    for (const auto& [name, v] : a.spectra)
        if (name.find("1overf") != std::string::npos && name.find(s.name) != std::string::npos)
            part = name;
    EXPECT_FALSE(part.empty()) << "no flicker part of " << s.name;
    if (part.empty()) return d;
    const auto& fo = a.spectra["frequency"];
    const auto& fs = b.spectra["frequency"];
    const auto& po = a.spectra[part];
    const auto& ps = b.spectra[part];
    EXPECT_EQ(fo.size(), 9u);
    EXPECT_EQ(fs.size(), fo.size());
    EXPECT_EQ(ps.size(), po.size());
    for (std::size_t k = 0; k < fo.size() && k < fs.size() && k < ps.size(); ++k) {
        EXPECT_NEAR(fs[k] / (fo[k] * s.kf), 1, 1e-9);
        EXPECT_GT(po[k], 0);
        d.flicker = std::max(d.flicker, std::fabs(ps[k] / (po[k] * std::sqrt(s.km)) - 1));
    }
    d.total = std::fabs(
        b.totals["onoise_total"] / (a.totals["onoise_total"] * std::sqrt(s.km * s.kf)) - 1);
    return d;
}

TEST(FlickerReferenceTest, FollowFlickerKeepsFlickerNoiseOnTheThermalLaw) {
    const std::string mos = "M1 o g 0 0 mm W=10u L=1u";
    // clang-format off
    const Stage stages[] = {
        {__LINE__, "d1", "diode\nV1 in 0 DC 1 AC 1\nR1 in o 1k\nD1 o 0 dm\n"
                         ".model dm d(is=1e-14 cjo=1p kf=1e-12 af=1.4)\n.end\n", 10, 100},
        {__LINE__, "q1", stage("Q1 o g 0 qm", ".model qm npn(is=1e-15 bf=100 cje=1p cjc=1p tf=1n "
                                              "kf=1e-12 af=1.4)", "0.7"), 10, 100},
        {__LINE__, "j1", stage("J1 o g 0 jm", ".model jm njf(vto=-2 beta=1e-3 cgs=1p cgd=1p "
                                              "kf=1e-12 af=1.4)", "-0.5"), 10, 100},
        {__LINE__, "z1", stage("Z1 o g 0 zm", ".model zm nmf(vto=-1 beta=1e-2 cgs=1p cgd=1p "
                                              "kf=1e-12 af=1.4)", "-0.2"), 10, 100},
        {__LINE__, "m1", stage(mos, ".model mm nmos(level=1 vto=0.7 kp=1e-4 gamma=0.4 phi=0.65 "
                                    "tox=2e-8 cgso=1e-10 kf=1e-25 af=1.4)"), 10, 100},
        {__LINE__, "r2", "resistor\nV1 in 0 DC 1 AC 1\nR1 in o 1k\nR2 o 0 rm r=2k\n"
                         ".model rm r(kf=1e-12 af=1.4 ef=1.2)\n.end\n", 10, 100},
        // MOS models that cannot follow a frequency change: Kf = 1.
        {__LINE__, "m1", stage(mos, ".model mm nmos(level=2 vto=0.7 kp=1e-4 tox=2e-8 kf=1e-25 af=1.4)"), 10, 1},
        {__LINE__, "m1", stage(mos, ".model mm nmos(level=3 vto=0.7 kp=1e-4 tox=2e-8 kf=1e-25 af=1.4)"), 10, 1},
        {__LINE__, "m1", stage(mos, ".model mm nmos(level=9 vto=0.7 kp=1e-4 tox=2e-8 kf=1e-25 af=1.4)"), 10, 1},
        {__LINE__, "m1", stage("M1 o g 0 mm", ".model mm vdmos(vto=1 kp=1 kf=1e-20 af=1.4)"), 10, 1},
    };
    // clang-format on
    for (const auto& s : stages) {
        SCOPED_TRACE(testing::Message() << "flicker_ngspice_test.cpp:" << s.line << ": " << s.deck);
        Deviation with = deviation(s, true);
        EXPECT_LE(with.flicker, 1e-6);
        EXPECT_LE(with.total, 1e-6);
        RecordProperty(fmt::format("line{}", s.line),
                       fmt::format("{:.2g} {:.2g}", with.flicker, with.total));
        // The rule is what makes it follow: without it the flicker part is off.
        EXPECT_GT(deviation(s, false).flicker, 0.1);
    }
}

// BSIM3 (KF) and BSIM4 (flicker on by default) follow a magnitude change by m alone, so
// there is nothing to rewrite; ngspice agrees.
TEST(FlickerReferenceTest, BsimFlickerFollowsMByItself) {
    const Stage stages[] = {
        {__LINE__, "m1",
         stage("M1 o g 0 0 mm W=10u L=1u",
               ".model mm nmos(level=8 version=3.3.0 "
               "tox=2e-8 kf=1e-25 af=1.4)"),
         10, 1},
        {__LINE__, "m1",
         stage("M1 o g 0 0 mm W=10u L=1u",
               ".model mm nmos(level=14 version=4.8.1 "
               "toxe=2e-8)"),
         10, 1},
    };
    for (const auto& s : stages) {
        SCOPED_TRACE(testing::Message() << "flicker_ngspice_test.cpp:" << s.line);
        Deviation d = deviation(s, false);
        EXPECT_LE(d.flicker, 1e-6);
        EXPECT_LE(d.total, 1e-6);
    }
}

}  // namespace
}  // namespace deckscale
