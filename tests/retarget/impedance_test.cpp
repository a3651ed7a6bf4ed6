// The impedance level a named part gives: a resistor's value, a T line's Z0, an RF port's z0
// (ngspice 39 manual 4.1.11 and 6.1; a port's 50 Ohm default and its order rule as in
// vsrcpar.c of ngspice-39.3).
#include "retarget/impedance.hpp"

#include <gtest/gtest.h>

#include "deck/load.hpp"

namespace deckscale {
namespace {

NamedImpedance level_of(const std::string& cards, const std::string& name) {
    MemoryFileSystem fs;
    fs.add("d.cir", "d\n" + cards + "R9 x 0 1k\n.end\n");
    return named_impedance(load_deck("d.cir", fs), name);
}

TEST(NamedImpedance, ResistorsLinesAndPortsInEverySpelling) {
    EXPECT_EQ(level_of("R1 a 0 600\n", "r1").ohms, 600);
    EXPECT_EQ(level_of("T1 a 0 b 0 Z0=75 TD=1u\n", "T1").ohms, 75);
    EXPECT_EQ(level_of("T1 a 0 b 0 zo 93 TD=1u\n", "T1").ohms, 93);
    EXPECT_EQ(level_of("V1 a 0 dc 0 ac 1 portnum 1 z0=75\n", "V1").ohms, 75);
    EXPECT_EQ(level_of("V1 a 0 dc 0 ac 1 portnum 1 z0 100\n", "V1").ohms, 100);
    // A port without a positive z0 before its portnum takes 50 Ohm; a later z0 still counts.
    EXPECT_EQ(level_of("V1 a 0 dc 0 ac 1 portnum 1\n", "V1").ohms, 50);
    EXPECT_EQ(level_of("V1 a 0 z0 0 portnum 2\n", "V1").ohms, 50);
    EXPECT_EQ(level_of("V1 a 0 portnum 2 z0 25\n", "V1").ohms, 25);
}

TEST(NamedImpedance, PartsWithoutALevelSayWhy) {
    NamedImpedance plain = level_of("V1 a 0 dc 0 ac 1\n", "V1");
    EXPECT_EQ(plain.ohms, 0);
    EXPECT_NE(plain.problem.find("nor a line or port with a Z0"), std::string::npos) << plain.problem;
    NamedImpedance off = level_of("V1 a 0 dc 0 ac 1 portnum 0\n", "V1");
    EXPECT_EQ(off.ohms, 0);
    NamedImpedance missing = level_of("R1 a 0 1k\n", "R7");
    EXPECT_NE(missing.problem.find("no part named R7"), std::string::npos) << missing.problem;
}

}  // namespace
}  // namespace deckscale
