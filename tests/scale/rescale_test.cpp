// Tests of the scaling pass on whole cards: each row is a deck line (with the cards it needs
// before it) and the exact line the pass must write for Km = 10, Kf = 1000 (shared notes
// "scaling-rules.md" §1-§6 give every rule).
#include "scale/rescale.hpp"

#include <gtest/gtest.h>

#include <algorithm>

#include "deck/diagnostic.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

struct LineCase {
    int line;
    std::string before;  // cards the tested line needs (unchanged by the pass)
    std::string in, out;
};

std::vector<LineCase> line_cases() {
    const std::string sense = "Vs s 0 0\nVt t 0 0\n";
    return {
        // ---- R C L K ----
        {__LINE__, "", "R1 in a 1k ac=2k m=2 scale=3 tc1=0.01 tc2=0.001",
         "R1 in a 10k ac=20k m=2 scale=3 tc1=0.01 tc2=0.001"},
        {__LINE__, "", "R2 a 0 r=4.7k", "R2 a 0 r=47k"},
        {__LINE__, "", "C1 a 0 10uF ic=1.5", "C1 a 0 1nF ic=1.5"},
        {__LINE__, "", "C2 a 0 c=22n m=4", "C2 a 0 c=2.2p m=4"},
        {__LINE__, "", "L1 a b 4.7uH ic=2m", "L1 a b 47nH ic=200u"},
        {__LINE__, "", "L2 a b l=1m scale=2", "L2 a b l=10u scale=2"},
        {__LINE__, "L1 a 0 1\nL2 b 0 1\n", "K1 L1 L2 0.9", "K1 L1 L2 0.9"},
        // ---- independent sources ----
        {__LINE__, "", "V1 in 0 DC 1 AC 1 45 DISTOF1 0.1 30 DISTOF2 0.2 60",
         "V1 in 0 DC 1 AC 1 45 DISTOF1 0.1 30 DISTOF2 0.2 60"},
        {__LINE__, "", "I1 0 n2 dc 2m ac 3m 45 distof1 4m 30", "I1 0 n2 dc 200u ac 300u 45 distof1 400u 30"},
        {__LINE__, "", "I2 0 c 1m", "I2 0 c 100u"},
        {__LINE__, "", "Vp p 0 PULSE(0 1 1u 2n 3n 4u 10u 5)", "Vp p 0 PULSE(0 1 1n 2p 3p 4n 10n 5)"},
        {__LINE__, "", "Ip 0 p PULSE(0 1m 1u 2n 3n 4u 10u)", "Ip 0 p PULSE(0 100u 1n 2p 3p 4n 10n)"},
        {__LINE__, "", "Vs s 0 SIN(0 1 1k 1m 100 30)", "Vs s 0 SIN(0 1 1meg 1u 100000 30)"},
        {__LINE__, "", "Ve e 0 EXP(0 1 1u 2u 3u 4u)", "Ve e 0 EXP(0 1 1n 2n 3n 4n)"},
        {__LINE__, "", "Vw w 0 PWL(0 0 1u 1 2u 0) r=1u td=0.5u", "Vw w 0 PWL(0 0 1n 1 2n 0) r=1n td=500p"},
        {__LINE__, "", "Iw 0 w PWL(0 0 1u 1m 2u 0)", "Iw 0 w PWL(0 0 1n 100u 2n 0)"},
        // The parameter names of vsrc.c / isrc.c (ngspice-39.3), bare or keyed, as schematic
        // exporters write them: SINE is SIN; ACMAG is the AC value and ACPHASE its phase; "c"
        // is a current source's DC value; "r"/"td" may stand bare after a PWL (each form read
        // by libngspice 39 on this machine with the values meant).
        {__LINE__, "", "Vq q 0 DC 0 SINE(0 1 1K 0 0 0) ACMAG 2 ACPHASE 90",
         "Vq q 0 DC 0 SINE(0 1 1MEG 0 0 0) ACMAG 2 ACPHASE 90"},
        {__LINE__, "", "Vq q 0 sine 0 1 1k", "Vq q 0 sine 0 1 1meg"},
        {__LINE__, "", "Iq q 0 c=1m acmag=3m acphase=45", "Iq q 0 c=100u acmag=300u acphase=45"},
        {__LINE__, "", "Iq q 0 c 2m acmag 1m m 3", "Iq q 0 c 200u acmag 100u m 3"},
        {__LINE__, "", "Vw w 0 PWL(0 0 1u 1 2u 0) r 1u td 0.5u", "Vw w 0 PWL(0 0 1n 1 2n 0) r 1n td 500p"},
        {__LINE__, "", "Vf f 0 SFFM(0 1 1k 2 100 10 20)", "Vf f 0 SFFM(0 1 1meg 2 100000 10 20)"},
        {__LINE__, "", "If 0 f SFFM(1m 2m 1k 2 100)", "If 0 f SFFM(100u 200u 1meg 2 100000)"},
        // AM on a current source: VA is a current, VO a dimensionless offset.
        {__LINE__, "", "Ia 0 a AM(2m 1.5 1k 10k 1u 30)", "Ia 0 a AM(200u 1.5 1meg 10meg 1n 30)"},
        {__LINE__, "", "Vn n 0 TRNOISE(1m 1u 1 2m 3m 4u 5u)", "Vn n 0 TRNOISE(1m 1n 1 2m 3m 4n 5n)"},
        {__LINE__, "", "In 0 n TRNOISE(1m 1u 1 2m 3m 4u 5u)", "In 0 n TRNOISE(100u 1n 1 200u 300u 4n 5n)"},
        {__LINE__, "", "Ir 0 rr TRRANDOM(1 1u 2u 3m 4m)", "Ir 0 rr TRRANDOM(1 1n 2n 300u 400u)"},
        // RF ports (ngspice 39 manual 4.1.11; vsrc.c of ngspice-39.3): z0 x Km, pwr / Km,
        // freq x Kf, as "name value" or "name=value"; the defaults a port relies on (z0 50 Ohm;
        // pwr 1 mW and freq 1 GHz once either drives it) are written out scaled.
        {__LINE__, "", "V1 p1 0 dc 0 ac 1 portnum 1 z0 50", "V1 p1 0 dc 0 ac 1 portnum 1 z0 500"},
        {__LINE__, "", "V1 p1 0 ac 1 portnum=2 z0=75 phase=30", "V1 p1 0 ac 1 portnum=2 z0=750 phase=30"},
        {__LINE__, "", "V1 p1 0 dc 0 ac 1 portnum 1", "V1 p1 0 dc 0 ac 1 portnum 1 z0=500"},
        // portnum takes 50 Ohm when the z0 set before it is not positive.
        {__LINE__, "", "V1 p1 0 z0 0 portnum 1", "V1 p1 0 z0 0 portnum 1 z0=500"},
        {__LINE__, "", "V1 p1 0 portnum 1 z0 0", "V1 p1 0 portnum 1 z0 0"},
        {__LINE__, "", "V1 p1 0 portnum 0", "V1 p1 0 portnum 0"},
        {__LINE__, "", "V1 p1 0 portnum 1 z0 50 pwr 2m freq 10meg",
         "V1 p1 0 portnum 1 z0 500 pwr 200u freq 10g"},
        {__LINE__, "", "V1 p1 0 portnum 1 z0 50 pwr=2m", "V1 p1 0 portnum 1 z0 500 pwr=200u freq=1e+12"},
        {__LINE__, "", "V1 p1 0 portnum 1 freq 10meg", "V1 p1 0 portnum 1 freq 10g z0=500 pwr=0.0001"},
        // ---- controlled sources, POLY per degree ----
        {__LINE__, "", "E1 x 0 a 0 2", "E1 x 0 a 0 2"},
        // TABLE (ngspice 39 manual 5.2.3, 5.3.3): the input expression reads as in the
        // original; E's output values stay, G's are currents.
        {__LINE__, sense, "E2 x 0 TABLE {i(Vs)} = (0,0) (1m,2)", "E2 x 0 TABLE {(i(Vs)*10)} = (0,0) (1m,2)"},
        {__LINE__, "", "G2 0 z TABLE {v(a)} = (-1, -1m) (0, 0) (1, 2m)",
         "G2 0 z TABLE {v(a)} = (-1, -100u) (0, 0) (1, 200u)"},
        {__LINE__, sense, "F1 0 y Vs 3", "F1 0 y Vs 3"},
        {__LINE__, "", "G1 0 z a 0 5m", "G1 0 z a 0 500u"},
        {__LINE__, sense, "H1 h 0 Vs 100", "H1 h 0 Vs 1000"},
        {__LINE__, "", "Ep pp 0 POLY(2) a 0 b 0 1 2 3 4 5 6", "Ep pp 0 POLY(2) a 0 b 0 1 2 3 4 5 6"},
        // POLY(2) order: p0; p1 p2 (degree 1); p3 p4 p5 (degree 2); F: Km^(d-1).
        {__LINE__, sense, "Fp 0 fp POLY(2) Vs Vt 1 2 3 4 5 6 7",
         "Fp 0 fp POLY(2) Vs Vt 0.1 2 3 40 50 60 700"},
        {__LINE__, sense, "Hp 0 hp POLY(2) Vs Vt 1 2 3 4 5 6", "Hp 0 hp POLY(2) Vs Vt 1 20 30 400 500 600"},
        {__LINE__, sense, "Hq 0 hq POLY(1) Vs 1 2 3 4", "Hq 0 hq POLY(1) Vs 1 20 300 4000"},
        {__LINE__, "", "Gp 0 gp POLY(2) a 0 b 0 1 2 3 4 5 6", "Gp 0 gp POLY(2) a 0 b 0 0.1 0.2 0.3 0.4 0.5 0.6"},
        // ---- behavioural sources: variable substitution, output factor ----
        {__LINE__, "", "B1 bb 0 V=v(a)*sin(2*pi*1k*time)+i(Vx)*ddt(v(a))",
         "B1 bb 0 V=v(a)*sin(2*pi*1k*(time*1000))+(i(Vx)*10)*(ddt(v(a))/1000)"},
        {__LINE__, "", "B2 0 bc I=v(a)/(1+hertz/1k)", "B2 0 bc I=((v(a)/(1+(hertz/1000)/1k))/10)"},
        {__LINE__, "", "B3 r 0 V=v(a) tc1=0.1", "B3 r 0 V=v(a) tc1=0.1"},
        {__LINE__, "", "Ev ev 0 VALUE={v(a)*sin(time*1k)}", "Ev ev 0 VALUE={v(a)*sin((time*1000)*1k)}"},
        {__LINE__, "", "Gv 0 gv cur={v(a)/1k}", "Gv 0 gv cur={(v(a)/1k)/10}"},
        // ---- lines, switches ----
        {__LINE__, "", "T1 a 0 t 0 Z0=50 TD=1n", "T1 a 0 t 0 Z0=500 TD=1p"},
        {__LINE__, "", "T2 a 0 t 0 Z0=50 F=1meg NL=0.25 IC=1,2m,3,4m",
         "T2 a 0 t 0 Z0=500 F=1g NL=0.25 IC=1,200u,3,400u"},
        {__LINE__, "", ".model lt ltra r=0.1 l=1u g=1m c=1p len=1",
         ".model lt ltra r=1 l=10n g=100u c=1e-16 len=1"},
        {__LINE__, "", ".model ur urc k=2 fmax=1g rperl=1k cperl=1p",
         ".model ur urc k=2 fmax=1t rperl=10k cperl=1e-16"},
        // Defaults written out: URC FMAX 1G, RPERL 1k, CPERL 1e-15; switch RON 1, ROFF 1/GMIN.
        {__LINE__, "", ".model ud urc k=2", ".model ud urc k=2 fmax=1e+12 rperl=10000 cperl=1e-19"},
        {__LINE__, "", ".model swm sw vt=1 vh=0.1", ".model swm sw vt=1 vh=0.1 ron=10 roff=1e+13"},
        {__LINE__, "", ".model cs csw it=1m ih=0.1m", ".model cs csw it=100u ih=10u ron=10 roff=1e+13"},
        {__LINE__, ".options gmin=1e-9\n", ".model sp sw(vt=1)", ".model sp sw(vt=1 ron=10 roff=1e+10)"},
        {__LINE__, "", ".model sq sw( vt=1 )", ".model sq sw( vt=1 ron=10 roff=1e+13)"},
        // ---- analyses and options ----
        {__LINE__, "", ".ac dec 10 1 1meg", ".ac dec 10 1000 1g"},
        {__LINE__, "", ".tran 1n 1u 0 1n uic", ".tran 1p 1n 0 1p uic"},
        {__LINE__, "V1 a 0 ac 1\n", ".noise v(a) V1 dec 10 1 1k 5", ".noise v(a) V1 dec 10 1000 1meg 5"},
        {__LINE__, "", ".disto dec 10 1k 100meg 0.9", ".disto dec 10 1meg 100g 0.9"},
        {__LINE__, "", ".four 1k v(a)", ".four 1meg v(a)"},
        {__LINE__, "", ".sens v(a) ac dec 10 1 1k", ".sens v(a) ac dec 10 1000 1meg"},
        {__LINE__, "", ".sp dec 10 1 1g 1", ".sp dec 10 1000 1t 1"},
        {__LINE__, "V1 a 0 1\nI1 0 a 1\n", ".dc V1 0 1 0.1 I1 0 1m 0.1m", ".dc V1 0 1 0.1 I1 0 100u 10u"},
        {__LINE__, "R1 a 0 1\n", ".dc R1 1k 2k 100", ".dc R1 10k 20k 1000"},
        {__LINE__, "", ".dc TEMP -40 85 5", ".dc TEMP -40 85 5"},
        {__LINE__, "", ".meas tran t1 TRIG v(a) VAL=0.5 RISE=1 TARG i(V1) VAL=1m FALL=1 TD=1u",
         ".meas tran t1 TRIG v(a) VAL=0.5 RISE=1 TARG i(V1) VAL=100u FALL=1 TD=1n"},
        {__LINE__, "", ".meas tran y AVG i(Va) FROM=1u TO=2u", ".meas tran y AVG i(Va) FROM=1n TO=2n"},
        {__LINE__, "", ".meas tran t2 FIND v(a) AT=2u", ".meas tran t2 FIND v(a) AT=2n"},
        {__LINE__, "", ".meas ac x WHEN im(Va)=1m", ".meas ac x WHEN im(Va)=100u"},
        {__LINE__, "", ".meas ac m1 FIND vdb(a) AT=1k", ".meas ac m1 FIND vdb(a) AT=1meg"},
        // Computed from other results, which follow the factors themselves (a note says so).
        {__LINE__, "", ".meas tran w param='tfall-trise'", ".meas tran w param='tfall-trise'"},
        {__LINE__, "", ".meas ac g param='vout2/v1*100+0.5'", ".meas ac g param='vout2/v1*100+0.5'"},
        {__LINE__, "", ".ic v(a)=1 v(b)=2", ".ic v(a)=1 v(b)=2"},
        // .optran noopiter gminsteps srcsteps tstep tstop supramp (manual 15.3.5).
        {__LINE__, "", ".optran 0 0 0 100n 10u 1u", ".optran 0 0 0 100p 10n 1n"},
        {__LINE__, "", ".nodeset v(a)=1", ".nodeset v(a)=1"},
        {__LINE__, "", ".options gmin=1e-12 abstol=1e-12 chgtol=1e-14 rshunt=1e9 scale=1e-6",
         ".options gmin=1e-13 abstol=1e-13 chgtol=1e-18 rshunt=1e10 scale=1e-6"},
        {__LINE__, "", ".options rseries=1m cshunt=1p reltol=1e-4 method=gear",
         ".options rseries=10m cshunt=1e-16 reltol=1e-4 method=gear"},
        // ---- parameters and expressions: with one unit in every use, the definition is
        // scaled and the use stays (scale/param_plan); used as two units, the use is wrapped,
        // never evaluated ----
        {__LINE__, ".param rv=1k\n", "R1 in a {rv*2}", "R1 in a {rv*2}"},
        {__LINE__, ".param rv=1k\n", "R3 a 0 rv", "R3 a 0 rv"},
        {__LINE__, ".subckt blk p q params: rr=1k\n", "Rx p q {rr}", "Rx p q {rr}"},
        {__LINE__, ".param rv=1k\nC9 z 0 {rv*1p}\n", "R1 in a {rv*2}", "R1 in a {(rv*2)*10}"},
        {__LINE__, ".param rv=1k\nC9 z 0 {rv*1p}\n", "R2 a 0 'rv/2'", "R2 a 0 '(rv/2)*10'"},
        {__LINE__, ".param rv=1k\nC9 z 0 {rv*1p}\n", "R3 a 0 rv", "R3 a 0 {(rv)*10}"},
        {__LINE__, ".param cv=2n\nR9 z 0 cv\n", "C1 a 0 cv", "C1 a 0 {(cv)/10000}"},
        {__LINE__, ".param lv=1m\nR9 z 0 lv\n", "L1 a 0 {lv}", "L1 a 0 {(lv)/100}"},
        {__LINE__, ".subckt blk p q params: rr=1k\nC9 p 0 {rr*1p}\n", "Rx p q {rr}", "Rx p q {(rr)*10}"},
    };
}

TEST(ScalerTest, LinesScaleAsTheRulesSay) {
    for (const auto& c : line_cases()) {
        SCOPED_TRACE(testing::Message() << "rescale_test.cpp:" << c.line << ": " << c.in);
        std::string deck = "line test\n" + c.before + c.in + "\n";
        if (c.before.find(".subckt") != std::string::npos) deck += ".ends\n";
        deck += ".end\n";
        std::size_t n = 1 + static_cast<std::size_t>(std::count(c.before.begin(), c.before.end(), '\n'));
        try {
            auto s = test::scale_text(deck, 10, 1000);
            std::string text = s.text();
            std::size_t start = 0;
            for (std::size_t i = 0; i < n; ++i) start = text.find('\n', start) + 1;
            EXPECT_EQ(text.substr(start, text.find('\n', start) - start), c.out);
            for (const auto& d : s.result.unscalable) ADD_FAILURE() << render(d);
        } catch (const DeckError& e) {
            ADD_FAILURE() << render(e.diagnostic());
        }
    }
}

TEST(ScalerTest, WrappedExpressionsAreInTheChangeList) {
    // rv is a resistance in R1, R2 and a capacitance in C1: its uses are wrapped.
    auto s = test::scale_text("t\n.param rv=1k\nR1 a 0 {rv*2}\nR2 a 0 rv\nC1 a 0 {rv*1p}\n.end\n", 10, 1);
    ASSERT_EQ(s.result.changes.size(), 3u);
    EXPECT_EQ(s.result.changes[0].element, "R1");
    EXPECT_EQ(s.result.changes[0].new_text, "{(rv*2)*10}");
    EXPECT_EQ(s.result.changes[1].element, "R2");
    EXPECT_EQ(s.result.changes[1].old_text, "rv");
    EXPECT_EQ(s.result.changes[1].new_text, "{(rv)*10}");
}

TEST(ScalerTest, SubcircuitBodyIsScaledInPlace) {
    std::string deck = "t\n.subckt rc in out\nR1 in out 1k\nC1 out 0 1n\n.ends rc\nX1 a b rc\n.end\n";
    auto s = test::scale_text(deck, 10, 1000);
    EXPECT_EQ(s.text(), "t\n.subckt rc in out\nR1 in out 10k\nC1 out 0 100f\n.ends rc\nX1 a b rc\n.end\n");
}

// Items that cannot be scaled exactly: one diagnostic each, at the right place.
struct RefusalCase {
    int line;
    std::string deck;  // after the title
    std::vector<std::string> where;  // "line:col" of each diagnostic
};

TEST(ScalerTest, UnscalableItemsAreListedOneEach) {
    const RefusalCase cases[] = {
        {__LINE__, "D1 a 0 dm\n.model dm d level=3 is=1e-14\n", {"3:11"}},
        {__LINE__, "Q1 c b 0 qm\n.model qm npn level=4\n", {"3:11"}},
        {__LINE__, "M1 d g 0 0 mm w=1u l=1u\n.model mm nmos level=8\n", {"2:12"}},
        {__LINE__, "J1 d g s jm\n.model jm njf level=2\n", {"3:11"}},
        {__LINE__, "A1 a b amp\n", {"2:1"}},
        {__LINE__, "V1 a 0 EXTERNAL\n", {"2:8"}},
        // A one-value source field without its value; "r" on a current source, which
        // libngspice 39 refuses as an unknown parameter.
        {__LINE__, "V1 a 0 dc 1 acmag\n", {"2:13"}},
        {__LINE__, "I1 a 0 PWL(0 0 1u 1m) r 0\n", {"2:23"}},
        {__LINE__, "Y1 a 0 b 0 txlmod\n", {"2:1"}},
        {__LINE__, "R1 a 0 1k\n.control\nlet x = a - 2\n.endc\n", {"4:13"}},
        {__LINE__, "L1 a 0 1u\nR1 a 0 1k\nK1 L1 R1 0.5\n", {"4:7"}},
        {__LINE__, "E1 a 0 LAPLACE {v(b)} {1/(1+s)}\n", {"2:8"}},
        // A unit conversion inside a measurement's expression does not follow the factors.
        {__LINE__, ".meas tran t2 param='trise/1u'\n", {"2:21"}},
        {__LINE__, ".meas tran t3 param={trise*1e6}\n", {"2:21"}},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "rescale_test.cpp:" << c.line << ": " << c.deck);
        try {
            auto s = test::scale_text("refusal test\n" + c.deck + ".end\n", 10, 1000);
            std::vector<std::string> got;
            for (const auto& d : s.result.unscalable) {
                EXPECT_EQ(d.severity, Severity::error);
                EXPECT_EQ(d.file, "deck.cir");
                got.push_back(std::to_string(d.line) + ":" + std::to_string(d.column));
            }
            EXPECT_EQ(got, c.where);
        } catch (const DeckError& e) {
            ADD_FAILURE() << render(e.diagnostic());
        }
    }
}

TEST(ScalerTest, RefusalTextForACouplingOfANonInductor) {
    auto s = test::scale_text("t\nL1 a 0 1u\nR1 a 0 1k\nK1 L1 R1 0.5\n.end\n", 10, 1);
    ASSERT_EQ(s.result.unscalable.size(), 1u);
    EXPECT_EQ(render(s.result.unscalable[0]),
              "deck.cir:4:7: error: 'K1' couples 'R1', which is not an inductor of this deck\n"
              "  K1 L1 R1 0.5\n"
              "        ^~\n");
}

// ngspice 39 stops at a K card with a third inductor (tried: "Error on line 7"); other
// simulators read it as coupling all three. An error (bad input), naming the third.
TEST(ScalerTest, AKCardWithThreeInductorsIsAnErrorAtTheThird) {
    try {
        test::scale_text("t\nL1 a 0 1u\nL2 b 0 1u\nL3 c 0 1u\nK1 L1 L2 L3 0.9\n.end\n", 10, 1);
        ADD_FAILURE() << "no error";
    } catch (const DeckError& e) {
        EXPECT_EQ(e.diagnostic().line, 5u);
        EXPECT_EQ(e.diagnostic().column, 10u);
        EXPECT_NE(e.diagnostic().message.find("couples two inductors, and 'L3' is a third"),
                  std::string::npos);
    }
}

TEST(ScalerTest, LeaveUnscalableMarksEachCardInItsLineEndStyle) {
    std::string lf = "t\nR1 a 0 1k\nY1 a 0 b 0 tm\n.end\n";
    auto s = test::scale_text(lf, 10, 1, 7, true);
    EXPECT_EQ(s.text(), "t\nR1 a 0 10k\n* deckscale: left unscaled: ngspice 39 KSPICE lines "
                        "(TXL/CPL) do not stay equivalent under scaling; use an LTRA line (O "
                        "element) instead\nY1 a 0 b 0 tm\n.end\n");
    EXPECT_EQ(s.result.unscalable.at(0).severity, Severity::warning);
    std::string crlf = "t\r\nR1 a 0 1k\r\nY1 c b 0 0 tm\r\nV1 a 0 EXTERNAL\r\n.end\r\n";
    auto c = test::scale_text(crlf, 10, 1, 7, true);
    std::string out = c.text();
    EXPECT_EQ(out.substr(0, 15), "t\r\nR1 a 0 10k\r\n");
    // Every line of the output ends in CRLF: no bare LF was inserted.
    for (std::size_t i = 0; i < out.size(); ++i)
        if (out[i] == '\n') EXPECT_TRUE(i > 0 && out[i - 1] == '\r') << "bare LF at " << i;
    EXPECT_NE(out.find("\r\n* deckscale: left unscaled: EXTERNAL"), std::string::npos) << out;
    EXPECT_NE(out.find("\r\n* deckscale: left unscaled: ngspice 39 KSPICE"), std::string::npos) << out;
}

// Numbers keep their spelling: suffix and its case, unit tail, exponent style, digits.
TEST(ScalerTest, SpellingIsKept) {
    struct Row {
        int line;
        std::string in;
        double km, kf;
        int digits;
        std::string out;
    };
    const Row rows[] = {
        {__LINE__, "R1 a 0 2.2MEGohm", 10, 1, 7, "R1 a 0 22MEGohm"},
        {__LINE__, "R1 a 0 4.7Meg", 10, 1, 7, "R1 a 0 47Meg"},
        {__LINE__, "R1 a 0 47kOhm", 10, 1, 7, "R1 a 0 470kOhm"},
        {__LINE__, "C1 a 0 4.7uF", 100, 1, 7, "C1 a 0 47nF"},
        {__LINE__, "C1 a 0 4.7UF", 100, 1, 7, "C1 a 0 47NF"},
        {__LINE__, "C3 a 0 1.5e-9", 10, 1000, 7, "C3 a 0 1.5e-13"},
        {__LINE__, "C3 a 0 1.5E-9", 10, 1000, 7, "C3 a 0 1.5E-13"},
        {__LINE__, "R1 a 0 1000", 2, 1, 7, "R1 a 0 2000"},
        {__LINE__, "R1 a 0 0.5", 3, 1, 7, "R1 a 0 1.5"},
        {__LINE__, "R1 a 0 1k", 3, 1, 3, "R1 a 0 3k"},
        {__LINE__, "C1 a 0 10uF", 3, 1, 7, "C1 a 0 3.333333uF"},
        {__LINE__, "C1 a 0 10uF", 3, 1, 3, "C1 a 0 3.33uF"},
        {__LINE__, "L1 a 0 4.7uH", 3, 1, 4, "L1 a 0 14.1uH"},
        {__LINE__, "L1 a 0 3.3mH", 10, 1000, 7, "L1 a 0 33uH"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "rescale_test.cpp:" << r.line);
        auto s = test::scale_text("t\n" + r.in + "\n.end\n", r.km, r.kf, r.digits);
        EXPECT_EQ(s.text(), "t\n" + r.out + "\n.end\n");
    }
}

TEST(ScalerTest, FactorsOfOneChangeNothing) {
    std::string deck = "t\n.param rv=1k\nR1 a 0 rv\nC1 a 0 1u\nB1 b 0 V=time*i(V1)\n.end\n";
    auto s = test::scale_text(deck, 1, 1);
    EXPECT_EQ(s.text(), deck);
    EXPECT_TRUE(s.result.changes.empty());
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// The one-pass load_and_scale must give exactly what load_deck + scale_deck give, also when
// the deck uses names before it declares them (then it scales the complete deck again).
TEST(ScalerTest, OnePassEqualsTwoPasses) {
    struct Row {
        int line;
        const char* deck;
    };
    const Row rows[] = {
        {__LINE__, "t\nR1 a 0 1k\nC1 a 0 1n\n.ac dec 10 1 1meg\n.end\n"},
        // K before its inductors, R with a model declared later, a parameter used before
        // .param, a switch model before the .options gmin that sets its default ROFF.
        {__LINE__,
         "t\nK1 L1 L2 0.5\nR1 a b rmod l=10u w=1u\nR2 b 0 rv\n.model swm sw vt=1\n"
         "S1 b 0 a 0 swm\nL1 a 0 1u\nL2 b 0 2u\n.model rmod r rsh=50\n.param rv=2k\n"
         ".options gmin=1e-9\n.end\n"},
        // A keyed value naming a parameter declared further down.
        {__LINE__, "t\nR3 b 0 r=rv2\nC3 b 0 c={cv}\n.param rv2=1k cv=1n\n.end\n"},
        // A sweep before the .options reltol it steps with.
        {__LINE__, "t\nV1 a 0 ac 1\n.ac oct 1 1 2.5\n.options reltol=0.3\n.end\n"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << r.line);
        MemoryFileSystem fs;
        fs.add("deck.cir", r.deck);
        ScaleSettings settings;
        settings.factors = {10, 100};
        Deck deck = load_deck("deck.cir", fs);
        ScaleResult two = scale_deck(deck, settings);
        ScaledDeck one = load_and_scale("deck.cir", fs, settings);
        EXPECT_EQ(apply_edits(one.deck.top().text(), one.result.edits[0]),
                  apply_edits(deck.top().text(), two.edits[0]));
        EXPECT_EQ(one.result.change_count, two.change_count);
        EXPECT_EQ(render(one.result.unscalable), render(two.unscalable));
    }
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// The suffix traps of the ngspice 39 manual, 2.1.4.3: 'M' is milli and a capacitor's 'F'
// is femto. They are scaled the SPICE way and a note says so; MEG and uF draw no note.
TEST(ScalerTest, SuffixTrapsGetANote) {
    auto s = test::scale_text("t\nR1 a 0 2.2M\nC1 a 0 1F\nC2 a 0 10uF\nR2 a 0 1MEG\n.end\n", 2, 1);
    EXPECT_EQ(render(s.result.notes),
              "deck.cir:2:8: note: '2.2M' is 2.2 milliohm in SPICE ('M' is milli; mega is MEG); "
              "it is scaled as such\n  R1 a 0 2.2M\n         ^~~~\n"
              "deck.cir:3:8: note: '1F' is 1 femtofarad in SPICE ('F' is femto); it is scaled as "
              "such\n  C1 a 0 1F\n         ^~\n");
    // No atto suffix in ngspice 39: below 1f the value is written with an exponent (issue 10 §5).
    EXPECT_EQ(s.text(), "t\nR1 a 0 4.4m\nC1 a 0 5e-16\nC2 a 0 5uF\nR2 a 0 2MEG\n.end\n");
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// The marking comment goes after a byte-order mark, which stays the first bytes of the file.
TEST(ScalerTest, MarkingKeepsTheByteOrderMarkFirst) {
    auto s = test::scale_text("t\n.include inc.lib\n.end\n", 2, 1, 7, true,
                              {{"inc.lib", "\xEF\xBB\xBF" "Y1 a 0 b 0 tm\n"}});
    ASSERT_EQ(s.texts.size(), 2u);
    EXPECT_EQ(s.texts[1].substr(0, 6), "\xEF\xBB\xBF* d");
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// An empty expression stops ngspice 39 ("Expression err", tried with `ngspice -b` on a G
// gain of '' and of {}): refused with its place, never rewritten into two edits at one byte
// (found by the deck fuzz target).
TEST(ScalerTest, EmptyExpressionsAreRefused) {
    for (const std::string card : {"G1 a 0 b 0 ''", "R1 a 0 { }"}) {
        SCOPED_TRACE(card);
        try {
            test::scale_text("t\n" + card + "\n.end\n", 7, 3);
            ADD_FAILURE() << "no error";
        } catch (const DeckError& e) {
            EXPECT_EQ(e.diagnostic().message,
                      "an empty expression: ngspice 39 stops with \"Expression err\"; write a value");
        }
    }
}

// A .dc card other than 'source start stop step' once or twice: ngspice 39 reads '=' as a
// blank (`.dc I1 0 1 x=0.5` stops it: "named "x" is not in the circuit") and runs a second
// level without its step without end (tried). The keyed field once crashed the scaler (a
// `VALUE==1e-14` with no value; found by the deck fuzz target, tests/fuzz/regressions).
TEST(ScalerTest, MalformedDcCardsAreRefused) {
    for (const auto& [card, message] : std::vector<std::pair<std::string, std::string>>{
             {".dc I1 0 1 x=0.5", "ngspice 39 reads 'x=' as more fields"},
             {".dc I1 0 1m 0.1m VALUE==1e-14", "ngspice 39 reads 'VALUE=' as more fields"},
             {".dc I1 0 1m 0.1m V1 0 1", "this sweep has no stop or step"}}) {
        SCOPED_TRACE(card);
        try {
            test::scale_text("t\nV1 b 0 1\nI1 0 a 1m\nR1 a b 1k\n" + card + "\n.end\n", 2, 3);
            ADD_FAILURE() << "no error";
        } catch (const DeckError& e) {
            EXPECT_NE(e.diagnostic().message.find(message), std::string::npos)
                << e.diagnostic().message;
        }
    }
}

// Absurd factors never write 'inf' or a value that silently became 0: the value is named.
TEST(ScalerTest, ValuesPushedOutOfRangeAreRefusedWithTheValueNamed) {
    struct {
        int line;
        std::string card;
        double km, kf;
        std::string rendered;
    } rows[] = {
        {__LINE__, "R1 a 0 1e300", 1e10, 1,
         "deck.cir:2:8: error: '1e300' times 1e+10 is inf, outside the range of a double (about "
         "2.2e-308 to 1.8e308): choose factors that keep every value in range\n"
         "  R1 a 0 1e300\n         ^~~~~\n"},
        {__LINE__, "R1 a 0 1e-300", 1e-10, 1,
         "deck.cir:2:8: error: '1e-300' times 1e-10 is 1e-310, outside the range of a double "
         "(about 2.2e-308 to 1.8e308): choose factors that keep every value in range\n"
         "  R1 a 0 1e-300\n         ^~~~~~\n"},
        {__LINE__, "C1 a 0 1p", 1e200, 1e200,
         "deck.cir:2:8: error: the factor for a value in F is outside the range of a double with "
         "these Km and Kf: choose factors nearer to 1\n"
         "  C1 a 0 1p\n         ^~\n"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "rescale_test.cpp:" << row.line);
        try {
            test::scale_text("t\n" + row.card + "\n.end\n", row.km, row.kf);
            ADD_FAILURE() << "no error";
        } catch (const DeckError& e) {
            EXPECT_EQ(render(e.diagnostic()), row.rendered);
        }
    }
}

// Issue 10 §4: valid decks that were refused. Each form was read by ngspice 39 in its own
// run (`.tran … uic`: manual §15.3.10; `.meas … =thr`: t1 measured the same as with `=0.5`;
// `R = (…)`: a time-varying resistance), so each is scaled now.
TEST(ScalerTest, ValidFormsOnceRefusedAreScaled) {
    const LineCase cases[] = {
        {__LINE__, "", ".tran 10u 2m uic", ".tran 10n 2u uic"},
        {__LINE__, "", ".TRAN 10u 2m 0 UIC", ".TRAN 10n 2u 0 UIC"},
        {__LINE__, ".param thr=0.5\n", ".meas tran t1 when v(a)=thr",
         ".meas tran t1 when v(a)=thr"},
        {__LINE__, ".param tset=4m\n", ".meas tran v1 find v(a) at=tset",
         ".meas tran v1 find v(a) at=tset"},  // .param tset=4u (scale/param_plan)
        {__LINE__, ".param tset=4m\nR9 a 0 tset\n", ".meas tran v1 find v(a) at=tset",
         ".meas tran v1 find v(a) at={(tset)/1000}"},
        {__LINE__, ".param Rload=1k\n", "R4 out2 OUT R = (time<12ms ? {Rload} : {2*Rload})",
         "R4 out2 OUT R = ((((time*1000)<12ms ? {Rload} : {2*Rload}))*10)"},
        {__LINE__, "", "R5 a b r=(2k) tc1=0.01", "R5 a b r=(((2k))*10) tc1=0.01"},
        // .ic and .nodeset take parameter names too (tried: `.ic v(b)=vinit` set v(b)).
        {__LINE__, ".param vinit=0.7\n", ".ic v(b)=vinit", ".ic v(b)=vinit"},
        {__LINE__, ".param vn=0.3\n", ".nodeset v(b)=vn", ".nodeset v(b)=vn"},
        {__LINE__, "", "C1 a 0 C=(1n+time*1u)", "C1 a 0 C=(((1n+(time*1000)*1u))/10000)"},
        // A behavioural charge (ngspice 39 manual 3.3.9; read by ngspice 39, tried).
        {__LINE__, "", "C2 a 0 Q='1u*v(a) + 0.1u*v(a)*v(a)'",
         "C2 a 0 Q='(1u*v(a) + 0.1u*v(a)*v(a))/10000'"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "rescale_test.cpp:" << c.line << ": " << c.in);
        try {
            auto s = test::scale_text("t\n" + c.before + c.in + "\n.end\n", 10, 1000);
            std::size_t n =
                1 + static_cast<std::size_t>(std::count(c.before.begin(), c.before.end(), '\n'));
            std::size_t start = 0;
            for (std::size_t i = 0; i < n; ++i) start = s.text().find('\n', start) + 1;
            EXPECT_EQ(s.text().substr(start, s.text().find('\n', start) - start), c.out);
            for (const auto& d : s.result.unscalable) ADD_FAILURE() << render(d);
        } catch (const DeckError& e) {
            ADD_FAILURE() << render(e.diagnostic());
        }
    }
}

// A bare name in other dot cards stays refused, saying what ngspice 39 does with it (tried with
// `ngspice -b`): the analyses read it as 0 (`.ac … fstart fstop` stops with "AC startfreq <=
// 0"), .four and .temp do not take it.
TEST(ScalerTest, BareNamesInOtherDotCardsAreRefusedWithWhatNgspiceDoes) {
    struct Case {
        int line;
        std::string cards;
        std::string rendered;
    };
    const Case cases[] = {
        {__LINE__, ".param f1=10 f2=1k\n.ac dec 10 f1 f2\n",
         "deck.cir:3:12: error: bare name 'f1' in a value of a dot card: ngspice 39 reads it as 0; "
         "write {f1}\n  .ac dec 10 f1 f2\n             ^~\n"},
        {__LINE__, ".param ts=1m\n.tran 1u ts\n",
         "deck.cir:3:10: error: bare name 'ts' in a value of a dot card: ngspice 39 reads it as 0; "
         "write {ts}\n  .tran 1u ts\n           ^~\n"},
        {__LINE__, ".param f0=1k\n.four f0 v(a)\n",
         "deck.cir:3:7: error: bare name 'f0' in a value of a dot card: ngspice 39 does not read a "
         "parameter name there; write the number\n  .four f0 v(a)\n        ^~\n"},
        {__LINE__, ".param tt=85\n.temp tt\n",
         "deck.cir:3:7: error: bare name 'tt' in a value of a dot card: ngspice 39 does not read a "
         "parameter name there; write {tt}\n  .temp tt\n        ^~\n"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "rescale_test.cpp:" << c.line);
        try {
            test::scale_text("t\n" + c.cards + ".end\n", 10, 1000);
            ADD_FAILURE() << "not refused";
        } catch (const DeckError& e) {
            EXPECT_EQ(render(e.diagnostic()), c.rendered);
        }
    }
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// An empty expression is an error, located at the expression. ngspice 39 stops on it (tried:
// `pulse(''''0 1 ...)` gives "Expression err: }{}0 1 ..." and a fatal error), and its wrap
// would put both halves at one offset. Found by the deck fuzz target
// (tests/fuzz/regressions/deck-empty-expression-wrap.bin). Adjacent non-empty expressions are
// two values, as ngspice reads them (tried: `pulse(0 1 {1m}{2m} ...)` expands to two numbers).
TEST(ScalerTest, AnEmptyExpressionIsAnError) {
    for (std::string value : {"''", "{}", "{ }", "' '"}) {
        SCOPED_TRACE(value);
        try {
            test::scale_text("t\nV1 a 0 pulse(0 1 " + value + " 1n 1n 1m 2m)\n.end\n", 7, 3);
            ADD_FAILURE() << "no error";
        } catch (const DeckError& e) {
            std::string text = render(e.diagnostic());
            EXPECT_EQ(text.substr(0, 38), "deck.cir:2:18: error: an empty express") << text;
        }
    }
    auto s = test::scale_text("t\nV1 a 0 pulse(0 1 {1m}{2m} 1n 1n 1m 2m)\n.end\n", 7, 3);
    EXPECT_EQ(s.text(),
              "t\nV1 a 0 pulse(0 1 {(1m)/3}{(2m)/3} 333.3333p 333.3333p 333.3333u 2m)\n.end\n");
}

}  // namespace
}  // namespace deckscale
