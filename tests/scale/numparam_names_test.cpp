// Names ngspice 39's parameter evaluator does not know (scale/numparam_names).
#include <gtest/gtest.h>

#include <optional>
#include <string>
#include <utility>

#include "scale/numparam_names.hpp"
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

// Numbers the parameter evaluator stops on ("Formula() error", tried with '.param x=1k5',
// '.param x={1d3}' and ".param x='2n2*2'"): a digit after the letters that follow a number.
TEST(NumparamNames, NumbersTheEvaluatorCannotReadAreFound) {
    const std::pair<const char*, const char*> found[] = {
        {"1k5", "1k5"}, {"1d3", "1d3"}, {"2n2*2", "2n2"}, {"a+4u7/b", "4u7"}, {".5m1", ".5m1"},
        {"1e3*2k2", "2k2"}};
    for (const auto& [expr, number] : found)
        EXPECT_EQ(fatal_numparam_number(expr), std::optional<std::string>(number)) << expr;
    // Exponents, suffixes with letters after them, hexadecimal and names with digits are fine.
    for (const char* expr : {"1e3", "2.5e-3k", "1meg", "1kOhm", "10uF", "0x10", "r1*c2", "x_2k5",
                             "1e+3*v2", "(1)*2"})
        EXPECT_EQ(fatal_numparam_number(expr), std::nullopt) << expr;
}

TEST(NumparamNames, ADeckWithSuchANumberIsRefused) {
    for (const char* cards : {".param x=1k5\nR1 a 0 {x}\n", ".param x={1d3}\nR1 a 0 {x}\n",
                              "R1 a 0 {2n2*2}\n"}) {
        SCOPED_TRACE(cards);
        try {
            test::scale_text(std::string("t\n") + cards + ".end\n", 10, 1);
            ADD_FAILURE() << "not refused";
        } catch (const DeckError& e) {
            EXPECT_NE(e.diagnostic().message.find("it stops with \"Formula() error\""),
                      std::string::npos)
                << e.diagnostic().message;
        }
    }
}

}  // namespace
}  // namespace deckscale
