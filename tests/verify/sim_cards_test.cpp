// The deck handed to the simulator: analyses, outputs and .control blocks removed,
// includes inlined, the verifier's analysis added, and the drive source given an AC value.
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "deck/load.hpp"
#include "verify/sim_cards.hpp"

namespace deckscale {
namespace {

std::vector<std::string> cards_of(const MemoryFileSystem& fs, const std::string& path,
                                  const SimDeckOptions& o) {
    return simulation_cards(load_deck(path, fs), o);
}

// ngspice 39 accepts "R1 a b rval" for a .param rval, but with a "can't find model"
// warning (shared notes "deck-syntax.md" §3): the simulated copy spells it "{rval}".
TEST(SimulationCards, BareParameterValuesAreBraced) {
    MemoryFileSystem fs;
    fs.add("p.cir", "t\n.param rval=10k\nR1 in out rval\nC1 out 0 {cval}\n.param cval=1n\n.end\n");
    auto cards = cards_of(fs, "p.cir", {".op", "", 1});
    EXPECT_EQ(cards, (std::vector<std::string>{"t", ".param rval=10k", "R1 in out {rval}",
                                               "C1 out 0 {cval}", ".param cval=1n", ".op", ".end"}));
}

TEST(SimulationCards, RemovesAnalysesOutputsAndControlBlocks) {
    MemoryFileSystem fs;
    fs.add("top.cir",
           "notch under test\n"
           "V1 in 0 dc 0 ac 1\n"
           "R1 in out 1k\n"
           ".include parts/c.inc\n"
           ".ac dec 5 1 1k\n"
           ".tran 1u 1m\n"
           ".op\n"
           ".print ac v(out)\n"
           ".meas ac peak max v(out)\n"
           ".save all\n"
           ".options reltol=1e-6\n"
           ".control\n"
           "run\n"
           "shell touch marker\n"
           "quit\n"
           ".endc\n"
           ".end\n"
           "trailing text after the end\n");
    fs.add("parts/c.inc", "* the capacitor lives here\nC1 out 0 1u\n");
    auto cards = cards_of(fs, "top.cir", {".ac lin 3 10 30", "", 1});
    EXPECT_EQ(cards, (std::vector<std::string>{
                         "notch under test",
                         "V1 in 0 dc 0 ac 1",
                         "R1 in out 1k",
                         "* deckscale: contents of parts/c.inc follow",
                         "* the capacitor lives here",
                         "C1 out 0 1u",
                         "* deckscale: end of parts/c.inc",
                         ".options reltol=1e-6",
                         ".ac lin 3 10 30",
                         ".end",
                     }));
}

// The measurements of the run's own analysis stay (verify compares their results); those of
// other analyses go, or ngspice would report them as of an analysis it did not run.
TEST(SimulationCards, KeepsTheMeasurementsOfTheRunsAnalysisOnRequest) {
    MemoryFileSystem fs;
    fs.add("m.cir", "m\nV1 in 0 ac 1 pulse(0 1 0 1u)\nR1 in out 1k\nC1 out 0 1n\n"
                    ".meas ac bw when vdb(out)=-3\n.MEASURE tran t50 when v(out)=0.5\n"
                    ".meas tran vend find v(out) at=1m\n.end\n");
    SimDeckOptions o{".tran 1u 1m", "", 1};
    o.keep_measures = "tran";
    EXPECT_EQ(cards_of(fs, "m.cir", o),
              (std::vector<std::string>{"m", "V1 in 0 ac 1 pulse(0 1 0 1u)", "R1 in out 1k",
                                        "C1 out 0 1n", ".MEASURE tran t50 when v(out)=0.5",
                                        ".meas tran vend find v(out) at=1m", ".tran 1u 1m",
                                        ".end"}));
    o.keep_measures = "";
    EXPECT_EQ(cards_of(fs, "m.cir", o).size(), 6u);
    o.extra_cards = {".meas tran t10 when v(out)=0.1"};  // a .control block's meas command
    auto cards = cards_of(fs, "m.cir", o);
    ASSERT_EQ(cards.size(), 7u);
    EXPECT_EQ(cards[4], ".meas tran t10 when v(out)=0.1");
    EXPECT_EQ(cards[5], ".tran 1u 1m");
}

TEST(SimulationCards, DriveSourceGetsTheAcValue) {
    MemoryFileSystem fs;
    fs.add("d.cir",
           "driven later\n"
           "Vdd vdd 0 5\n"
           "Vsig in 0 dc 0 pulse(0 1 0 1n 1n 1u 2u)\n"
           "+ \n"
           "R1 in vdd 1k\n"
           ".end\n");
    auto cards = cards_of(fs, "d.cir", {".op", "vsig", 0.25});
    EXPECT_EQ(cards, (std::vector<std::string>{
                         "driven later",
                         "Vdd vdd 0 5",
                         "Vsig in 0 dc 0 pulse(0 1 0 1n 1n 1u 2u) ac 0.25",
                         "+ ",
                         "R1 in vdd 1k",
                         ".op",
                         ".end",
                     }));
}

TEST(SimulationCards, CrlfAndAnEmptyTitle) {
    MemoryFileSystem fs;
    fs.add("w.cir", "\r\nR1 a 0 1\r\n.end\r\n");
    auto cards = cards_of(fs, "w.cir", {".op", "", 1});
    EXPECT_EQ(cards, (std::vector<std::string>{"untitled deck", "R1 a 0 1", ".op", ".end"}));
}

}  // namespace
}  // namespace deckscale
