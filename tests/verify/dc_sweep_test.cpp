// The scaled image of a .dc sweep: the swept item's values times its factor (ngspice 39
// manual 15.3.2: V and I sources, resistors, TEMP), stepped alike by ngspice.
#include "verify/dc_sweep.hpp"

#include <gtest/gtest.h>

#include "deck/sweep_steps.hpp"

namespace deckscale {
namespace {

DcSweep sweep(std::vector<DcLevel> levels) { return DcSweep{std::move(levels)}; }

TEST(DcItem, FactorsAndUnitsByTheSweptItem) {
    const double km = 4;
    EXPECT_EQ(dc_item_factor({"vin", "0", "1", "0.1"}, km), 1);
    EXPECT_EQ(dc_item_factor({"ibias", "0", "1m", "0.1m"}, km), 0.25);
    EXPECT_EQ(dc_item_factor({"rload", "1k", "2k", "100"}, km), 4);
    EXPECT_EQ(dc_item_factor({"temp", "0", "100", "10"}, km), 1);
    EXPECT_FALSE(dc_item_factor({"e1", "0", "1", "0.1"}, km));
    EXPECT_EQ(dc_item_unit({"ibias", "", "", ""}), "A");
    EXPECT_EQ(dc_item_unit({"rload", "", "", ""}), "Ohm");
    EXPECT_EQ(dc_item_unit({"temp", "", "", ""}), "degC");
}

TEST(MapDc, EachLevelByItsOwnFactorWithTheSamePointCount) {
    std::string problem;
    auto m = map_dc(sweep({{"vce", "0", "6", "0.25"}, {"ib", "5u", "25u", "5u"}}), 10, 1e-3, problem);
    ASSERT_TRUE(m) << problem;
    EXPECT_EQ(dc_card(*m), ".dc vce 0 6 0.25 ib 500n 2.5u 500n");
    auto r = map_dc(sweep({{"rl", "1k", "3k", "100"}}), 1.0 / 3, 1e-3, problem);
    ASSERT_TRUE(r) << problem;
    const DcLevel& l = r->levels[0];
    // The model of ngspice's stepping counts the same 21 points as in the original.
    EXPECT_EQ(dc_points(1e3, 3e3, 100).count, 21u);
    EXPECT_EQ(dc_points(ngspice_read(l.start), ngspice_read(l.stop), ngspice_read(l.step))
                  .count,
              21u);
    EXPECT_NEAR(ngspice_read(l.start), 1e3 / 3, 1e-9);
}

TEST(MapDc, AnItemOfNoKnownLawIsAProblem) {
    std::string problem;
    EXPECT_FALSE(map_dc(sweep({{"e1", "0", "1", "0.1"}}), 2, 1e-3, problem));
    EXPECT_NE(problem.find("the .dc sweep of 'e1'"), std::string::npos) << problem;
}

}  // namespace
}  // namespace deckscale
