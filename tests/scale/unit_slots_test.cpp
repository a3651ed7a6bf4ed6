// The union-find of units behind scale/control_units: binding, uniting, conflicts.
#include "scale/unit_slots.hpp"

#include <gtest/gtest.h>

namespace deckscale {
namespace {

ExpressionLiteral outcome(UnitSlots& u, int s) {
    ExpressionLiteral l;
    u.resolve(s, l);
    return l;
}

TEST(UnitSlots, UnitedSlotsShareOneUnitAndConflictsAreBad) {
    UnitSlots u;
    int a = u.make(), b = u.make(), c = u.make();
    u.unite(a, b);
    u.bind(b, exponents(Unit::second));
    ASSERT_TRUE(outcome(u, a).exponents);
    EXPECT_EQ(outcome(u, a).exponents->kf, -1);
    u.unite(c, a);
    u.bind(c, exponents(Unit::ampere));
    EXPECT_FALSE(outcome(u, a).exponents);
    EXPECT_EQ(outcome(u, b).why, "it meets quantities of two units (s and A)");
}

TEST(UnitSlots, AProductOfNumbersKeepsOnlyAPureUnit) {
    UnitSlots u;
    int p = u.make(), q = u.make();
    u.mark_product(p);
    u.bind(p, kPureNumber);
    EXPECT_TRUE(outcome(u, p).exponents);
    u.mark_product(q);
    u.bind(q, exponents(Unit::hertz));
    EXPECT_FALSE(outcome(u, q).exponents);
}

TEST(UnitSlots, FreeVariablesAndSlotsMetThroughAProduct) {
    UnitSlots u;
    int v = u.make(true), n = u.make(), m = u.make(true);
    EXPECT_TRUE(u.free_variable(v));
    EXPECT_FALSE(u.free_variable(n));  // a number alone is no variable
    u.met(m, "met");
    u.resolve_met();
    EXPECT_EQ(outcome(u, m).why, "met");
    EXPECT_FALSE(u.free_variable(m));  // bad, not free
    EXPECT_EQ(unit_text(kPureNumber), "volts or pure numbers");
    EXPECT_EQ(unit_text({2, 3}), "Km^2 Kf^3");
}

}  // namespace
}  // namespace deckscale
