// The parts a yield run varies: R, C and L of the top level with a written number, in every
// field spelling ngspice 39 accepts (manual §2.1.4.1: ',', '(' and ')' separate fields too);
// a value from the deck's top-level parameters is varied too; every other R, C or L is held,
// with the reason.
#include "yield/parts.hpp"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "support/common.hpp"

namespace deckscale {
namespace {

TEST(YieldParts, EverySpellingOfAPartIsVariedAndTheOthersAreHeldWithTheirReason) {
    MemoryFileSystem fs;
    fs.add("d.cir",
           "t\nV1 n0 0 DC 10 AC 1\nR12 (n0 n1) 12k\nR13 n1,0,13k\nC1 n1 0 c=1n\n"
           ".param rp=4.7k\nR14 n1 0 {rp}\nB1 n1 0 i=v(n1)/1k\nR15 n1 0 r={v(n1)*1k}\nXS n1 0 arm\n.subckt arm a b\nR1 a b 1k\n.ends\n"
           ".include parts.inc\n.ac dec 5 1k 1meg\n.end\n");
    fs.add("parts.inc", "L1 n1 0 1m\n");
    Deck deck = load_deck("d.cir", fs);
    PartList parts = find_parts(deck, ToleranceSpec{});
    std::vector<std::string> varied;
    for (const auto& p : parts.parts) varied.push_back(p.name + "=" + std::to_string(p.nominal));
    EXPECT_EQ(varied, (std::vector<std::string>{"r12=12000.000000", "r13=13000.000000",
                                                "c1=0.000000", "r14=4700.000000"}));
    ASSERT_EQ(parts.parts.size(), 4u);
    EXPECT_DOUBLE_EQ(parts.parts[2].nominal, 1e-9);
    std::vector<std::string> held;
    for (const auto& d : parts.held) held.push_back(d.message);
    EXPECT_EQ(held, (std::vector<std::string>{
                        "r15 keeps its value: its value does not evaluate with the deck's "
                        "top-level parameters",
                        "r1 keeps its value: it is inside a subcircuit",
                        "l1 keeps its value: it is in an included file"}));
    EXPECT_TRUE(parts.errors.empty());
}

}  // namespace
}  // namespace deckscale
