// Tests of scaling with held parts (scale/hold_plan, scale/hold_pass): held elements, models
// and .subckt bodies stay as written; a .subckt or .model used by held and scaled parts gets a
// scaled copy that only the scaled parts point at (nested .subckt calls and include files
// too, shared notes "scaling-rules.md" §5); factors of 1 give the deck back byte for byte.
#include <gtest/gtest.h>

#include <random>
#include <sstream>

#include "support/common.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

struct Held {
    std::vector<std::string> texts;
    ScaleResult result;
    const std::string& text() const { return texts.front(); }
};

Held scale_holding(const std::string& deck, double km, double kf,
                   const std::vector<std::string>& hold,
                   const std::map<std::string, std::string>& extra = {}) {
    MemoryFileSystem fs;
    fs.add("deck.cir", deck);
    for (const auto& [path, text] : extra) fs.add(path, text);
    ScaleSettings s;
    s.factors = {km, kf};
    s.digits = 7;
    s.hold = hold;
    ScaledDeck d = load_and_scale("deck.cir", fs, s);
    Held out;
    out.result = std::move(d.result);
    for (std::size_t i = 0; i < d.deck.files.size(); ++i)
        out.texts.push_back(apply_edits(d.deck.files[i].source->text(), out.result.edits[i]));
    return out;
}

TEST(HoldPassTest, HeldElementsStayAsWritten) {
    Held h = scale_holding("t\nR1 a 0 1k\nR2 a b 2k\nC1 b 0 1n\n.end\n", 10, 100, {"R2"});
    EXPECT_EQ(h.text(),
              "t\n* deckscale held: km=10 kf=100 items=R2\nR1 a 0 10k\nR2 a b 2k\n"
              "C1 b 0 1p\n.end\n");
    ASSERT_EQ(h.result.held.size(), 1u);
    EXPECT_EQ(h.result.held[0].kind, "element");
    EXPECT_EQ(h.result.held[0].name, "R2");
    EXPECT_EQ(h.result.held[0].why, "asked: --hold R2");
    EXPECT_TRUE(h.result.unscalable.empty());
}

// A .subckt used by a held and a scaled X line: as written for the held one, a scaled copy
// after its .ends for the other, which alone points at it.
TEST(HoldPassTest, SharedSubcktIsCopiedForTheScaledInstances) {
    Held h = scale_holding(
        "t\nX1 a b filt\nX2 c d filt\n.subckt filt in out\nR1 in out 1k\nC1 out 0 1n\n"
        ".ends filt\n.end\n",
        10, 100, {"X1"});
    EXPECT_EQ(h.text(),
              "t\n* deckscale held: km=10 kf=100 items=X1\nX1 a b filt\nX2 c d filt_scaled\n"
              ".subckt filt in out\nR1 in out 1k\nC1 out 0 1n\n.ends filt\n"
              ".subckt filt_scaled in out\nR1 in out 10k\nC1 out 0 1p\n.ends filt_scaled\n"
              ".end\n");
    ASSERT_EQ(h.result.held.size(), 2u);
    EXPECT_EQ(h.result.held[0].kind, "instance");
    EXPECT_EQ(h.result.held[1].kind, "subckt");
    EXPECT_EQ(h.result.held[1].name, "filt");
    EXPECT_EQ(h.result.held[1].why, "used by held parts: X1");
    EXPECT_EQ(h.result.held[1].copy, "filt_scaled");
}

// A .subckt whose X lines are all held keeps its body; the copy is not made.
TEST(HoldPassTest, SubcktUsedOnlyByHeldPartsStaysAsWritten) {
    const std::string deck =
        "t\nX1 a b filt\nR9 b 0 1k\n.subckt filt in out\nR1 in out 1k\nC1 out 0 1n\n.ends\n.end\n";
    Held h = scale_holding(deck, 10, 100, {"X1"});
    EXPECT_EQ(h.text(),
              "t\n* deckscale held: km=10 kf=100 items=X1\nX1 a b filt\nR9 b 0 10k\n"
              ".subckt filt in out\nR1 in out 1k\nC1 out 0 1n\n.ends\n.end\n");
    // subckt:NAME holds every instance, and the body with them.
    Held by_name = scale_holding(deck, 10, 100, {"subckt:filt"});
    EXPECT_EQ(by_name.texts[0].substr(by_name.texts[0].find("\nX1 ")),
              h.text().substr(h.text().find("\nX1 ")));
    ASSERT_EQ(by_name.result.held.size(), 1u);
    EXPECT_EQ(by_name.result.held[0].why, "asked: --hold subckt:filt; every instance (X1)");
}

// Nested calls: outer calls inner; both are copied, and the copy of outer calls the copy of
// inner, while the held instance's outer still calls the inner as written.
TEST(HoldPassTest, NestedSubcktsAreCopiedTogether) {
    Held h = scale_holding(
        "t\nX1 a outer\nX2 b outer\n.subckt outer p\nXin p inner\nC1 p 0 1n\n.ends outer\n"
        ".subckt inner q\nR1 q 0 1k\n.ends inner\n.end\n",
        10, 100, {"X1"});
    EXPECT_EQ(h.text(),
              "t\n* deckscale held: km=10 kf=100 items=X1\nX1 a outer\nX2 b outer_scaled\n"
              ".subckt outer p\nXin p inner\nC1 p 0 1n\n.ends outer\n"
              ".subckt outer_scaled p\nXin p inner_scaled\nC1 p 0 1p\n.ends outer_scaled\n"
              ".subckt inner q\nR1 q 0 1k\n.ends inner\n"
              ".subckt inner_scaled q\nR1 q 0 10k\n.ends inner_scaled\n.end\n");
    ASSERT_EQ(h.result.held.size(), 3u);
    EXPECT_EQ(h.result.held[2].name, "inner");
    EXPECT_EQ(h.result.held[2].why, "used by held parts: Xin inside .subckt outer");
}

// A .subckt defined inside another is local to it: it goes with its parent's copy under its
// own name, and a .model inside a copied body keeps its name too.
TEST(HoldPassTest, LocalDefinitionsTravelWithTheCopy) {
    Held h = scale_holding(
        "t\nX1 a outer\nX2 b outer\n.subckt outer p\nXin p inner\n.subckt inner q\n"
        "D1 q 0 dl\n.model dl d cjo=1p\n.ends inner\n.ends outer\n.end\n",
        1, 100, {"X1"});
    EXPECT_EQ(h.text(),
              "t\n* deckscale held: km=1 kf=100 items=X1\nX1 a outer\nX2 b outer_scaled\n"
              ".subckt outer p\nXin p inner\n.subckt inner q\nD1 q 0 dl\n.model dl d cjo=1p\n"
              ".ends inner\n.ends outer\n"
              ".subckt outer_scaled p\nXin p inner\n.subckt inner q\nD1 q 0 dl\n"
              ".model dl d cjo=10f\n.ends inner\n.ends outer_scaled\n.end\n");
}

// A .subckt in an included file: the file itself is never edited; its rewritten copy holds
// the original definition and the scaled copy.
TEST(HoldPassTest, SubcktInAnIncludeIsCopiedInTheIncludesCopy) {
    const std::string lib = ".subckt amp in out\nR1 in out 1k\nC1 out 0 1n\n.ends amp\n";
    Held h = scale_holding("t\n.include amp.lib\nXA a b amp\nXB c d amp\n.end\n", 10, 100, {"XA"},
                           {{"amp.lib", lib}});
    EXPECT_EQ(h.texts[0],
              "t\n* deckscale held: km=10 kf=100 items=XA\n.include amp.lib\nXA a b amp\n"
              "XB c d amp_scaled\n.end\n");
    EXPECT_EQ(h.texts[1], lib +
                              ".subckt amp_scaled in out\nR1 in out 10k\nC1 out 0 1p\n"
                              ".ends amp_scaled\n");
}

// A file included inside a .subckt is part of its body (ngspice reads an include in place):
// holding the .subckt keeps the file as written; its cards are not scaled as top-level ones.
TEST(HoldPassTest, AFileIncludedInsideAHeldSubcktStaysAsWritten) {
    const std::string body = "Rb in mid 100\nD1 mid out dm\nCb out 0 10p\n.model dm d cjo=2p\n";
    const std::string deck =
        "t\n.subckt buf in out\n.include body.inc\n.ends buf\nR1 a b 1k\nX1 b c buf\n"
        "C1 c 0 1n\n.end\n";
    Held h = scale_holding(deck, 10, 100, {"subckt:buf"}, {{"body.inc", body}});
    EXPECT_TRUE(h.result.unscalable.empty());
    EXPECT_EQ(h.texts[1], body);
    EXPECT_TRUE(h.result.edits[1].empty());
    EXPECT_EQ(h.text(),
              "t\n* deckscale held: km=10 kf=100 items=subckt:buf\n.subckt buf in out\n"
              ".include body.inc\n.ends buf\nR1 a b 10k\nX1 b c buf\nC1 c 0 1p\n.end\n");
    // Two levels down, and held through its X line: the same.
    Held deeper = scale_holding(deck, 10, 100, {"X1"},
                                {{"body.inc", ".include more.inc\n"}, {"more.inc", body}});
    EXPECT_TRUE(deeper.result.unscalable.empty());
    EXPECT_EQ(deeper.texts[2], body);
    // Its elements are inside the .subckt, not top-level parts to hold by name.
    EXPECT_THROW(scale_holding(deck, 10, 100, {"Rb"}, {{"body.inc", body}}), DeckError);
    // Not held: scaled with the rest.
    Held scaled = scale_holding(deck, 10, 100, {"R1"}, {{"body.inc", body}});
    EXPECT_EQ(scaled.texts[1],
              "Rb in mid 1000\nD1 mid out dm m=0.1\nCb out 0 10f\n.model dm d cjo=20f\n");
}

// What cannot be both held and scaled is refused at the include card: the body of a .subckt
// used by held and scaled parts (its scaled copy would read the same file), and a file
// included inside a held .subckt and at the top level too.
TEST(HoldPassTest, AnIncludeThatCannotStayAsWrittenIsRefused) {
    const std::map<std::string, std::string> files = {{"body.inc", "Rb in out 100\n"}};
    struct Case {
        std::string deck, hold, reason;
    };
    for (const Case& c :
         {Case{"t\n.subckt buf in out\n.include body.inc\n.ends buf\nX1 a b buf\nX2 b c buf\n"
               ".end\n",
               "X1", "hold every instance of buf or none"},
          Case{"t\n.subckt buf in out\n.include body.inc\n.ends buf\n.include body.inc\n"
               "X1 a b buf\n.end\n",
               "subckt:buf", "included elsewhere too"}}) {
        Held h = scale_holding(c.deck, 10, 100, {c.hold}, files);
        ASSERT_EQ(h.result.unscalable.size(), 1u) << c.hold;
        EXPECT_EQ(h.result.unscalable[0].line, 3u);
        EXPECT_NE(h.result.unscalable[0].message.find(c.reason), std::string::npos);
    }
}

// A model shared by a held and a scaled transistor: the scaled one gets a copy with its
// charges divided by Kf; with Kf = 1 the card does not change, so no copy is needed.
TEST(HoldPassTest, SharedModelIsCopiedOnlyWhenScalingChangesIt) {
    const std::string deck =
        "t\nQ1 c b e qm\nQ2 c2 b2 e2 qm\n.model qm npn (bf=100 cje=1p tf=100p)\n.end\n";
    Held h = scale_holding(deck, 10, 1000, {"Q1"});
    EXPECT_EQ(h.text(),
              "t\n* deckscale held: km=10 kf=1000 items=Q1\nQ1 c b e qm\n"
              "Q2 c2 b2 e2 qm_scaled m=0.1\n.model qm npn (bf=100 cje=1p tf=100p)\n"
              ".model qm_scaled npn (bf=100 cje=1f tf=100f)\n.end\n");
    ASSERT_EQ(h.result.held.size(), 2u);
    EXPECT_EQ(h.result.held[1].kind, "model");
    EXPECT_EQ(h.result.held[1].why, "used by held parts (Q1) and by scaled ones");
    EXPECT_EQ(h.result.held[1].copy, "qm_scaled");

    // A card the scaled instance needs scaled but that cannot be is still refused.
    Held level2 = scale_holding(
        "t\nQ1 c b e qm\nQ2 c2 b2 e2 qm\n.model qm npn (level=2 cje=1p)\n.end\n", 1, 10, {"Q1"});
    ASSERT_EQ(level2.result.unscalable.size(), 1u);
    EXPECT_EQ(level2.result.unscalable[0].line, 4u);

    Held magnitude = scale_holding(deck, 10, 1, {"Q1"});
    EXPECT_EQ(magnitude.text(),
              "t\n* deckscale held: km=10 kf=1 items=Q1\nQ1 c b e qm\nQ2 c2 b2 e2 qm m=0.1\n"
              ".model qm npn (bf=100 cje=1p tf=100p)\n.end\n");
    EXPECT_EQ(magnitude.result.held.size(), 1u);
}

// MOSFETs that cannot follow Kf are refused; held, they are written as they are and the
// report says what they could not have followed.
TEST(HoldPassTest, HeldMosfetsAreNotRefused) {
    const std::string deck =
        "t\nM1 d g 0 0 nb w=2u l=1u\nRd vdd d 10k\nCl d 0 1p\n.model nb nmos level=8\n.end\n";
    Held refused = scale_holding(deck, 1, 1000, {"Rd"});
    ASSERT_EQ(refused.result.unscalable.size(), 1u);
    Held h = scale_holding(deck, 1, 1000, {"model:nb"});
    EXPECT_TRUE(h.result.unscalable.empty());
    EXPECT_EQ(h.text(),
              "t\n* deckscale held: km=1 kf=1000 items=model:nb\nM1 d g 0 0 nb w=2u l=1u\n"
              "Rd vdd d 10k\nCl d 0 1f\n.model nb nmos level=8\n.end\n");
    ASSERT_EQ(h.result.held.size(), 1u);
    EXPECT_EQ(h.result.held[0].why, "asked: --hold model:nb; every instance (M1)");
    ASSERT_EQ(h.result.held[0].could_not_follow.size(), 1u);
    EXPECT_NE(h.result.held[0].could_not_follow[0].message.find("level 8, BSIM3"),
              std::string::npos);
}

// Held parts inside a held .subckt body count for that .subckt.
TEST(HoldPassTest, RefusalsInsideAHeldBodyAreWhatItCouldNotFollow) {
    Held h = scale_holding(
        "t\nX1 a amp\n.subckt amp p\nM1 p p 0 0 nb\n.model nb nmos level=49\n.ends\n.end\n", 1, 10,
        {"X1"});
    EXPECT_TRUE(h.result.unscalable.empty());
    ASSERT_EQ(h.result.held.size(), 2u);
    EXPECT_EQ(h.result.held[1].kind, "subckt");
    ASSERT_EQ(h.result.held[1].could_not_follow.size(), 1u);
    EXPECT_EQ(h.result.held[1].could_not_follow[0].line, 4u);
}

TEST(HoldPassTest, WildcardsMatchTopLevelNamesFirst) {
    Held h = scale_holding(
        "t\nXA1 a amp\nXA2 b amp\nXB c amp\n.subckt amp p\nR1 p 0 1k\n"
        ".ends\n.end\n",
        2, 1, {"xa?"});
    EXPECT_EQ(h.text(),
              "t\n* deckscale held: km=2 kf=1 items=xa?\nXA1 a amp\nXA2 b amp\nXB c amp_scaled\n"
              ".subckt amp p\nR1 p 0 1k\n.ends\n.subckt amp_scaled p\nR1 p 0 2k\n"
              ".ends\n.end\n");
}

// A copy's name never takes a name the deck already uses.
TEST(HoldPassTest, CopyNamesAreNew) {
    Held h = scale_holding(
        "t\nX1 a f\nX2 b f\n.subckt f p\nR1 p 0 1k\n.ends\n"
        ".subckt f_scaled p\nR1 p 0 1k\n.ends\n.end\n",
        2, 1, {"X1"});
    EXPECT_NE(h.text().find("X2 b f_scaled2\n"), std::string::npos) << h.text();
    EXPECT_NE(h.text().find(".subckt f_scaled2 p\nR1 p 0 2k\n"), std::string::npos) << h.text();
}

TEST(HoldPassTest, FactorsOfOneGiveTheDeckBackByteForByte) {
    const std::string deck =
        "t\r\nX1 a f\r\nX2 b f\r\n.subckt f p\r\nR1 p 0 1k\r\n.ends\r\n.end\r\n";
    Held h = scale_holding(deck, 1, 1, {"X1"});
    EXPECT_EQ(h.text(), deck);
}

TEST(HoldPassTest, UnknownNamesAreErrorsThatSayWhy) {
    const std::string deck = "t\nX1 a f\n.subckt f p\nR5 p 0 1k\n.ends\n.model qm npn\n.end\n";
    try {
        scale_holding(deck, 2, 1, {"X9", "R5", "model:nothing", "subckt:qm"});
        FAIL() << "no error";
    } catch (const DeckError& e) {
        EXPECT_EQ(render(e.diagnostic()),
                  "deck.cir: error: --hold names what deck.cir does not have: 'X9' (nothing of "
                  "that name), 'R5' (R5 is inside .subckt f at deck.cir:3: hold an X line that "
                  "uses it, or subckt:f), 'model:nothing' (no .model of that name), "
                  "'subckt:qm' (no .subckt of that name)\n");
    }
}

TEST(HoldPassTest, BoundaryWarningsNameTheNodesAndTheRule) {
    const std::string deck =
        "t\nV1 in 0 ac 1\nR1 in a 1k\nR2 a b 1k\nE1 c 0 b 0 2\nR3 c 0 1k\nC1 b 0 1n\n.end\n";
    // R2 meets R1 at a and C1 at b; E1 at b does not count (its input only senses), V1 never.
    Held h = scale_holding(deck, 10, 1, {"R2", "V1"});
    std::vector<std::string> warnings;
    for (const auto& d : h.result.notes)
        if (d.severity == Severity::warning) warnings.push_back(d.message);
    ASSERT_EQ(warnings.size(), 1u);
    EXPECT_EQ(warnings[0],
              "held part 'R2' meets scaled parts at node 'a' (R1), node 'b' (C1): their "
              "impedance changed by Km = 10 and its did not, so the circuit there is no longer "
              "the original's unless that terminal of 'R2' draws no current (a buffer's "
              "input). Rule: a node other than ground where a held and a scaled part's "
              "terminals meet; V and E sources and the controlling inputs of F, G, H, S and W "
              "do not count");
    // With Km = 1 the impedances on both sides stay as they were.
    Held same = scale_holding(deck, 1, 10, {"R2"});
    for (const auto& d : same.result.notes) EXPECT_NE(d.severity, Severity::warning);
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// Mutated project decks scaled with two of their element lines held (X lines preferred,
// so that .subckt copies are made): each is either refused as bad input or written, never
// with overlapping edits, and what is written reads back as a deck.
TEST(HoldPassTest, MutatedDecksWithHeldPartsFailCleanly) {
    std::vector<std::string> seeds, with_subckts;  // every other run from a deck with .subckt
    for (const auto& path : test::netlist_files())
        if (test::is_top_deck(path)) {
            std::string text = test::read_bytes(path);
            (text.find("\n.subckt") != std::string::npos ? with_subckts : seeds).push_back(text);
        }
    ASSERT_FALSE(with_subckts.empty());
    std::mt19937 rng(20261203);  // fixed: the run is repeatable
    const std::string alphabet = "{}()'=,;*+\n .0123456789kKmMuUnNpPXxQqMm.subcktends";
    int written = 0, refused = 0, copies = 0;
    for (int it = 0; it < 1500; ++it) {
        const auto& from = it % 2 ? seeds : with_subckts;
        std::string s = from[rng() % from.size()];
        for (int k = 0, n = static_cast<int>(rng() % 4); k < n && !s.empty(); ++k) {
            std::size_t pos = rng() % s.size();
            char c = alphabet[rng() % alphabet.size()];
            if (rng() % 2)
                s.insert(pos, 1, c);
            else
                s[pos] = c;
        }
        MemoryFileSystem fs;
        fs.add("deck.cir", s);
        // Two element lines of the deck, X lines first where there are any.
        std::vector<std::string> names, x_lines;
        std::istringstream lines(s);
        for (std::string line; std::getline(lines, line);) {
            std::string word = line.substr(0, line.find_first_of(" \t\r"));
            if (word.empty() || !std::isalpha(static_cast<unsigned char>(word[0]))) continue;
            (word[0] == 'X' || word[0] == 'x' ? x_lines : names).push_back(word);
        }
        names.insert(names.begin(), x_lines.begin(), x_lines.end());
        if (names.size() < 3) continue;
        ScaleSettings settings;
        settings.factors = {3, 7};
        settings.hold = {names[rng() % std::min<std::size_t>(names.size(), 4)],
                         names[1 + rng() % (names.size() - 1)]};
        try {
            ScaledDeck d = load_and_scale("deck.cir", fs, settings);
            std::string out = apply_edits(d.deck.top().text(), d.result.edits[0]);
            MemoryFileSystem again;
            again.add("deck.cir", out);
            load_deck("deck.cir", again);
            ++written;
            copies += out.find("_scaled ") != std::string::npos;
        } catch (const DeckError&) {
            ++refused;
        }
    }
    EXPECT_GT(written, 100);
    EXPECT_GT(refused, 100);
    EXPECT_GT(copies, 20);  // a held X line whose .subckt scaled ones use too
}

}  // namespace
}  // namespace deckscale
