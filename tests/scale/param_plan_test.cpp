// Parameters written as people write them: a parameter whose every use agrees on one unit is
// scaled once where it is defined and its uses stay as written; any other is wrapped at its
// uses as before. The expected decks are worked out by hand from R' = Km R, C' = C/(Km Kf),
// t' = t/Kf, f' = Kf f (common practice; shared notes "scaling-rules.md" §0 and §5).
#include <gtest/gtest.h>

#include "support/scale.hpp"

namespace deckscale {
namespace {

struct DeckCase {
    int line;
    const char* what;
    const char* deck;
    const char* expected;  // Km = 2, Kf = 1000
};

TEST(ParamPlan, WritesTheExpectedDeck) {
    const DeckCase cases[] = {
        {__LINE__, "global parameter used only as resistances",
         "t\n.param rbase=10k\nR1 in out {rbase}\nR2 out 0 rbase\nC1 out 0 1n\n.end\n",
         "t\n.param rbase=20k\nR1 in out {rbase}\nR2 out 0 rbase\nC1 out 0 500f\n.end\n"},
        {__LINE__, "one parameter as a resistance and a capacitance: wrapped",
         "t\n.param p=1k\nR1 in out {p}\nC1 out 0 {p*1p}\n.end\n",
         "t\n.param p=1k\nR1 in out {(p)*2}\nC1 out 0 {(p*1p)/2000}\n.end\n"},
        {__LINE__, "params: defaults and X-line overrides",
         "t\n.subckt rcsec a b params: r=1k c=1n\nRser a b {r}\nCsh b 0 {c}\n.ends rcsec\n"
         "X1 in mid rcsec params: r=2k c=10n\nX2 mid out rcsec r={rload} c=1n\n.param "
         "rload=20k\n.end\n",
         "t\n.subckt rcsec a b params: r=2k c=500f\nRser a b {r}\nCsh b 0 {c}\n.ends rcsec\n"
         "X1 in mid rcsec params: r=4k c=5p\nX2 mid out rcsec r={rload} c=500f\n.param "
         "rload=40k\n.end\n"},
        {__LINE__, "a chain follows its input", "t\n.param ra=1k rb={ra*2}\nR1 a 0 {rb}\n.end\n",
         "t\n.param ra=2k rb={ra*2}\nR1 a 0 {rb}\n.end\n"},
        {__LINE__, "a chain with a number in a sum: wrapped",
         "t\n.param ra=1k rb={ra+100}\nR1 a 0 {rb}\n.end\n",
         "t\n.param ra=1k rb={ra+100}\nR1 a 0 {(rb)*2}\n.end\n"},
        {__LINE__, "a parameter used nowhere is left", "t\n.param spare=47k\nR1 a 0 1k\n.end\n",
         "t\n.param spare=47k\nR1 a 0 2k\n.end\n"},
        {__LINE__, "times in a source and in a .tran card",
         "t\n.param tstop=5m\nV1 a 0 pulse(0 1 0 1u 1u {tstop/2} {tstop})\nR1 a 0 1k\n.tran 1u "
         "{tstop}\n.end\n",
         "t\n.param tstop=5u\nV1 a 0 pulse(0 1 0 1n 1n {tstop/2} {tstop})\nR1 a 0 2k\n.tran 1n "
         "{tstop}\n"
         ".options abstol=5e-13 chgtol=5e-18\n.end\n"},
        {__LINE__, "a subcircuit's own r is another parameter than the global r",
         "t\n.param r=1k\nR1 in out {r}\n.subckt cell a b params: r=1n\nC1 a b {r}\n.ends cell\nX1 "
         "out 0 cell\n.end\n",
         "t\n.param r=2k\nR1 in out {r}\n.subckt cell a b params: r=500f\nC1 a b {r}\n.ends "
         "cell\nX1 out 0 cell\n.end\n"},
        {__LINE__, "a frequency written as a product of numbers",
         "t\n.param w0={2*3.14159265358979*1k} rr=10k\n.param cc={1/(w0*rr)}\nR1 in out {rr}\nC1 "
         "out 0 {cc}\n.end\n",
         "t\n.param w0={2*3.14159265358979*1meg} rr=20k\n.param cc={1/(w0*rr)}\nR1 in out {rr}\nC1 "
         "out 0 {cc}\n.end\n"},
        {__LINE__, "a voltage keeps its value",
         "t\n.param vdd=5\nV1 a 0 dc {vdd}\nR1 a 0 1k\n.end\n",
         "t\n.param vdd=5\nV1 a 0 dc {vdd}\nR1 a 0 2k\n.end\n"},
        {__LINE__, "alterparam in .control: wrapped",
         "t\n.param rv=1k\nR1 a 0 {rv}\n.control\nalterparam rv=2k\n.endc\n.end\n",
         "t\n.param rv=1k\nR1 a 0 {(rv)*2}\n.control\nalterparam rv=2k\n.endc\n.end\n"},
        {__LINE__, "an .if condition must decide alike: wrapped",
         "t\n.param rsel=10k\n.if (rsel > 5k)\nR1 a 0 {rsel}\n.endif\n.end\n",
         "t\n.param rsel=10k\n.if (rsel > 5k)\nR1 a 0 {(rsel)*2}\n.endif\n.end\n"},
        {__LINE__, "a diode's IS stays (the instance's m scales it): wrapped where a current",
         "t\n.param isat=1f\nD1 a 0 dmod\n.model dmod d(is={isat})\nI1 0 a {isat}\n.end\n",
         "t\n.param isat=1f\nD1 a 0 dmod m=0.5\n.model dmod d(is={isat})\nI1 0 a {(isat)/2}\n"
         ".options gmin=5e-13\n.end\n"},
        {__LINE__, "a name two scopes define, used where the caller decides: wrapped",
         "t\n.param r=1k\nR0 in 0 {r}\n.subckt inner p q\nR1 p q {r}\n.ends inner\n"
         ".subckt outer a b params: r=5k\nX1 a b inner\n.ends outer\nXo in 0 outer\n.end\n",
         "t\n.param r=1k\nR0 in 0 {(r)*2}\n.subckt inner p q\nR1 p q {(r)*2}\n.ends inner\n"
         ".subckt outer a b params: r=5k\nX1 a b inner\n.ends outer\nXo in 0 outer\n.end\n"},
        {__LINE__, "1mil reads 1e-3 in a .param: left, and its uses wrapped",
         "t\n.param len=1mil\nR1 a 0 {len}\n.end\n",
         "t\n.param len=1mil\nR1 a 0 {(len)*2}\n.end\n"},
        {__LINE__, "a .func call",
         "t\n.func par(a,b) {a*b/(a+b)}\n.param ra=3k rb=6k\nR1 in out {par(ra,rb)}\nR2 out 0 'ra "
         "+ rb'\n.end\n",
         "t\n.func par(a,b) {a*b/(a+b)}\n.param ra=6k rb=12k\nR1 in out {par(ra,rb)}\nR2 out 0 'ra "
         "+ rb'\n.end\n"},
        {__LINE__, "a model parameter",
         "t\n.param rsw=1\nS1 a 0 c 0 swm\n.model swm sw(vt=1 ron={rsw})\n.end\n",
         "t\n.param rsw=2\nS1 a 0 c 0 swm\n.model swm sw(vt=1 ron={rsw} roff=2e+12)\n.end\n"},
        {__LINE__, "a subcircuit defined inside the one whose parameter it uses",
         "t\n.subckt outer a b params: r=1k\n.subckt inner p q\nR1 p q {r}\n.ends inner\n"
         "X1 a m inner\nR2 m b {r/2}\n.ends outer\nXo in 0 outer r=3k\n.end\n",
         "t\n.subckt outer a b params: r=2k\n.subckt inner p q\nR1 p q {r}\n.ends inner\n"
         "X1 a m inner\nR2 m b {r/2}\n.ends outer\nXo in 0 outer r=6k\n.end\n"},
        {__LINE__, "an override given to a subcircuit name defined twice is rewritten once",
         "t\n.subckt sec a b params: c=1n\nC1 a b {c}\n.ends\n.subckt sec a b params: c=2n\n"
         "C2 a b {c}\n.ends\nX1 in 0 sec c=10n\n.end\n",
         "t\n.subckt sec a b params: c=500f\nC1 a b {c}\n.ends\n.subckt sec a b params: c=1p\n"
         "C2 a b {c}\n.ends\nX1 in 0 sec c=5p\n.end\n"},
        {__LINE__, "a number with a unit beside it does not tell the parameter's unit",
         "t\n.param ratio=2\nC1 a 0 {1n*ratio}\n.end\n",
         "t\n.param ratio=2\nC1 a 0 {(1n*ratio)/2000}\n.end\n"},
        {__LINE__, "... so pi stays pi",
         "t\n.param pi=3.14159265358979\nC1 a 0 {1/(2*pi*1k)}\nR1 a 0 1k\n.end\n",
         "t\n.param pi=3.14159265358979\nC1 a 0 {(1/(2*pi*1k))/2000}\nR1 a 0 2k\n.end\n"},
        {__LINE__, "a run-time expression keeps its parameter wrapped",
         "t\n.param rload=1k\nR4 a b R = (time<12ms ? {rload} : {2*rload})\n.end\n",
         "t\n.param rload=1k\nR4 a b R = ((((time*1000)<12ms ? {rload} : {2*rload}))*2)\n.end\n"},
    };
    for (const auto& c : cases) {
        auto s = test::scale_text(c.deck, 2, 1000);
        EXPECT_EQ(s.text(), c.expected) << "line " << c.line << ": " << c.what;
    }
}

// Why a parameter stays wrapped, as the change list says it.
TEST(ParamPlan, SaysWhyAParameterIsWrapped) {
    struct Case {
        int line;
        const char* deck;
        const char* param;
        const char* why;
    };
    const Case cases[] = {
        {__LINE__, "t\n.param l=1m c={1/(4*9.8696*1k*1k*l)}\nL1 a 0 {l}\nC1 a 0 {c}\n.end\n", "c",
         "its uses agree only if the numbers written with a unit (.param, deck.cir:2) scaled too; "
         "deckscale rewrites no number inside an expression of parameters"},
        {__LINE__, "t\n.param ratio=2\nC1 a 0 {1n*ratio}\n.end\n", "ratio",
         "the unit of 'ratio' rests on a number written with a unit of its own (C1, deck.cir:3), "
         "which deckscale does not read"},
        {__LINE__, "t\n.param x=2 y=500\nR1 a 0 {x*y}\n.end\n", "y",
         "its uses do not fix the unit of 'x', 'y': only products or ratios with other "
         "parameters are used (R1, deck.cir:3)"},
        {__LINE__, "t\n.param rv=1k\nR1 a 0 {rv}\n.control\nalterparam rv=2k\n.endc\n.end\n", "rv",
         "used in a .control block (.control, deck.cir:5)"},
        {__LINE__,
         "t\n.param rv=1k rw={rv*2}\nR1 a 0 {rw}\n.control\nalterparam rv=2k\n.endc\n.end\n", "rw",
         "linked to 'rv': used in a .control block (.control, deck.cir:5)"},
        {__LINE__, "t\n.param g=2\nB1 a 0 V={g}*v(b)\n.end\n", "g",
         "used as part of a run-time expression (B1, deck.cir:3)"},
        {__LINE__, "t\n.param r0=1k\nR1 a 0 {agauss(r0, 0.01, 1)}\n.end\n", "r0",
         "used with the random function agauss() (R1, deck.cir:3)"},
        {__LINE__, "t\n.param r0=1k\nX1 a 0 nosuch r={r0}\n.end\n", "r0",
         "given to 'nosuch', a subcircuit this deck does not define (X1, deck.cir:3)"},
        {__LINE__,
         "t\n.param r=1k\n.subckt in p q\nR1 p q {r}\n.ends\n.subckt out a b params: r=5k\n"
         "X1 a b in\n.ends\nXo x 0 out\n.end\n",
         "r",
         "its name is defined in more than one scope, and ngspice 39 takes it from "
         "whichever subcircuit calls"},
    };
    for (const auto& c : cases) {
        auto s = test::scale_text(c.deck, 2, 1000);
        bool found = false;
        for (const auto& d : s.result.params)
            if (d.name == c.param && d.subckt.empty()) {
                found = true;
                EXPECT_EQ(d.outcome, ParamOutcome::wrapped) << "line " << c.line;
                EXPECT_EQ(d.why, c.why) << "line " << c.line;
            }
        EXPECT_TRUE(found) << "line " << c.line;
    }
}

// The pass reading the deck and the pass over the finished deck plan alike, also when a
// parameter is defined after its uses (scale/rescale.hpp load_and_scale).
TEST(ParamPlan, ReadingOncePlansAsAPassOverTheFinishedDeck) {
    const std::string deck =
        "t\nR1 a b {rb}\n.subckt s p q params: c=1n\nC1 p q {c}\n.ends\nX1 b 0 s c=2n\n"
        ".param rb=1k unused=3\nC2 b 0 {rb*1p}\nR2 b 0 {rb2}\n.param rb2=2k\n.end\n";
    MemoryFileSystem fs;
    fs.add("deck.cir", deck);
    ScaleSettings s;
    s.factors = {2, 1000};
    ScaledDeck one = load_and_scale("deck.cir", fs, s);
    ScaleResult two = scale_deck(one.deck, s);
    std::string a = apply_edits(deck, one.result.edits[0]), b = apply_edits(deck, two.edits[0]);
    EXPECT_EQ(a, b);
    EXPECT_EQ(a,
              "t\nR1 a b {(rb)*2}\n.subckt s p q params: c=500f\nC1 p q {c}\n.ends\nX1 b 0 s c=1p\n"
              ".param rb=1k unused=3\nC2 b 0 {(rb*1p)/2000}\nR2 b 0 {rb2}\n.param rb2=4k\n.end\n");
    ASSERT_EQ(one.result.params.size(), two.params.size());
    for (std::size_t i = 0; i < two.params.size(); ++i) {
        EXPECT_EQ(one.result.params[i].name, two.params[i].name);
        EXPECT_EQ(one.result.params[i].outcome, two.params[i].outcome);
    }
}

// With parts held, a parameter shared by a held and a scaled part must keep its definition:
// no plan is made, every scaled use is wrapped and the held use stays as written.
TEST(ParamPlan, HeldPartsKeepEveryDefinition) {
    ScaleSettings s;
    s.factors = {10, 100};
    s.hold = {"R1"};
    auto out = test::scale_with(
        "t\n.param rv=1k cv=1n\nR1 a b rv\nR2 b c rv\nC1 c 0 cv\n.end\n", s);
    EXPECT_EQ(out.text(),
              "t\n* deckscale held: km=10 kf=100 items=R1\n.param rv=1k cv=1n\nR1 a b rv\n"
              "R2 b c {(rv)*10}\nC1 c 0 {(cv)/1000}\n.end\n");
    EXPECT_TRUE(out.result.params.empty());
}

// A junction capacitance of a .model card follows Kf alone (the instances' m carries Km):
// the change list names it so rather than calling it a time.
TEST(ParamPlan, AModelCapacitanceIsNamedSo) {
    auto out = test::scale_text(
        "t\n.param cj=2p\nD1 a 0 dm\n.model dm d(cjo={cj})\n.end\n", 10, 100);
    ASSERT_EQ(out.result.params.size(), 1u);
    EXPECT_EQ(out.result.params[0].kind, "model capacitance (m carries Km)");
    EXPECT_EQ(test::line_fields(out.text(), 1), (std::vector<std::string>{".param", "cj", "20f"}));
}

}  // namespace
}  // namespace deckscale
