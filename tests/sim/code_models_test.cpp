// Tests of the decision to initialise ngspice without its code models (sim/code_models.hpp),
// and of decks that need them, simulated by real ngspice.
#include "sim/code_models.hpp"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "sim/simulate.hpp"
#include "support/sim.hpp"

namespace deckscale {
namespace {

TEST(SimCodeModels, OnlyDecksThatCertainlyUseNoneGoWithout) {
    struct Case {
        int line;
        std::vector<std::string> cards;
        bool needed;
    };
    const Case cases[] = {
        {__LINE__, {"rlc", "V1 in 0 AC 1", "R1 in out 1k", "C1 out 0 1n", "L1 out 0 1m", ".end"},
         false},
        {__LINE__, {"semis", "D1 a 0 dmod", ".model dmod D(is=1e-14)", "Q1 c b 0 qn",
                    ".model qn NPN", "M1 d g 0 0 nm", ".MODEL nm nmos level=1", ".end"},
         false},
        {__LINE__, {"xspice", "A1 in out amp", ".model amp gain(gain=2)", ".end"}, true},
        {__LINE__, {"indented", "  a1 in out amp", ".end"}, true},
        {__LINE__, {"digital", "U1 dig 0 in out", ".end"}, true},
        {__LINE__, {"poly", "E1 out 0 POLY(1) in 0 0 2", ".end"}, true},
        {__LINE__, {"poly", "G1 out 0 poly (2) a 0 b 0 0 1 1", ".end"}, true},
        {__LINE__, {"laplace", "E1 out 0 LAPLACE {v(in)} = {1/(1+s)}", ".end"}, true},
        {__LINE__, {"table", "E2 tab 0 TABLE {v(in)} = (-1, -1) (1, 1)", ".end"}, true},
        {__LINE__, {"table", "G2 0 t TABLE {v(a)} = (0 0) (1 1m)", ".end"}, true},
        {__LINE__, {"freq", "G1 out 0 FREQ {v(in)} = (0 0 0) (1k -3 -45)", ".end"}, true},
        {__LINE__, {"model type", "R1 a 0 1k", ".model sw1 aswitch(cntl_off=0)", ".end"}, true},
        {__LINE__, {"model type", ".model f1 filesource(file=\"x\")", ".end"}, true},
        {__LINE__, {"model type", ".model", ".end"}, true},
        // Words that merely contain the keywords, comments and the title are not use.
        {__LINE__, {"POLY title A1", "R1 polyx 0 1k", "* A1 in out amp", "R2 a freqs 1", ".end"},
         false},
    };
    for (const Case& c : cases)
        EXPECT_EQ(needs_code_models(c.cards), c.needed) << "line " << c.line;
}

TEST(SimCodeModels, InitScriptKeepsAllButCodemodelCommands) {
    const std::string spinit =
        "* init file\nalias exit quit\nif $?xspice_enabled\n"
        " codemodel /usr/lib/ngspice/analog.cm\n\tCODEMODEL /x/digital.cm\nend\n"
        "set codemodels_are_words\nunset osdi_enabled";
    EXPECT_EQ(without_code_models(spinit),
              "* init file\nalias exit quit\nif $?xspice_enabled\nend\n"
              "set codemodels_are_words\nunset osdi_enabled");
    EXPECT_EQ(without_code_models(""), "");
}

// ngspice as referee: the POLY source (spice2poly) and the gain block (analog.cm) only work
// with their code models loaded; the operating point is 2 * 1 V + 0.5 V, and 3 * that.
TEST(SimCodeModels, DecksThatUseThemStillSimulate) {
    SimJob job = test::make_job("code models", {"code models", "V1 in 0 DC 1",
                                                "E1 mid 0 POLY(1) in 0 0.5 2", "R1 mid 0 1k",
                                                "A1 mid out amp", ".model amp gain(gain=3)",
                                                "R2 out 0 1k", ".op", ".end"});
    for (SimProcesses how : {SimProcesses::direct, SimProcesses::from_template}) {
        std::vector<SimOutcome> outs = simulate_all({job, job}, 2, how);
        for (const SimOutcome& out : outs) {
            ASSERT_EQ(out.status, SimStatus::ok) << out.message;
            ASSERT_FALSE(out.plots.empty());
            const SimVector* mid = out.plots[0].find("mid");
            const SimVector* v_out = out.plots[0].find("out");
            ASSERT_TRUE(mid && v_out);
            EXPECT_NEAR(mid->values.at(0).real(), 2.5, 1e-9);
            EXPECT_NEAR(v_out->values.at(0).real(), 7.5, 1e-9);
        }
    }
    EXPECT_TRUE(test::no_children_left());
}

}  // namespace
}  // namespace deckscale
