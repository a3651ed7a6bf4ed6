// read_expression: one expression's value and the units its numbers end with.
#include "scale/control_expression.hpp"

#include <gtest/gtest.h>

#include <map>
#include <string>

namespace deckscale {
namespace {

TEST(ControlExpression, AComparisonWithTimeMakesTheNumberATime) {
    UnitSlots slots;
    ExpressionRead r = read_expression("v(out)*(time gt 1.1m)", 0, slots, {});
    ASSERT_TRUE(r.readable);
    EXPECT_EQ(r.value.kind, UnitTerm::fixed);  // a voltage times a pure condition
    ASSERT_EQ(r.numbers.size(), 1u);
    EXPECT_EQ(r.numbers[0].first.begin, 16u);
    ExpressionLiteral l;
    slots.resolve(r.numbers[0].second, l);
    ASSERT_TRUE(l.exponents);
    EXPECT_EQ(l.exponents->kf, -1);
}

TEST(ControlExpression, VariablesAreTheirSlotsAndUnknownTextIsNotReadable) {
    UnitSlots slots;
    std::map<std::string, int> vars{{"t0", slots.make(true)}};
    ExpressionRead r = read_expression("$&t0 - 2m", 0, slots, vars);
    ASSERT_TRUE(r.readable);
    EXPECT_EQ(r.value.kind, UnitTerm::slot);
    EXPECT_EQ(slots.find(r.value.s), slots.find(vars["t0"]));
    EXPECT_FALSE(read_expression("1 +", 0, slots, vars).readable);
    EXPECT_FALSE(read_expression("a ? 1 : 2", 0, slots, vars).readable);
}

}  // namespace
}  // namespace deckscale
