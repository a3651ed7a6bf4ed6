// Where R, C and L cards have their nodes and value, in the separators ngspice 39 accepts
// (ngspice 39 manual §2.1.4.1: blanks, ',', '=', '(' and ')' separate fields; the shared
// deck-syntax notes §1 tried `R12 (n0 0) 12k` and `R13 n0,0,13k`) and the value keys of
// manual §3.3.1, §3.3.6 and §3.3.10.
#include "deck/rcl_fields.hpp"

#include <gtest/gtest.h>

#include <string>

#include "deck/load.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

// "a|b|value|after" of the deck's one element card ("-" for a field it does not have).
std::string fields_of(const std::string& card) {
    MemoryFileSystem fs;
    fs.add("d.cir", "t\n" + card + "\n.end\n");
    Deck deck = load_deck("d.cir", fs);
    std::string out = "(not read)";
    deck.visit_file(0, [&](const Card& c) {
        if (c.kind != CardKind::element) return;
        auto f = rcl_fields(c);
        if (!f) {
            out = "(none)";
            return;
        }
        auto text = [&](std::optional<std::size_t> i) {
            return i ? std::string(c.field_text(*i)) : std::string("-");
        };
        out = text(f->node_a) + "|" + text(f->node_b) + "|" + text(f->value) + "|" +
              text(f->after_value) + (f->keyed ? "|keyed" : "");
    });
    return out;
}

TEST(RclFields, NodesAndValueInEverySpelling) {
    struct {
        int line;
        const char* card;
        const char* expected;
    } rows[] = {
        {__LINE__, "R1 a b 1k", "a|b|1k|-"},
        {__LINE__, "R12 (n0 n1) 12k", "n0|n1|12k|-"},
        {__LINE__, "R13 n1,0,13k", "n1|0|13k|-"},
        {__LINE__, "C1 a 0 {2*cv} ic=1", "a|0|{2*cv}|-"},
        {__LINE__, "L1 a b 'lv' nt=3", "a|b|'lv'|-"},
        {__LINE__, "R2 a b r=2.05k tc1=0.001", "a|b|2.05k|-|keyed"},
        {__LINE__, "R3 a b resistance = 5k", "a|b|5k|-|keyed"},
        {__LINE__, "C2 a b capacitance=1n", "a|b|1n|-|keyed"},
        {__LINE__, "L2 a b inductance={lv}", "a|b|{lv}|-|keyed"},
        {__LINE__, "C3 a b cmod 1n", "a|b|cmod|1n"},        // a model name before the value
        {__LINE__, "C4 a b cmod c=1n", "a|b|1n|-|keyed"},   // a value key wins
        {__LINE__, "C5 a b cap=2n", "a|b|2n|-|keyed"},      // `devhelp capacitor` (ngspice 39)
        {__LINE__, "R4 a b tc1=0.01 1k", "a|b|1k|-"},       // another key is skipped
        // On an R line a later bare number overrides the value (deck-syntax notes §1, tried).
        {__LINE__, "R6 a b 1,5", "a|b|5|-"},
        {__LINE__, "R7 a b 1k rmod", "a|b|1k|rmod"},
        {__LINE__, "C6 a b 1n 2n", "a|b|1n|2n"},
        {__LINE__, "V1 a 0 1", "(none)"},                   // not R, C or L
    };
    for (const auto& r : rows) EXPECT_EQ(fields_of(r.card), r.expected) << "line " << r.line;
}

}  // namespace
}  // namespace deckscale
