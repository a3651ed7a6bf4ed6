// The flicker-noise laws per model family (scale/flicker.cpp; measured with ngspice 39.3,
// tests/scale/flicker_ngspice_test.cpp checks them against ngspice) and the --follow-flicker
// rewrite of KF by the scaling pass.
#include <cmath>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "scale/flicker.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

std::vector<FlickerModel> models_of(const std::string& cards) {
    MemoryFileSystem fs;
    fs.add("deck.cir", "models\n" + cards + "\n.end\n");
    return flicker_models(load_deck("deck.cir", fs));
}

FlickerModel model_of(const std::string& card) {
    auto m = models_of(card);
    EXPECT_EQ(m.size(), 1u) << card;
    return m.empty() ? FlickerModel{} : m.front();
}

TEST(Flicker, ReadsTheFlickerParametersOfAModel) {
    FlickerModel m = model_of(".model dn D(is=1e-14 KF=2e-15 af=1.3)");
    EXPECT_EQ(m.name, "dn");
    EXPECT_EQ(m.type, "d");
    EXPECT_EQ(m.where, "deck.cir:2");
    ASSERT_TRUE(m.kf);
    EXPECT_EQ(*m.kf, 2e-15);
    EXPECT_EQ(m.af, 1.3);
    EXPECT_EQ(m.ef, 1);
    EXPECT_TRUE(m.has_flicker());
    EXPECT_FALSE(model_of(".model dn d(is=1e-14)").has_flicker());  // KF defaults to 0
    EXPECT_FALSE(model_of(".model dn d(kf=0 af=2)").has_flicker());
    EXPECT_TRUE(model_of(".model rn r(kf={k1} af=1)").has_flicker());  // not plain: not known
    EXPECT_FALSE(model_of(".model rn r(kf={k1})").plain);
    EXPECT_EQ(model_of(".model m4 nmos(level=14 version=4.8)").other,  // BSIM4: on by default
              std::vector<std::string>{"default"});
    EXPECT_TRUE(model_of(".model m4 nmos(level=54 fnoimod=0)").other.empty());
    EXPECT_EQ(model_of(".model m3 nmos(level=8 noimod=2)").other,
              std::vector<std::string>{"default"});
    EXPECT_TRUE(model_of(".model m3 nmos(level=8)").other.empty());
    EXPECT_EQ(model_of(".model qv npn(level=4 kfn=1e-12)").other, std::vector<std::string>{"kfn"});
    EXPECT_TRUE(models_of(".model cm c(cap=1p)\n.model sw1 sw(vt=1)").empty());
}

TEST(Flicker, KfFactorPerFamily) {
    // KF' / KF that keeps flicker noise on the thermal law, with AF = 1.4 and EF = 1.2 (the
    // exponents of the ngspice runs), at Km = 10, Kf = 100.
    const ScaleFactors f{10, 100};
    const double p = std::pow(10.0, 0.4);  // Km^(AF - 1)
    struct Case {
        int line;
        std::string card;
        double expected;
    };
    const Case cases[] = {
        {__LINE__, ".model x d(kf=1 af=1.4)", 100},  // m keeps KF per unit
        {__LINE__, ".model x d(level=3 kf=1 af=1.4)", 100},
        {__LINE__, ".model x npn(kf=1 af=1.4)", 100},
        {__LINE__, ".model x njf(kf=1 af=1.4)", p * 100},  // area: KF I^AF
        {__LINE__, ".model x pjf(level=2 kf=1 af=1.4)", p * 100},
        {__LINE__, ".model x nmf(kf=1 af=1.4)", p * 100},
        {__LINE__, ".model x nmos(kf=1 af=1.4 tox=1e-8)", std::pow(10.0, -0.6) / 100},  // Cox^2
        {__LINE__, ".model x r(kf=1 af=1.4 ef=1.2)", p * std::pow(100.0, 1.2)},
        {__LINE__, ".model x r(kf=1)", 100},  // AF = EF = 1
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(c.line);
        std::string why;
        auto k = flicker_kf_factor(model_of(c.card), f, why);
        ASSERT_TRUE(k) << why;
        EXPECT_NEAR(*k / c.expected, 1, 1e-14);
    }
}

TEST(Flicker, MagnitudeOnlyFamiliesAndUnknownOnes) {
    const ScaleFactors km_only{10, 1}, both{10, 100};
    struct Case {
        int line;
        std::string card;
        double expected;  // at Km = 10, Kf = 1; 0: not known
        bool with_kf;     // also known with Kf = 100
    };
    const Case cases[] = {
        {__LINE__, ".model x nmos(level=2 kf=1 af=1.4)", std::pow(10.0, -0.6), false},
        {__LINE__, ".model x nmos(level=9 kf=1 af=1.4)", std::pow(10.0, -0.6), false},
        {__LINE__, ".model x vdmos(kf=1 af=1.4)", std::pow(10.0, -0.6), false},
        {__LINE__, ".model x pmos(level=3 kf=1 af=1.4)", std::pow(10.0, 0.4), false},
        {__LINE__, ".model x nmos(level=8 kf=1 af=1.4)", 1, false},  // BSIM3: m exact
        {__LINE__, ".model x nmos(level=14)", 1, false},             // BSIM4 default
        {__LINE__, ".model x nmos(level=10)", 1, false},             // B4SOI default
        {__LINE__, ".model x nmos(level=6 kf=1)", 0, false},         // MOS6: not measured
        {__LINE__, ".model x npn(level=4 kfn=1e-12)", 0, false},     // VBIC
        {__LINE__, ".model x npn(level=8 kf=1)", 0, false},          // HICUM
        {__LINE__, ".model x nmf(level=2 kf=1)", 0, false},
        {__LINE__, ".model x njf(level=3 kf=1)", 0, false},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(c.line);
        FlickerModel m = model_of(c.card);
        std::string why;
        auto k = flicker_kf_factor(m, km_only, why);
        if (c.expected == 0) {
            EXPECT_FALSE(k);
            EXPECT_NE(why.find("is not known"), std::string::npos) << why;
        } else {
            ASSERT_TRUE(k) << why;
            EXPECT_NEAR(*k / c.expected, 1, 1e-14);
        }
        EXPECT_EQ(flicker_kf_factor(m, both, why).has_value(), c.with_kf);
    }
    // Flicker set by other parameters than KF can only follow where no factor is needed.
    std::string why;
    EXPECT_FALSE(
        flicker_kf_factor(model_of(".model x nmos(level=1 kf=1 noia=1e20)"), km_only, why));
    EXPECT_EQ(why, "its flicker noise is also set by 'noia', which a KF factor cannot follow");
    EXPECT_EQ(flicker_kf_factor(model_of(".model x d(kf=1 af=3)"), {1, 1}, why), 1.0);
}

TEST(Flicker, FollowFlickerRewritesKf) {
    const std::string deck =
        "flicker\nD1 a 0 dn\nR1 a b rn r=1k\nV1 b 0 dc 1 ac 1\n"
        ".model dn d(is=1e-14 kf=2e-15 af=1.3)\n.model rn r(kf=1e-12 af=1.5 ef=1)\n"
        ".model dq d(is=1e-14)\n.end\n";
    ScaleSettings s;
    s.factors = {100, 10};
    s.digits = 9;
    // Without the option KF stays.
    auto plain = test::scale_with(deck, s);
    EXPECT_NE(plain.text().find("kf=2e-15 af=1.3"), std::string::npos) << plain.text();
    EXPECT_NE(plain.text().find("r(kf=1e-12 af=1.5"), std::string::npos) << plain.text();
    s.follow_flicker = true;
    auto t = test::scale_with(deck, s);
    EXPECT_TRUE(t.result.unscalable.empty());
    // D (by m): x Kf; R (by value): x Km^(AF - 1) Kf^EF = 100^0.5 * 10.
    EXPECT_NE(t.text().find(".model dn d(is=1e-14 kf=2e-14 af=1.3)"), std::string::npos)
        << t.text();
    EXPECT_NE(t.text().find(".model rn r(kf=1e-10 af=1.5 ef=1)"), std::string::npos) << t.text();
    EXPECT_NE(t.text().find(".model dq d(is=1e-14)\n"), std::string::npos) << t.text();
    bool listed = false;
    for (const auto& c : t.result.changes)
        if (c.field == "kf (flicker noise follows)" && c.element == ".model dn")
            listed = c.factor == 10;
    EXPECT_TRUE(listed);
}

TEST(Flicker, FollowFlickerRefusesWhatItCannotFollow) {
    ScaleSettings s;
    s.factors = {10, 1};
    s.follow_flicker = true;
    auto t = test::scale_with(
        "v\nQ1 c b 0 qv\n.model qv npn(level=4 kfn=1e-12 afn=1)\n"
        "V1 c 0 1\nV2 b 0 0.7\n.end\n",
        s);
    ASSERT_EQ(t.result.unscalable.size(), 1u);
    EXPECT_EQ(t.result.unscalable[0].message,
              "--follow-flicker: the flicker noise of model 'qv' cannot be made to follow: how "
              "ngspice 39 scales the flicker noise of a 'npn' model of level 4 with the instance "
              "is not known");
    // Without the option the model is written (its noise line says so).
    s.follow_flicker = false;
    EXPECT_TRUE(test::scale_with("v\nQ1 c b 0 qv\n.model qv npn(level=4 kfn=1e-12 afn=1)\n"
                                 "V1 c 0 1\nV2 b 0 0.7\n.end\n",
                                 s)
                    .result.unscalable.empty());
}

}  // namespace
}  // namespace deckscale
