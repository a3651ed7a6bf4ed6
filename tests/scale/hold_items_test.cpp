// The items of scale --hold (prefixes, wildcards) and the held-parts line written after a
// scaled deck's title, read back as verify reads it.
#include "scale/hold_items.hpp"

#include <gtest/gtest.h>

#include "base/file_system.hpp"

namespace deckscale {
namespace {

TEST(HoldItemsTest, ItemsAndTheHeldLine) {
    std::string error;
    auto items = read_hold_items({"XU1,model:QN*", "subckt:opa"}, error);
    ASSERT_TRUE(items) << error;
    ASSERT_EQ(items->size(), 3u);
    EXPECT_EQ((*items)[1].kind, HoldKind::model);
    EXPECT_EQ((*items)[1].pattern, "qn*");
    EXPECT_EQ((*items)[2].kind, HoldKind::subckt);
    EXPECT_FALSE(read_hold_items({"part:X1"}, error));
    EXPECT_EQ(error,
              "--hold 'part:X1': the prefixes are model: and subckt: (a bare name is an element "
              "or X instance, else a .subckt, else a .model)");
    EXPECT_FALSE(read_hold_items({"X1,,X2"}, error));
    EXPECT_FALSE(read_hold_items({"model:"}, error));

    EXPECT_TRUE(name_matches("x*", "xu1"));
    EXPECT_TRUE(name_matches("q?", "q1"));
    EXPECT_FALSE(name_matches("q?", "q10"));
    EXPECT_TRUE(name_matches("*1*", "xu1a"));
    EXPECT_FALSE(name_matches("x*2", "xu21x"));

    MemoryFileSystem fs;
    fs.add("deck.cir", "t\r\n" + held_line({"XU1", "model:qn"}, {0.5, 2 * 3.141592653589793}) +
                           "\r\nR1 a 0 1\r\n.end\r\n");
    Deck d = load_deck("deck.cir", fs);
    auto line = find_held_line(d);
    ASSERT_TRUE(line);
    EXPECT_EQ(line->items, (std::vector<std::string>{"XU1", "model:qn"}));
    EXPECT_EQ(line->factors.km, 0.5);
    EXPECT_EQ(line->factors.kf, 2 * 3.141592653589793);
    fs.add("plain.cir", "t\n* a comment\nR1 a 0 1\n* deckscale held: km=1 kf=2 items=R1\n.end\n");
    EXPECT_FALSE(find_held_line(load_deck("plain.cir", fs)));
}

}  // namespace
}  // namespace deckscale
