// Where element lines name their current-carrying nodes, model and subcircuit (ngspice 39
// manual element syntax), as holding parts reads them.
#include "scale/terminals.hpp"

#include <gtest/gtest.h>

#include <set>

#include "deck/card_reader.hpp"

namespace deckscale {
namespace {

TEST(TerminalsTest, NodesModelAndSubckt) {
    struct Row {
        int line;
        std::string card;
        std::string nodes, model, subckt;  // nodes joined by blanks
    };
    const Row rows[] = {
        {__LINE__, "R1 a b 1k", "a b", "", ""},
        {__LINE__, "R1 a b rm l=1u", "a b", "rm", ""},
        {__LINE__, "C1 a b 1n cm", "a b", "cm", ""},
        {__LINE__, "V1 a 0 dc 1", "", "", ""},       // ideal: never a boundary
        {__LINE__, "E1 o 0 a b 2", "", "", ""},      // ideal output, sensing input
        {__LINE__, "G1 o 0 a b 1m", "o 0", "", ""},  // only the output
        {__LINE__, "F1 o 0 V1 2", "o 0", "", ""},
        {__LINE__, "I1 a 0 PULSE(0 1 0)", "a 0", "", ""},
        {__LINE__, "D1 a k dm area=2", "a k", "dm", ""},
        {__LINE__, "Q1 c b e qm", "c b e", "qm", ""},
        {__LINE__, "Q1 c b e s qm 2", "c b e s", "qm", ""},  // a substrate node
        {__LINE__, "M1 d g s b nm w=1u", "d g s b", "nm", ""},
        {__LINE__, "J1 d g s jm", "d g s", "jm", ""},
        {__LINE__, "S1 a b c d sm", "a b", "sm", ""},
        {__LINE__, "W1 a b V1 wm", "a b", "wm", ""},
        {__LINE__, "T1 a 0 b 0 z0=50 td=1n", "a 0 b 0", "", ""},
        {__LINE__, "O1 a 0 b 0 lm", "a 0 b 0", "lm", ""},
        {__LINE__, "U1 a b 0 um l=1m", "a b 0", "um", ""},
        {__LINE__, "X1 a b amp", "a b", "", "amp"},
        {__LINE__, "X1 a b amp params: g=2", "a b", "", "amp"},
        {__LINE__, "X1 a b amp g={2*k}", "a b", "", "amp"},
        {__LINE__, "A1 [a b] y am", "", "am", ""},
    };
    const std::set<std::string> models = {"rm", "cm", "dm", "qm", "nm", "jm",
                                          "sm", "wm", "lm", "um", "am"};
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << r.line);
        SourceFile f("t.cir", "t\n" + r.card + "\n.end\n");
        bool seen = false;
        read_cards(f, FileRole::deck, [&](const Card& c) {
            if (c.kind != CardKind::element) return;
            seen = true;
            ElementLinks l =
                element_links(c, [&](const std::string& n) { return models.count(n) > 0; });
            std::string nodes;
            for (std::size_t i : l.current_nodes)
                nodes += (nodes.empty() ? "" : " ") + std::string(c.field_text(i));
            EXPECT_EQ(nodes, r.nodes);
            EXPECT_EQ(l.model ? std::string(c.field_text(*l.model)) : "", r.model);
            EXPECT_EQ(l.subckt ? std::string(c.field_text(*l.subckt)) : "", r.subckt);
        });
        EXPECT_TRUE(seen);
    }
    // ngspice 39 reads "gnd" as node 0 (tried: V1 a gnd 1, R2 gnd b 1k, V2 b 0 2 gives 2 mA
    // in V2 and no node named gnd).
    EXPECT_TRUE(is_ground("0"));
    EXPECT_TRUE(is_ground("gnd"));
    EXPECT_FALSE(is_ground("a"));
}

}  // namespace
}  // namespace deckscale
