// The R, C, L handler (scale/elements) on forms ngspice 39 reads in one order only.
#include <gtest/gtest.h>

#include <string>

#include "support/scale.hpp"

namespace deckscale {
namespace {

// A C or L model name after the value stops ngspice 39 ("unknown parameter (cmod)", tried
// with `ngspice -b`); before the value it is read, and so is an R model after the value.
TEST(Elements, ModelNameOfACapacitorOrInductorComesBeforeItsValue) {
    struct Case {
        int line;
        std::string card;
        std::string out;  // the scaled card; "" when refused
    };
    const Case cases[] = {
        {__LINE__, "C1 a 0 1n cmod", ""},
        {__LINE__, "C1 a 0 c=1n cmod", ""},
        {__LINE__, "L1 a 0 l=1m lmod", ""},
        {__LINE__, "L1 a 0 1m lmod", ""},
        {__LINE__, "C1 a 0 cmod 1n", "C1 a 0 cmod 100f"},
        {__LINE__, "C1 a 0 cmod c=1n", "C1 a 0 cmod c=100f"},
        {__LINE__, "L1 a 0 lmod 1m", "L1 a 0 lmod 10u"},
        {__LINE__, "R1 a 0 1k rmod", "R1 a 0 10k rmod"},
    };
    const std::string models = ".model cmod c(tc1=0)\n.model lmod l(tc1=0)\n.model rmod r(tc1=0)\n";
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "elements_test.cpp:" << c.line << ": " << c.card);
        try {
            auto s = test::scale_text("t\n" + models + c.card + "\n.end\n", 10, 1000);
            EXPECT_EQ(s.text(), "t\n" + models + c.out + "\n.end\n");
        } catch (const DeckError& e) {
            EXPECT_EQ(c.out, "") << render(e.diagnostic());
            EXPECT_NE(render(e.diagnostic())
                          .find("as an unknown parameter and stops; write the model name before "
                                "the value"),
                      std::string::npos)
                << render(e.diagnostic());
        }
    }
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// A POLY dimension that is not a whole number from 1 to 1000 is bad input: POLY(0) with
// coefficients counted degrees forever (found by the deck fuzz target as an int overflow).
TEST(Elements, PolyDimensionOutOfRangeIsBadInput) {
    for (const char* card : {"E1 a 0 POLY(0) b 0 1 2", "E1 a 0 POLY(2147483648) b 0 1 2",
                             "E1 a 0 POLY(1.5) b 0 1 2", "E1 a 0 POLY(-1) b 0 1 2"}) {
        SCOPED_TRACE(card);
        try {
            test::scale_text(std::string("t\n") + card + "\n.end\n", 2, 1);
            ADD_FAILURE() << "not refused";
        } catch (const DeckError& e) {
            EXPECT_NE(render(e.diagnostic()).find("POLY dimension must be a whole number from 1 "
                                                  "to 1000"),
                      std::string::npos)
                << render(e.diagnostic());
        }
    }
}

}  // namespace
}  // namespace deckscale
