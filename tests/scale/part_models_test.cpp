// Tests of the notes at .subckts that hold semiconductor devices (scale/part_models.hpp):
// where they appear, where they do not, and that holding the .subckt silences them.
#include <gtest/gtest.h>

#include "scale/part_models.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

// The notes of a scaled deck that name a .subckt as a possible part model.
std::vector<std::string> part_notes(const std::string& deck, double km, double kf,
                                    std::vector<std::string> hold = {},
                                    const std::map<std::string, std::string>& files = {}) {
    ScaleSettings s;
    s.factors = {km, kf};
    s.hold = std::move(hold);
    std::vector<std::string> out;
    for (const auto& d : test::scale_with(deck, s, files).result.notes)
        if (d.message.find("holds semiconductor devices") != std::string::npos)
            out.push_back(d.message.substr(0, d.message.find(" and is scaled")) + " @" +
                          std::to_string(d.line));
    return out;
}

// An invented buffer macro-model: a differential pair, a diode clamp and an output resistor.
const std::string kBuffer =
    ".subckt buf1 inp inn out vcc vee\n"
    "q1 c1 inp e bjt\nq2 c2 inn e bjt\nie e vee 100u\nrc1 vcc c1 10k\nrc2 vcc c2 10k\n"
    "e1 o 0 c1 c2 100\nro o out 50\nd1 out vcc dclamp\n"
    ".model bjt npn(bf=100)\n.model dclamp d(is=1e-14)\n"
    ".ends buf1\n";

TEST(PartModelsTest, SubcktWithSemiconductorsCalledFromTheTopLevelGetsANote) {
    const std::string deck = "t\n" + kBuffer +
                             "v1 a 0 dc 0 ac 1\nvp vcc 0 5\nvn vee 0 -5\n"
                             "x1 a out out vcc vee buf1\nrl out 0 1k\n.end\n";
    EXPECT_EQ(part_notes(deck, 2, 5),
              std::vector<std::string>{"'buf1' holds semiconductor devices (q1, q2, d1) @2"});
    // Only Km, or only Kf, moves the part as well.
    EXPECT_EQ(part_notes(deck, 2, 1).size(), 1u);
    EXPECT_EQ(part_notes(deck, 1, 5).size(), 1u);
    // Factors of one change nothing.
    EXPECT_TRUE(part_notes(deck, 1, 1).empty());
    // Held, by its X line or by name: the .subckt is kept as written, no note.
    EXPECT_TRUE(part_notes(deck, 2, 5, {"x1"}).empty());
    EXPECT_TRUE(part_notes(deck, 2, 5, {"subckt:buf1"}).empty());
    // Also when other semiconductors of the deck are scaled.
    const std::string with_diode =
        "t\n" + kBuffer +
        "v1 a 0 dc 0 ac 1\nvp vcc 0 5\nvn vee 0 -5\nd7 a 0 dz\n.model dz d\n"
        ".subckt unity p o\ne1 o 0 p 0 1\n.ends\nx2 a o2 unity\nr2 o2 0 1k\n"
        "x1 a out out vcc vee buf1\nrl out 0 1k\n.end\n";
    EXPECT_EQ(part_notes(with_diode, 2, 5).size(), 1u);
    EXPECT_TRUE(part_notes(with_diode, 2, 5, {"subckt:buf1"}).empty());
}

TEST(PartModelsTest, NoNoteWithoutSemiconductorsOrWithoutACall) {
    // An ideal op amp of controlled sources is not a part's model.
    EXPECT_TRUE(part_notes("t\n.subckt ideal p n o\ne1 o 0 p n 1e6\n.ends\nv1 a 0 ac 1\n"
                           "x1 a o o ideal\nr1 o 0 1k\n.end\n",
                           2, 5)
                    .empty());
    // A model defined but never called.
    EXPECT_TRUE(part_notes("t\n" + kBuffer + "v1 a 0 ac 1\nr1 a 0 1k\nd9 a 0 dz\n"
                           ".model dz d(is=1e-14)\nx9 a 0 other\n.subckt other p n\nr1 p n 1\n"
                           ".ends\n.end\n",
                           2, 5)
                    .empty());
}

TEST(PartModelsTest, TheOutermostSubcktOfAChainIsNamed) {
    // 'amp' calls 'stage', which holds the transistor: the note is at 'amp' (what the deck
    // calls), not at 'stage' (called only from inside the part).
    const std::string deck =
        "t\n.subckt stage i o\nq1 o i 0 n1\nr1 o 0 1k\n.model n1 npn\n.ends\n"
        ".subckt amp i o\nx1 i m stage\nx2 m o stage\n.ends\n"
        "v1 a 0 dc 0.7 ac 1\nxa a out amp\nrl out 0 1k\n.end\n";
    EXPECT_EQ(part_notes(deck, 10, 1), std::vector<std::string>{
                                           "'amp' holds semiconductor devices (through the "
                                           ".subckts it calls) @7"});
}

TEST(PartModelsTest, CallsThatLoopEndAndLocalDefinitionsStayInside) {
    // A .subckt that calls itself (ngspice would refuse it at run time) does not loop here.
    const std::string loop = "t\n.subckt s a\nx1 a s\nd1 a 0 dd\n.ends\n.model dd d\nv1 a 0 1\n"
                             "xs a s\n.end\n";
    EXPECT_EQ(part_notes(loop, 2, 1).size(), 1u);
    // A .subckt defined inside another is local to it: its name is not looked up outside.
    const std::string local = "t\n.subckt outer a\n.subckt inner b\nd1 b 0 dd\n.ends\n"
                              "x1 a inner\n.ends\n.model dd d\nv1 a 0 1\nxo a outer\n.end\n";
    EXPECT_EQ(part_notes(local, 2, 1),
              std::vector<std::string>{"'outer' holds semiconductor devices (d1) @2"});
}

// A file included inside a .subckt is part of its body, as ngspice reads it: its devices
// count for that .subckt, and a .subckt defined in it is local to it.
TEST(PartModelsTest, AFileIncludedInsideASubcktCountsForIt) {
    const std::string deck = "t\n.subckt amp i o\n.include amp_body.inc\n.ends amp\n"
                             "v1 a 0 dc 0.7 ac 1\nxa a out amp\nrl out 0 1k\n.end\n";
    const std::map<std::string, std::string> flat = {
        {"amp_body.inc", "q1 o i 0 n1\nr1 o 0 1k\n.model n1 npn\n"}};
    EXPECT_EQ(part_notes(deck, 10, 1, {}, flat),
              std::vector<std::string>{"'amp' holds semiconductor devices (q1) @2"});
    EXPECT_TRUE(part_notes(deck, 10, 1, {"subckt:amp"}, flat).empty());
    const std::map<std::string, std::string> nested = {
        {"amp_body.inc", ".include stage.inc\nx1 i o stage\n"},
        {"stage.inc", ".subckt stage p q\nd1 p q dd\n.model dd d\n.ends\n"}};
    EXPECT_EQ(part_notes(deck, 10, 1, {}, nested),
              std::vector<std::string>{"'amp' holds semiconductor devices (d1) @2"});
}

}  // namespace
}  // namespace deckscale
