// Rewriting .control commands: each command form of the shared notes' table
// ("control-and-sweeps.md" A.2, from the ngspice 39 manual ch. 17) and the refusals.
#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "deck/diagnostic.hpp"
#include "scale/sweep_unit.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

// Km = 10, Kf = 1000: s / 1000, Hz x 1000, A / 10, Ohm x 10, F / 1e4, H / 100.
const std::string kHead =
    "control test\nV1 in 0 DC 0 AC 1\nI1 0 out DC 1m\nR1 in out 1k\nC1 out 0 1u\n"
    ".model swm sw(vt=1 ron=1 roff=1meg)\n.control\n";
constexpr int kFirstLine = 8;  // the line of the block's first command

std::string block_of(const std::string& text) {
    auto b = text.find(".control\n") + 9;
    return text.substr(b, text.find(".endc\n") - b);
}

struct Case {
    int line;
    std::string body;
    std::string expected;  // the block after scaling
};

TEST(ControlBlock, CommandsAreRewrittenByTheRuleTable) {
    const Case cases[] = {
        // analyses, read like their dot cards (manual 17.5; spiceif.c:241)
        {__LINE__, "ac dec 10 1 1k\n", "ac dec 10 1000 1meg\n"},
        {__LINE__, "ac lin 11 1k 2k\n", "ac lin 11 1meg 2meg\n"},
        {__LINE__, "dc V1 0 5 0.5\n", "dc V1 0 5 0.5\n"},
        {__LINE__, "dc I1 0 1m 0.1m\n", "dc I1 0 100u 10u\n"},
        {__LINE__, "dc R1 1k 2k 100\n", "dc R1 10k 20k 1000\n"},
        {__LINE__, "dc temp 0 100 10\n", "dc temp 0 100 10\n"},
        {__LINE__, "tran 1u 2m\n", "tran 1n 2u\n"},
        {__LINE__, "tran 1u 2m 0.5m 10n\n", "tran 1n 2u 500n 10p\n"},
        {__LINE__, "tran 1u 2m uic\n", "tran 1n 2u uic\n"},
        {__LINE__, "noise v(out) V1 dec 10 10 100k\n", "noise v(out) V1 dec 10 10000 100meg\n"},
        {__LINE__, "sp dec 10 1k 1meg\n", "sp dec 10 1meg 1g\n"},
        {__LINE__, "disto dec 10 1k 100k\n", "disto dec 10 1meg 100meg\n"},
        {__LINE__, "fourier 1k v(out)\n", "fourier 1meg v(out)\n"},
        {__LINE__, "four 2k v(out)\n", "four 2meg v(out)\n"},
        {__LINE__, "spec 0 20k 1k v(out)\n", "spec 0 20meg 1meg v(out)\n"},
        {__LINE__, "optran 0 0 0 100n 10u 0\n", "optran 0 0 0 100p 10n 0\n"},
        // continuation lines and several commands on a line
        {__LINE__, "tran 1u\n+ 2m\n", "tran 1n\n+ 2u\n"},
        {__LINE__, "run; tran 1u 2m ; ac dec 5 1 10\n", "run; tran 1n 2u ; ac dec 5 1000 10000\n"},
        // measurements (manual 15.4): times, frequencies, values of the measured quantity
        {__LINE__, "meas tran t1 trig v(out) val=0.1 rise=1 targ v(out) val=0.9 rise=1\n",
         "meas tran t1 trig v(out) val=0.1 rise=1 targ v(out) val=0.9 rise=1\n"},
        {__LINE__, "meas tran vf find v(out) at=1m\n", "meas tran vf find v(out) at=1u\n"},
        {__LINE__, "measure ac g avg vm(out) from=1k to=10k\n",
         "measure ac g avg vm(out) from=1meg to=10meg\n"},
        {__LINE__, "meas tran iw when i(v1)=2m td=0.1m\n",
         "meas tran iw when i(v1)=200u td=100n\n"},
        // on a DC sweep from=/to=/at= take the swept quantity's unit
        {__LINE__, "dc I1 0 1m 0.1m\nmeas dc vh find v(out) at=0.5m\n",
         "dc I1 0 100u 10u\nmeas dc vh find v(out) at=50u\n"},
        {__LINE__, "dc R1 1k 2k 100\nmeas dc vr avg v(out) from=1k to=2k\n",
         "dc R1 10k 20k 1000\nmeas dc vr avg v(out) from=10k to=20k\n"},
        {__LINE__, "dc V1 0 5 0.5\nmeas dc vv find i(v1) at=2\n",
         "dc V1 0 5 0.5\nmeas dc vv find i(v1) at=2\n"},
        // options (manual 15.1; notes A.3), as option or as set
        {__LINE__, "option abstol=1e-12 reltol=1e-4\n", "option abstol=1e-13 reltol=1e-4\n"},
        {__LINE__, "set gmin=1e-10\n", "set gmin=1e-11\n"},
        {__LINE__, "set numdgt=16\n", "set numdgt=16\n"},
        // special vectors of linearize (manual 17.5.40)
        {__LINE__, "let lin-tstep = 1u\n", "let lin-tstep = 1n\n"},
        // alter and altermod: the element and model rule tables (manual 17.5.3-4)
        {__LINE__, "alter c1 = 200n\n", "alter c1 = 20p\n"},
        {__LINE__, "alter @r1[resistance] = 5k\n", "alter @r1[resistance] = 50k\n"},
        {__LINE__, "alter r1 2k\n", "alter r1 20k\n"},
        {__LINE__, "alter i1 dc = 1m\n", "alter i1 dc = 100u\n"},
        {__LINE__, "alter v1 = 2\n", "alter v1 = 2\n"},
        {__LINE__, "altermod swm ron = 10\n", "altermod swm ron = 100\n"},
        // parameter uses are written {(p)*k}: a new value stays as written (notes A.2)
        {__LINE__, "alterparam rv = 2k\nreset\n", "alterparam rv = 2k\nreset\n"},
        // stop when: the unit of the watched quantity
        {__LINE__, "stop when time > 1m\n", "stop when time > 1u\n"},
        {__LINE__, "stop when v(out) > 0.5\n", "stop when v(out) > 0.5\n"},
        {__LINE__, "stop after 20\n", "stop after 20\n"},
        // plot limits: x in the unit of the last analysis, y in that of the plotted vectors
        {__LINE__, "tran 1u 2m\nplot v(out) xlimit 1m 2m ylimit 0 1\n",
         "tran 1n 2u\nplot v(out) xlimit 1u 2u ylimit 0 1\n"},
        {__LINE__, "ac dec 10 1 1k\nplot i(v1) xl 10 100 yl 0 1m\n",
         "ac dec 10 1000 1meg\nplot i(v1) xl 10000 100000 yl 0 100u\n"},
        {__LINE__, "tran 1u 2m\nwrdata f.txt v(out) xlimit 0 1m xindices 2 4\n",
         "tran 1n 2u\nwrdata f.txt v(out) xlimit 0 1u xindices 2 4\n"},
        // control flow passes; its body is rewritten command by command (manual 17.6)
        {__LINE__, "repeat 2\n  ac dec 5 1 10\nend\n", "repeat 2\n  ac dec 5 1000 10000\nend\n"},
        {__LINE__, "if $ok\n tran 1u 1m\nelse\n op\nend\n",
         "if $ok\n tran 1n 1u\nelse\n op\nend\n"},
        // commands with no unit-carrying number pass byte for byte
        {__LINE__,
         "run\nprint v(out) v(2)\nwrdata f.txt v(out)\necho 10 points\nset wr_singlescale\n"
         "linearize v(out)\nsetplot tran1\nquit 0\n* 1k in a comment\nop $ 1k\n",
         "run\nprint v(out) v(2)\nwrdata f.txt v(out)\necho 10 points\nset wr_singlescale\n"
         "linearize v(out)\nsetplot tran1\nquit 0\n* 1k in a comment\nop $ 1k\n"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "control_test.cpp:" << c.line << ": " << c.body);
        try {
            auto s = test::scale_text(kHead + c.body + ".endc\n.end\n", 10, 1000);
            EXPECT_EQ(block_of(s.text()), c.expected);
            for (const auto& d : s.result.unscalable) ADD_FAILURE() << render(d);
        } catch (const DeckError& e) {
            ADD_FAILURE() << render(e.diagnostic());
        }
    }
}

TEST(ControlBlock, FactorsOfOneReproduceTheBlock) {
    std::string deck = kHead +
                       "ac dec 10 1 1k\ndc I1 0 1m 0.1m\nmeas dc vh find v(out) at=0.5m\n"
                       "option abstol=1e-12\nalter c1 = 200n\n.endc\n.end\n";
    auto s = test::scale_text(deck, 1, 1);
    EXPECT_EQ(s.text(), deck);
    EXPECT_TRUE(s.result.unscalable.empty());
}

struct Refusal {
    int line;
    std::string body;
    std::string rendered;  // every diagnostic, rendered
};

TEST(ControlBlock, NumbersOfUnknownUnitAreRefusedAtTheirWord) {
    const Refusal cases[] = {
        {__LINE__, "let x = out + 5\n",
         "deck.cir:8:15: error: '5' in 'let': it meets 'out', whose unit is not known here\n"
         "  let x = out + 5\n                ^\n"},
        {__LINE__, "define f(x) = x*2\n",
         "deck.cir:8:17: error: '2' in 'define': the unit of this number is known only from how "
         "its value is used\n  define f(x) = x*2\n                  ^\n"},
        {__LINE__, "ac dec 10 1 $fstop\n",
         "deck.cir:8:13: error: '$fstop' is replaced by a variable's value before 'ac' reads its "
         "words: that value's unit is not known here\n  ac dec 10 1 $fstop\n              "
         "^~~~~~\n"},
        {__LINE__, "set fstop = 1meg\n",
         "deck.cir:8:13: error: 'fstop' is a variable: the unit of its value is known only where "
         "$fstop is used\n  set fstop = 1meg\n              ^~~~\n"},
        {__LINE__, "meas tran t1 when v(out)=vth\n",
         "deck.cir:8:26: error: 'vth' names a vector: its unit is known only from how the block "
         "computed it\n  meas tran t1 when v(out)=vth\n                           ^~~\n"},
        {__LINE__, "compose f values 1 2\n",
         "deck.cir:8:18: error: '1' in 'compose': the unit of this number is known only from how "
         "its value is used\n  compose f values 1 2\n                   ^\n"},
        {__LINE__, "foreach c 1n 2n\n",
         "deck.cir:8:11: error: '1n' in 'foreach': the unit of this number is known only from how "
         "its value is used\n  foreach c 1n 2n\n            ^~\n"},
        {__LINE__, "plot v(out) xlimit 0 1m\n",
         "deck.cir:8:20: error: 'xlimit' of 'plot': the unit of that axis is not known here\n"
         "  plot v(out) xlimit 0 1m\n                     ^\n"
         "deck.cir:8:22: error: 'xlimit' of 'plot': the unit of that axis is not known here\n"
         "  plot v(out) xlimit 0 1m\n                       ^~\n"},
        {__LINE__, "meas dc vh find v(out) at=1\n",
         "deck.cir:8:24: error: at= of a DC measurement in a deck with no DC sweep\n"
         "  meas dc vh find v(out) at=1\n                         ^~\n"},
        {__LINE__, "altermod swm vx = 2\n",
         "deck.cir:8:19: error: '2' in 'altermod': parameter 'vx' of a 'sw' model is not in the "
         "rule table\n  altermod swm vx = 2\n                    ^\n"},
        {__LINE__, "frobnicate 3\n",
         "deck.cir:8:12: error: '3' in 'frobnicate': a number in a command whose arguments "
         "deckscale does not know\n  frobnicate 3\n             ^\n"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "control_test.cpp:" << c.line << ": " << c.body);
        try {
            auto s = test::scale_text(kHead + c.body + ".endc\n.end\n", 10, 1000);
            std::string got;
            for (const auto& d : s.result.unscalable) got += render(d);
            EXPECT_EQ(got, c.rendered);
        } catch (const DeckError& e) {
            ADD_FAILURE() << render(e.diagnostic());
        }
    }
}

// Numbers in let, if, while and dowhile take the unit of what they meet (scale/control_units):
// compared with or added to time, a frequency or a current, they scale as one (common
// practice: t / Kf, f x Kf, I / Km); beside a voltage, as a coefficient, an index, or in a
// loop counter that never meets the circuit, they stay. Km = 10, Kf = 1000.
TEST(ControlBlock, ExpressionNumbersTakeTheUnitOfWhatTheyMeet) {
    const Case cases[] = {
        {__LINE__, "let vlate = v(out)*(time gt 1.1m)\n", "let vlate = v(out)*(time gt 1.1u)\n"},
        {__LINE__, "let w = 2*pi*frequency\n", "let w = 2*pi*frequency\n"},
        {__LINE__, "let f2 = frequency + 1k\n", "let f2 = frequency + 1meg\n"},
        {__LINE__, "let t2 = time - 20u\n", "let t2 = time - 20n\n"},
        {__LINE__, "let i = 0\nwhile i < 3\nlet i = i + 1\nend\n",
         "let i = 0\nwhile i < 3\nlet i = i + 1\nend\n"},
        {__LINE__, "let iin = -i(v1)\nif iin[10] < 0.5m\necho small\nend\n",
         "let iin = -i(v1)\nif iin[10] < 50u\necho small\nend\n"},
        {__LINE__, "if v(out) > 0.5 and v1#branch ge -2m\necho hi\nend\n",
         "if v(out) > 0.5 and v1#branch ge -200u\necho hi\nend\n"},
        // A variable carries the unit its other uses give it, wherever they are.
        {__LINE__, "let tp = 1m\ndowhile time[0] lt tp\nend\n",
         "let tp = 1u\ndowhile time[0] lt tp\nend\n"},
        {__LINE__, "let gain = vdb(out) - 3\nlet k = mag(v(out))/2\n",
         "let gain = vdb(out) - 3\nlet k = mag(v(out))/2\n"},
        {__LINE__, "let p = v(out)*i(v1)\nif p > 1m\nend\n", "let p = v(out)*i(v1)\nif p > 100u\nend\n"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "control_test.cpp:" << c.line << ": " << c.body);
        try {
            auto s = test::scale_text(kHead + "tran 1u 2m\n" + c.body + ".endc\n.end\n", 10, 1000);
            EXPECT_EQ(block_of(s.text()), "tran 1n 2u\n" + c.expected);
            for (const auto& d : s.result.unscalable) ADD_FAILURE() << render(d);
        } catch (const DeckError& e) {
            ADD_FAILURE() << render(e.diagnostic());
        }
    }
}

// A number kept as a coefficient beside a vector other than pi gets a note: v(out)/1k could
// be a resistance.
TEST(ControlBlock, ACoefficientBesideAVectorIsNoted) {
    auto s = test::scale_text(kHead + "let iout = v(out)/1k\nlet w = 2*pi*frequency\n.endc\n.end\n",
                              10, 1000);
    EXPECT_TRUE(s.result.unscalable.empty());
    ASSERT_EQ(s.result.notes.size(), 1u);
    EXPECT_EQ(render(s.result.notes[0]),
              "deck.cir:8:19: note: '1k' in 'let' is kept as a pure number: it multiplies or "
              "divides a vector; if it stands for a part value (a resistance, a capacitance), "
              "rescale it by hand\n  let iout = v(out)/1k\n                    ^~\n");
}

TEST(ControlBlock, ExpressionNumbersOfUnknownUnitAreRefused) {
    struct Refused {
        int line;
        std::string body;
        std::vector<std::string> why;  // each refusal's message, in order
    } cases[] = {
        {__LINE__, "let twice = 2*1m\nif twice > time[3]\nend\n",
         {"'2' in 'let': it is one factor of a product of numbers that has a unit: which factor "
          "carries it is not known",
          "'1m' in 'let': it is one factor of a product of numbers that has a unit: which factor "
          "carries it is not known"}},
        {__LINE__, "let tau = 10u\nlet tn = time/tau\n",
         {"'10u' in 'let': its variable 'tau' is multiplied or divided by another quantity, and "
          "a variable's unit is not followed through a product"}},
        {__LINE__, "let tt = 1m\nmeas tran vx find v(out) at=$&tt\n",
         {"'1m' in 'let': its variable 'tt' is read by 'meas' through '$', whose reading of it "
          "is not followed",
          "'$&tt' is replaced by a variable's value before 'meas' reads its words: that value's "
          "unit is not known here"}},
        {__LINE__, "let x = 1m\nif x > time[1]\nend\nif x > i(v1)[1]\nend\n",
         // (Then nothing read from a variable is trusted: the indices are refused too.)
         {"'1m' in 'let': it meets quantities of two units (s and A)",
          "'1' in 'if': a variable of the block meets quantities of two units",
          "'1' in 'if': a variable of the block meets quantities of two units"}},
        {__LINE__, "if $n > 3\nend\n", {"'3' in 'if': it meets '$n', whose unit is not known here"}},
        {__LINE__, "if idb(v1) > -60\nend\n",
         {"'60' in 'if': it meets 'idb(...)', whose unit is not known here"}},
        {__LINE__, "let y = deriv(v(out)) + 1k\n",
         {"'1k' in 'let': it meets 'deriv(...)', whose unit is not known here"}},
        {__LINE__, "let y = v(out) ? 1 : 2\n",
         {"'1' in 'let': the expression is not one whose units deckscale reads"}},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "control_test.cpp:" << c.line << ": " << c.body);
        try {
            auto s = test::scale_text(kHead + "tran 1u 2m\n" + c.body + ".endc\n.end\n", 10, 1000);
            std::vector<std::string> got;
            for (const auto& d : s.result.unscalable) got.push_back(d.message);
            EXPECT_EQ(got, c.why);
        } catch (const DeckError& e) {
            ADD_FAILURE() << render(e.diagnostic());
        }
    }
}

// altermod of a semiconductor model takes the factor its .model card's rewrite gives the
// parameter (scale/semiconductors.hpp): IS stays, CJO and TT / Kf, a VDMOS gate capacitance
// / (Km Kf); flicker noise, the level and self-heating are refused. Km = 10, Kf = 1000.
TEST(ControlBlock, AltermodOfASemiconductorModelFollowsItsCard) {
    const std::string head =
        "diodes\nV1 in 0 DC 1\nR1 in a 1k\nD1 a 0 dm\nM1 a in 0 vd\n"
        ".model dm D(IS=1e-14 CJO=2p)\n.model vd vdmos(kp=1 cgs=1n)\n.control\n";
    const Case cases[] = {
        {__LINE__, "altermod dm is=2e-14\n", "altermod dm is=2e-14\n"},
        {__LINE__, "altermod dm cjo=4p\n", "altermod dm cjo=4f\n"},
        {__LINE__, "altermod @dm[tt] = 10n\n", "altermod @dm[tt] = 10p\n"},
        {__LINE__, "altermod vd cgs = 2n\n", "altermod vd cgs = 200f\n"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "control_test.cpp:" << c.line << ": " << c.body);
        auto s = test::scale_text(head + c.body + ".endc\n.end\n", 10, 1000);
        EXPECT_EQ(block_of(s.text()), c.expected);
        for (const auto& d : s.result.unscalable) ADD_FAILURE() << render(d);
    }
    for (const char* body : {"altermod dm kf=1e-14\n", "altermod dm level=3\n",
                             "altermod vd rthjc=2\n"}) {
        SCOPED_TRACE(body);
        auto s = test::scale_text(head + body + ".endc\n.end\n", 10, 1000);
        ASSERT_EQ(s.result.unscalable.size(), 1u);
        EXPECT_NE(s.result.unscalable[0].message.find("in 'altermod': "), std::string::npos);
    }
}

// A variable that nothing in its block gives a unit keeps its numbers only when the deck has
// one .control block: vectors outlive their block, and another block may read it (here
// `alter c1 = t0` would have set C1 to the original's 2m farads). Both with the deck read
// first and with the one-pass reader, which cannot know of the later block when it meets
// the first.
TEST(ControlBlock, AVariableAnotherBlockMayReadIsRefused) {
    const std::string one_block =
        "two blocks\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 100n\n.control\nlet t0 = 2m\n"
        ".endc\n.ac dec 10 1 1k\n.end\n";
    const std::string two_blocks =
        "two blocks\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 100n\n.control\nlet t0 = 2m\n"
        ".endc\n.ac dec 10 1 1k\n.control\nalter c1 = t0\n.endc\n.end\n";
    for (const auto* deck : {&one_block, &two_blocks}) {
        bool several = deck == &two_blocks;
        SCOPED_TRACE(several ? "two blocks" : "one block");
        auto s = test::scale_text(*deck, 10, 1000);
        MemoryFileSystem fs;
        fs.add("deck.cir", *deck);
        ScaleSettings settings;
        settings.factors = {10, 1000};
        settings.digits = 7;
        ScaledDeck one = load_and_scale("deck.cir", fs, settings);
        for (const auto& r : {s.result, one.result}) {
            ASSERT_EQ(r.unscalable.size(), several ? 1u : 0u);
            if (several)
                EXPECT_EQ(render(r.unscalable[0]),
                          "deck.cir:6:10: error: '2m' in 'let': nothing in its .control block "
                          "tells the unit of its variable, and another .control block of the "
                          "deck may read it (a variable's unit is not followed across "
                          "blocks)\n  let t0 = 2m\n           ^~\n");
        }
    }
}

TEST(ControlBlock, LeaveUnscalableMarksEachLineOnce) {
    auto s = test::scale_text(kHead + "tran 1u 2m\nlet x = a + 5 ; let y = b - 2\n.endc\n.end\n",
                              10, 1000, 7, true);
    EXPECT_EQ(s.result.unscalable.size(), 2u);
    EXPECT_EQ(block_of(s.text()),
              "tran 1n 2u\n* deckscale: left unscaled: '5' in 'let': it meets 'a', whose unit is "
              "not known here\nlet x = a + 5 ; let y = b - 2\n");
}

TEST(ControlBlock, MeasOnADcCardTakesTheSweptUnitWhereverTheCardIs) {
    const Case cases[] = {
        {__LINE__, ".dc I1 0 1m 0.1m\n.meas dc vh find v(out) at=0.5m\n",
         ".dc I1 0 100u 10u\n.meas dc vh find v(out) at=50u\n"},
        {__LINE__, ".meas dc vh find v(out) at=0.5m\n.dc I1 0 1m 0.1m\n",
         ".meas dc vh find v(out) at=50u\n.dc I1 0 100u 10u\n"},
        {__LINE__, ".meas dc r avg v(out) from=1k to=2k\n.dc R1 1k 2k 100\n",
         ".meas dc r avg v(out) from=10k to=20k\n.dc R1 10k 20k 1000\n"},
        {__LINE__, ".control\nmeas dc vh find v(out) at=0.5m\n.endc\n.dc I1 0 1m 0.1m\n",
         ".control\nmeas dc vh find v(out) at=50u\n.endc\n.dc I1 0 100u 10u\n"},
        {__LINE__, ".meas dc t find v(out) at=27\n.dc temp 0 100 10\n",
         ".meas dc t find v(out) at=27\n.dc temp 0 100 10\n"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "control_test.cpp:" << c.line << ": " << c.body);
        std::string deck = "dc meas\nI1 0 out DC 1m\nR1 out 0 1k\n" + c.body + ".end\n";
        std::string expected = "dc meas\nI1 0 out DC 100u\nR1 out 0 10k\n" + c.expected + ".end\n";
        auto s = test::scale_text(deck, 10, 1000);
        EXPECT_EQ(s.text(), expected);
        EXPECT_TRUE(s.result.unscalable.empty());
        // The one-pass reader decides the same once the whole deck is read.
        MemoryFileSystem fs;
        fs.add("deck.cir", deck);
        ScaleSettings settings;
        settings.factors = {10, 1000};
        settings.digits = 7;
        ScaledDeck one = load_and_scale("deck.cir", fs, settings);
        EXPECT_EQ(apply_edits(one.deck.files[0].source->text(), one.result.edits[0]), expected);
    }
}

TEST(ControlBlock, PlotLimitsAfterRunTakeTheUnitOfTheAnalysisCards) {
    const Case cases[] = {
        {__LINE__, ".tran 1u 2m\n.control\nrun\nplot v(out) xlimit 1m 2m\n.endc\n",
         ".tran 1n 2u\n.control\nrun\nplot v(out) xlimit 1u 2u\n.endc\n"
         ".options abstol=1e-13 chgtol=1e-18\n"},  // scale/tran_tolerances
        {__LINE__, ".control\nrun\nplot v(out) xl 10 100\n.endc\n.ac dec 10 1 1k\n",
         ".control\nrun\nplot v(out) xl 10000 100000\n.endc\n.ac dec 10 1000 1meg\n"},
        {__LINE__, ".dc I1 0 1m 0.1m\n.control\nrun\nplot v(out) xl 0 0.5m\n.endc\n",
         ".dc I1 0 100u 10u\n.control\nrun\nplot v(out) xl 0 50u\n.endc\n"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "control_test.cpp:" << c.line << ": " << c.body);
        std::string deck = "plot\nI1 0 out DC 1m\nR1 out 0 1k\n" + c.body + ".end\n";
        std::string expected = "plot\nI1 0 out DC 100u\nR1 out 0 10k\n" + c.expected + ".end\n";
        auto s = test::scale_text(deck, 10, 1000);
        EXPECT_EQ(s.text(), expected);
        for (const auto& d : s.result.unscalable) ADD_FAILURE() << render(d);
        MemoryFileSystem fs;
        fs.add("deck.cir", deck);
        ScaleSettings settings;
        settings.factors = {10, 1000};
        settings.digits = 7;
        ScaledDeck one = load_and_scale("deck.cir", fs, settings);
        EXPECT_EQ(apply_edits(one.deck.files[0].source->text(), one.result.edits[0]), expected);
        EXPECT_TRUE(one.result.unscalable.empty());
    }
    // Two analysis cards: which plot the limit refers to is not known.
    auto s = test::scale_text(
        "plot\nR1 out 0 1k\n.tran 1u 2m\n.ac dec 10 1 1k\n.control\nrun\n"
        "plot v(out) xlimit 1m 2m\n.endc\n.end\n",
        10, 1000);
    EXPECT_EQ(s.result.unscalable.size(), 2u);
}

TEST(ControlBlock, DcSweepsOfADeck) {
    struct Row {
        int line;
        std::string cards;
        std::size_t found;
        std::optional<Unit> unit;
    };
    const Row rows[] = {
        {__LINE__, "", 0, std::nullopt},
        {__LINE__, ".dc V1 0 1 0.1\n", 1, Unit::volt},
        {__LINE__, ".dc I1 0 1 0.1\n.control\ndc i2 0 1 0.5\n.endc\n", 2, Unit::ampere},
        {__LINE__, ".dc R1 1 2 1\n.dc V1 0 1 1\n", 2, std::nullopt},
        {__LINE__, ".dc xparam 0 1 1\n", 1, std::nullopt},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "control_test.cpp:" << r.line << ": " << r.cards);
        MemoryFileSystem fs;
        fs.add("d.cir", "t\nR1 a 0 1\n" + r.cards + ".end\n");
        DcSweeps s = dc_sweeps(load_deck("d.cir", fs));
        EXPECT_EQ(s.found, r.found);
        EXPECT_EQ(s.unit, r.unit);
    }
}

}  // namespace
}  // namespace deckscale
