// Names ngspice 39's parameter evaluator does not know (scale/numparam_names).
#include <gtest/gtest.h>

#include <string>

#include "support/scale.hpp"

namespace deckscale {
namespace {

// `pi` stops ngspice 39 in a .param or {…} value ("Undefined parameter [pi]", tried with
// `ngspice -b`), so the deck is refused with that reason, unless it defines pi itself.
TEST(NumparamNames, PiIsRefusedUnlessTheDeckDefinesIt) {
    struct Case {
        int line;
        std::string cards;
        std::string rendered;
    };
    const Case cases[] = {
        {__LINE__, ".param fc=1k c={1/(2*pi*fc*1k)}\n",
         "deck.cir:2:16: error: 'pi' is not known to ngspice 39 in .param and {...} expressions "
         "(it "
         "stops with \"Undefined parameter [pi]\"); write the number or define .param pi=...\n"
         "  .param fc=1k c={1/(2*pi*fc*1k)}\n                 ^~~~~~~~~~~~~~~~\n"},
        {__LINE__, "C1 a 0 {1/(2*PI*1k*1k)}\n",
         "deck.cir:2:8: error: 'pi' is not known to ngspice 39 in .param and {...} expressions (it "
         "stops with \"Undefined parameter [pi]\"); write the number or define .param pi=...\n"
         "  C1 a 0 {1/(2*PI*1k*1k)}\n         ^~~~~~~~~~~~~~~~\n"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "numparam_names_test.cpp:" << c.line);
        try {
            test::scale_text("t\n" + c.cards + ".end\n", 10, 1000);
            ADD_FAILURE() << "not refused";
        } catch (const DeckError& e) {
            EXPECT_EQ(render(e.diagnostic()), c.rendered);
        }
    }
    // A deck that defines pi itself is read by ngspice 39 (tried) and scaled.
    auto s = test::scale_text("t\n.param pi=3.14159265358979\nC1 a 0 {1/(2*pi*1k)}\n.end\n", 10, 1);
    EXPECT_EQ(s.text(), "t\n.param pi=3.14159265358979\nC1 a 0 {(1/(2*pi*1k))/10}\n.end\n");
}

// Run-time expressions know pi: B sources are not checked (ngspice 39 manual 5.1).
TEST(NumparamNames, RunTimeExpressionsMayUsePi) {
    auto s = test::scale_text("t\nB1 a 0 V=sin(2*pi*1k*time)\n.end\n", 1, 1000);
    EXPECT_EQ(s.text(), "t\nB1 a 0 V=sin(2*pi*1k*(time*1000))\n.end\n");
}

}  // namespace
}  // namespace deckscale
