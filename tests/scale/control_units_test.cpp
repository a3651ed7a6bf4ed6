// The units control_expression_units finds for the numbers of a .control block's expressions
// (no scaling pass: each number's exponents of Km and Kf, or why it is not known).
#include "scale/control_units.hpp"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "deck/control_script.hpp"
#include "deck/load.hpp"

namespace deckscale {
namespace {

// Each number of the block as "text km kf" (or "text ?" when not known, "text c" for a
// coefficient kept), commands in order.
std::vector<std::string> units_of(const std::string& body, bool other_blocks = false) {
    MemoryFileSystem fs;
    fs.add("c.cir", "t\nV1 in 0 1\nR1 in out 1k\n.control\n" + body + ".endc\n.end\n");
    Deck d = load_deck("c.cir", fs);
    std::vector<std::string> out;
    d.visit_file(0, [&](const Card& c) {
        if (c.kind != CardKind::control) return;
        for (const auto& t : c.tokens) {
            if (t.kind != TokenKind::control) continue;
            std::vector<ControlCommand> commands = control_commands(*c.file, t);
            std::vector<Card> cards;
            for (const auto& cmd : commands) cards.push_back(cmd.as_card(*c.file));
            for (const auto& literals : control_expression_units(cards, other_blocks).by_command)
                for (const auto& l : literals) {
                    std::string s(c.text(l.at));
                    if (!l.exponents)
                        s += " ?";
                    else if (l.coefficient)
                        s += " c";
                    else
                        s += " " + std::to_string(l.exponents->km) + " " +
                             std::to_string(l.exponents->kf);
                    out.push_back(s);
                }
        }
    });
    return out;
}

using V = std::vector<std::string>;

TEST(ControlUnits, SumsAndComparisonsGiveTheOtherSidesUnit) {
    EXPECT_EQ(units_of("let a = time + 1m\n"), (V{"1m 0 -1"}));
    EXPECT_EQ(units_of("let a = frequency - 1k\n"), (V{"1k 0 1"}));
    EXPECT_EQ(units_of("if i(v1) < 2m\nend\n"), (V{"2m -1 0"}));
    EXPECT_EQ(units_of("if vm(out) >= 0.5\nend\n"), (V{"0.5 0 0"}));
    EXPECT_EQ(units_of("while (time[0] gt 3u) or (v(out) lt 1)\nend\n"),
              (V{"0 0 0", "3u 0 -1", "1 0 0"}));
}

TEST(ControlUnits, CoefficientsIndicesAndExponentsArePure) {
    EXPECT_EQ(units_of("let w = 2*pi*frequency\n"), (V{"2 0 0"}));  // beside pi: no note
    EXPECT_EQ(units_of("let h = v(out)/2\n"), (V{"2 c"}));
    EXPECT_EQ(units_of("let p = v(out)^2\nif p > 4\nend\n"), (V{"2 0 0", "4 0 0"}));
    EXPECT_EQ(units_of("let q = i(v1)^2\nif q > 4\nend\n"), (V{"2 0 0", "4 -2 0"}));
    EXPECT_EQ(units_of("let r = 1/time\nif r < 5k\nend\n"), (V{"1 c", "5k 0 1"}));
    EXPECT_EQ(units_of("let l = log10(2)\n"), (V{"2 0 0"}));
}

// A number times or over a quantity takes its unit from what the product meets: in exp(),
// sin() or a comparison; only when nothing tells is it a coefficient. (Binding every such
// number pure at once kept the 1k of sin(2*pi*1k*time), a frequency, as written.)
TEST(ControlUnits, ANumberInAProductTakesItsUnitFromWhatTheProductMeets) {
    EXPECT_EQ(units_of("let d = exp(-time/1m)\n"), (V{"1m 0 -1"}));
    EXPECT_EQ(units_of("let g = exp(frequency*2u)\n"), (V{"2u 0 -1"}));
    // Against another number nothing tells which carries the unit: the coefficient stays and
    // the number compared takes the current's unit (the same branch either way).
    EXPECT_EQ(units_of("if i(v1)*2k > 1\nend\n"), (V{"2k c", "1 -1 0"}));
    EXPECT_EQ(units_of("if i(v1)*2k > v(out)\nend\n"), (V{"2k 1 0"}));
    EXPECT_EQ(units_of("if 2*time > 1m\nend\n"), (V{"2 c", "1m 0 -1"}));
    // Which of 2 and 1k would carry the frequency is not known: refused, not kept.
    EXPECT_EQ(units_of("let s = sin(2*pi*1k*time)\n"), (V{"2 ?", "1k ?"}));
    EXPECT_EQ(units_of("let s = sin(6283*time)\n"), (V{"6283 0 1"}));
}

// A let variable named by another command: `alter dev = var` gives it the unit of what it
// sets; a command that only shows it says nothing; any other reading is not followed.
TEST(ControlUnits, AVariableNamedByAnotherCommand) {
    EXPECT_EQ(units_of("let rval = 500\nwhile rval < 3k\nalter r1 = rval\n"
                       "let rval = rval * 2\nend\n"),
              (V{"500 1 0", "3k 1 0", "2 0 0"}));
    EXPECT_EQ(units_of("let c = 1n\nalter c1 c\n"), (V{"1n -1 -1"}));
    EXPECT_EQ(units_of("let x = 1m\nplot v(out) vs x\n"), (V{"1m 0 0"}));
    EXPECT_EQ(units_of("let x = 1m\nstop when time > x\n"), (V{"1m ?"}));
    EXPECT_EQ(units_of("let x = 1m\nalter r1 = x\nalter c1 = x\n"), (V{"1m ?", "x ?", "x ?"}));
    // A value alter reads whose unit is not known refuses the alter; a number times what is
    // not known here is not known either (before, it was kept as a coefficient, and the alter
    // set the original's value).
    EXPECT_EQ(units_of("let x = deriv(v(out))\nalter c1 = x\n"), (V{"x ?"}));
    EXPECT_EQ(units_of("let x = $v*1m\nalter c1 = x\n"), (V{"1m ?", "x ?"}));
}

// A variable whose unit nothing in its block tells (a counter, a value only shown) keeps its
// numbers; with another .control block in the deck, which may read it (vectors outlive their
// block), they are not known.
TEST(ControlUnits, FreeVariablesAreKeptOnlyInTheDecksOneBlock) {
    EXPECT_EQ(units_of("let t0 = 1m\nlet n = 0\nif time > 2m\nend\n"),
              (V{"1m 0 0", "0 0 0", "2m 0 -1"}));
    EXPECT_EQ(units_of("let t0 = 1m\nlet n = 0\nif time > 2m\nend\n", true),
              (V{"1m ?", "0 ?", "2m 0 -1"}));
}

TEST(ControlUnits, VariablesCarryOneUnitThroughTheBlock) {
    // The use comes after the definition, or before it: the block is read whole.
    EXPECT_EQ(units_of("let t0 = 2m\nif time[1] > t0\nend\n"), (V{"2m 0 -1", "1 0 0"}));
    EXPECT_EQ(units_of("if time[1] > t0\nend\nlet t0 = 2m\n"), (V{"1 0 0", "2m 0 -1"}));
    EXPECT_EQ(units_of("let n = 0\nwhile n < 4\nlet n = n + 1\nend\n"),
              (V{"0 0 0", "4 0 0", "1 0 0"}));
    EXPECT_EQ(units_of("let a = 1m\nlet b = a\nif b > i(v1)\nend\n"), (V{"1m -1 0"}));
    EXPECT_EQ(units_of("let a = 1m\nif a > i(v1)\nend\nif a > time\nend\n"), (V{"1m ?"}));
}

TEST(ControlUnits, WhatIsNotKnownIsSaid) {
    EXPECT_EQ(units_of("let a = out + 1\n"), (V{"1 ?"}));           // a bare node name
    EXPECT_EQ(units_of("let a = @r1[i] - 1m\n"), (V{"1m ?"}));      // a device quantity
    EXPECT_EQ(units_of("let a = 2*3m\nif a < time\nend\n"), (V{"2 ?", "3m ?"}));
    EXPECT_EQ(units_of("let a = 2*3m\nif a < v(out)\nend\n"), (V{"2 0 0", "3m 0 0"}));
    EXPECT_EQ(units_of("let x = 1m\ntran 1u $&x\n"), (V{"1m ?"}));
    EXPECT_EQ(units_of("let x = 1m\necho $&x\n"), (V{"1m 0 0"}));  // shown only
    EXPECT_EQ(units_of("let x = \"a\" + 1\n"), (V{"1 ?"}));
    EXPECT_EQ(units_of("let x = (1 + \n"), (V{"1 ?"}));
    EXPECT_EQ(units_of("let lin-tstart = 1m\n"), (V{}));  // scale_let's own
}

// 10,000 nested parentheses, signs or 'not's are not read (no recursion that could run the
// stack out): the number in them is not known.
TEST(ControlUnits, DeepNestingIsRefusedNotRecursedInto) {
    const std::string deep = std::string(10000, '(') + "1" + std::string(10000, ')');
    EXPECT_EQ(units_of("let a = " + deep + "\n"), (V{"1 ?"}));
    std::string signs;
    for (int i = 0; i < 10000; ++i) signs += "- ";
    EXPECT_EQ(units_of("let a = " + signs + "1\n"), (V{"1 ?"}));
    std::string nots;
    for (int i = 0; i < 10000; ++i) nots += "not ";
    EXPECT_EQ(units_of("if " + nots + "1\nend\n"), (V{"1 ?"}));
    // Shallow nesting is read.
    EXPECT_EQ(units_of("let a = ((((time)))) + ((1m))\n"), (V{"1m 0 -1"}));
}

}  // namespace
}  // namespace deckscale
