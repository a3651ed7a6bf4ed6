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
        {__LINE__, "let x = 5*2\n",
         "deck.cir:8:9: error: '5' in 'let': the unit of this number is known only from how its "
         "value is used\n  let x = 5*2\n          ^\n"},
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

TEST(ControlBlock, LeaveUnscalableMarksEachLineOnce) {
    auto s = test::scale_text(kHead + "tran 1u 2m\nlet x = 5 ; let y = 2\n.endc\n.end\n", 10, 1000,
                              7, true);
    EXPECT_EQ(s.result.unscalable.size(), 2u);
    EXPECT_EQ(block_of(s.text()),
              "tran 1n 2u\n* deckscale: left unscaled: '5' in 'let': the unit of this number is "
              "known only from how its value is used\nlet x = 5 ; let y = 2\n");
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
