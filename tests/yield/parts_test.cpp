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
           ".param rp=4.7k\nR14 n1 0 {rp}\nB1 n1 0 i=v(n1)/1k\nR15 n1 0 r={v(n1)*1k}\nXS n1 0 arm\n"
           ".subckt arm a b\nR1 a b 1k\n.ends\n.include parts.inc\n.ac dec 5 1k 1meg\n.end\n");
    fs.add("parts.inc", "L1 n1 0 1m\n");
    Deck deck = load_deck("d.cir", fs);
    PartList parts = find_parts(deck, ToleranceSpec{});
    std::vector<std::string> varied;
    for (const auto& p : parts.parts) varied.push_back(p.name);
    EXPECT_EQ(varied, (std::vector<std::string>{"r12", "r13", "c1", "r14", "l1"}));
    ASSERT_EQ(parts.parts.size(), 5u);
    EXPECT_DOUBLE_EQ(parts.parts[0].nominal, 12e3);
    EXPECT_DOUBLE_EQ(parts.parts[2].nominal, 1e-9);
    EXPECT_DOUBLE_EQ(parts.parts[3].nominal, 4.7e3);
    EXPECT_DOUBLE_EQ(parts.parts[4].nominal, 1e-3);
    std::vector<std::string> held;
    for (const auto& d : parts.held) held.push_back(d.file + ":" + std::to_string(d.line) + " " + d.message);
    EXPECT_EQ(held, (std::vector<std::string>{
                        "d.cir:9 r15 keeps its value: its value does not evaluate with the "
                        "deck's top-level parameters",
                        "d.cir:12 r1 keeps its value: it is inside a subcircuit"}));
    EXPECT_TRUE(parts.errors.empty());
}

// Of a library file only the section the deck selects is in the circuit (ngspice 39 manual
// §2.8); a file included inside a .subckt has its parts there.
TEST(YieldParts, OnlyTheSelectedLibrarySectionIsInTheCircuit) {
    MemoryFileSystem fs;
    fs.add("d.cir",
           "t\nV1 in 0 AC 1\n.lib 'corners.lib' slow\n.subckt arm a b\n.include arm.inc\n"
           ".ends\nX1 out 0 arm\n.ac dec 5 1k 1meg\n.end\n");
    fs.add("corners.lib",
           "* corners\n.lib fast\nR1 in out 1k\n.endl\n.lib slow\nR2 in out 2k\n.endl slow\n");
    fs.add("arm.inc", "C1 a b 1n\n");
    Deck deck = load_deck("d.cir", fs);
    PartList parts = find_parts(deck, ToleranceSpec{});
    ASSERT_EQ(parts.parts.size(), 1u);
    EXPECT_EQ(parts.parts[0].name, "r2");
    ASSERT_EQ(parts.held.size(), 1u);
    EXPECT_EQ(parts.held[0].message, "c1 keeps its value: it is inside a subcircuit");
}

}  // namespace
}  // namespace deckscale
