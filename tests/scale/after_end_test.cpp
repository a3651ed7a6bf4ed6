// Cards after .end (scale/after_end).
#include <gtest/gtest.h>

#include <string>

#include "support/scale.hpp"

namespace deckscale {
namespace {

// The ngspice 39 program reads cards after .end (tried: `R9 1 0 5` after `.end` changed the
// operating point), so such a card is refused; blank and comment lines there are fine.
TEST(AfterEnd, CardsAfterEndAreRefused) {
    struct Case {
        int line;
        std::string after;
        std::string rendered;  // "" when nothing is refused
    };
    const Case cases[] = {
        {__LINE__, "", ""},
        {__LINE__, "\n\n* notes\n  ; more\n// and more\n", ""},
        {__LINE__, "R9 1 0 5\n",
         "deck.cir:4:1: error: card after .end: the ngspice 39 program reads it as part of the "
         "circuit, and it would stay unscaled; move it before .end or delete it\n"
         "  R9 1 0 5\n  ^~~~~~~~\n"},
        {__LINE__, "* notes\r\n\tthis text is read too \r\n",
         "deck.cir:5:2: error: card after .end: the ngspice 39 program reads it as part of the "
         "circuit, and it would stay unscaled; move it before .end or delete it\n"
         "  \tthis text is read too \n  \t^~~~~~~~~~~~~~~~~~~~~\n"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "after_end_test.cpp:" << c.line);
        auto s = test::scale_text("t\nV1 1 0 1\n.end\n" + c.after, 10, 1000);
        EXPECT_EQ(render(s.result.unscalable), c.rendered);
    }
}

}  // namespace
}  // namespace deckscale
