// The noise line of the change report: output noise density x sqrt(Km) at Kf f, integrated
// output noise x sqrt(Km Kf) (shared notes "scaling-rules.md" §8), and the flicker caveat.
#include <cmath>
#include <string>

#include <gtest/gtest.h>

#include "scale/noise_effect.hpp"

namespace deckscale {
namespace {

Deck deck_of(const std::string& text) {
    MemoryFileSystem fs;
    fs.add("deck.cir", text);
    return load_deck("deck.cir", fs);
}

TEST(NoiseEffect, DecibelsOfAnAmplitudeRatio) {
    EXPECT_EQ(amplitude_db_text(std::sqrt(10.0)), "+10 dB");
    EXPECT_EQ(amplitude_db_text(100), "+40 dB");
    EXPECT_EQ(amplitude_db_text(0.5), "-6.02 dB");
    EXPECT_EQ(amplitude_db_text(1), "+0 dB");
}

TEST(NoiseEffect, OneLineForTheFactors) {
    Deck d = deck_of("rc\nV1 a 0 ac 1\nR1 a b 1k\nC1 b 0 1n\n.end\n");
    struct Case {
        int line;
        ScaleFactors f;
        std::string text;
    };
    const Case cases[] = {
        {__LINE__,
         {10, 1},
         "noise (thermal, shot): Km = 10: output noise density and integrated output noise x3.16 "
         "(+10 dB)"},
        {__LINE__,
         {10, 1000},
         "noise (thermal, shot): Km = 10: output noise density x3.16 (+10 dB) at Kf f; integrated "
         "output noise x100 (+40 dB) over the Kf = 1000 times wider band"},
        {__LINE__,
         {1, 100},
         "noise (thermal, shot): Km = 1: output noise density unchanged at Kf f; integrated output "
         "noise x10 (+20 dB) over the Kf = 100 times wider band"},
        {__LINE__,
         {0.01, 1},
         "noise (thermal, shot): Km = 0.01: output noise density and integrated output noise x0.1 "
         "(-20 dB)"},
        {__LINE__, {1, 1}, ""},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(c.line);
        NoiseEffect e = noise_effect(d, c.f, false);
        EXPECT_EQ(e.line, c.text);
        EXPECT_NEAR(e.density, std::sqrt(c.f.km), 1e-15);
        EXPECT_NEAR(e.integrated, std::sqrt(c.f.km * c.f.kf), 1e-12);
    }
}

TEST(NoiseEffect, FlickerModelsAreNamed) {
    Deck d = deck_of(
        "f\nD1 a 0 dn\nD2 a 0 dq\nQ1 a a 0 qv\nR1 a 0 1k\n"
        ".model dn d(kf=1e-15 af=1.2)\n.model dq d(is=1e-14)\n"
        ".model qv npn(level=4 kfn=1e-12)\n.end\n");
    NoiseEffect e = noise_effect(d, {10, 1000}, false);
    EXPECT_EQ(e.flicker_off, std::vector<std::string>{"dn (deck.cir:6)"});
    EXPECT_EQ(e.flicker_unknown, std::vector<std::string>{"qv (deck.cir:8)"});
    EXPECT_NE(
        e.line.find("; flicker (1/f) noise of dn (deck.cir:6) does not follow (--follow-flicker "
                    "rewrites KF); flicker noise of qv (deck.cir:8) is not known to follow"),
        std::string::npos)
        << e.line;
    e = noise_effect(d, {10, 1000}, true);
    EXPECT_EQ(e.flicker_rewritten, std::vector<std::string>{"dn (deck.cir:6)"});
    EXPECT_NE(e.line.find("; flicker noise follows too: KF rewritten in dn (deck.cir:6)"),
              std::string::npos)
        << e.line;
    // A diode's flicker follows a magnitude change by itself (its m keeps KF per unit).
    e = noise_effect(d, {10, 1}, false);
    EXPECT_TRUE(e.flicker_off.empty());
}

}  // namespace
}  // namespace deckscale
