// The tolerances verify adds to both runs of a deck with junction devices: RELTOL 1e-7,
// ABSTOL and CHGTOL in proportion to the deck's own currents and charges (ngspice 39 manual
// §15.1.1 for their meaning; shared notes "scaling-rules.md" §7).
#include "verify/tight_tolerances.hpp"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "deck/load.hpp"
#include "verify/sim_cards.hpp"

namespace deckscale {
namespace {

TEST(TightTolerances, ScaledInProportionToTheDeck) {
    struct Row {
        int line;
        ScaleFactors factors;
        std::string card;
    };
    const Row rows[] = {
        {__LINE__, {1, 1}, ".options reltol=1e-07 abstol=1e-15 vntol=1e-09 chgtol=1e-17"},
        {__LINE__, {10, 1000}, ".options reltol=1e-07 abstol=1e-16 vntol=1e-09 chgtol=1e-21"},
        {__LINE__, {0.5, 4}, ".options reltol=1e-07 abstol=2e-15 vntol=1e-09 chgtol=5e-18"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "tight_tolerances_test.cpp:" << r.line);
        EXPECT_EQ(tight_options_card(r.factors), r.card);
    }
}

TEST(TightTolerances, OnlyDecksWithJunctionDevicesGetThem) {
    struct Row {
        int line;
        std::string deck;
        bool junctions;
    };
    const Row rows[] = {
        {__LINE__, "t\nR1 a 0 1k\n.end\n", false},
        {__LINE__, "t\n.include d.inc\n.end\n", true},  // the diode is in the include
        {__LINE__, "t\nQ1 c b 0 qm\n.model qm npn\n.end\n", true},
        {__LINE__, "t\nm1 d g 0 0 nm\n.model nm nmos\n.end\n", true},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "tight_tolerances_test.cpp:" << r.line);
        MemoryFileSystem fs;
        fs.add("t.cir", r.deck);
        fs.add("d.inc", "D1 a 0 dm\n.model dm d\n");
        Deck d = load_deck("t.cir", fs);
        EXPECT_EQ(has_junction_devices(d), r.junctions);
        SimDeckOptions o{".op", "", 1, ScaleFactors{10, 1}};
        auto cards = simulation_cards(d, o);
        ASSERT_GE(cards.size(), 3u);
        EXPECT_EQ(cards[cards.size() - 3] == tight_options_card({10, 1}), r.junctions);
        o.tight_tolerances.reset();  // not asked for: the deck's own tolerances
        cards = simulation_cards(d, o);
        EXPECT_NE(cards[cards.size() - 3], tight_options_card({10, 1}));
    }
}

}  // namespace
}  // namespace deckscale
