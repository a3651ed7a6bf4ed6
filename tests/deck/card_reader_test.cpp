// Tests of the lossless card reader: every byte of a file belongs to exactly one token, the
// tokens of all cards rebuild the file, and cards get the right kind and fields.
#include "deck/card_reader.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <random>
#include <string>
#include <vector>

#include "support/common.hpp"

namespace deckscale {
namespace {

using test::read_back;
using K = CardKind;

std::string kinds_text(const std::vector<CardKind>& kinds) {
    static const char* names[] = {"title", "blank", "comment", "element", "dot", "control",
                                  "after_end"};
    std::string s;
    for (auto k : kinds) s += std::string(s.empty() ? "" : " ") + names[static_cast<int>(k)];
    return s;
}

// ---- every deck under netlists/ ------------------------------------------------------------

TEST(CardReader, RoundTripsEveryNetlistFile) {
    auto files = test::netlist_files();
    ASSERT_FALSE(files.empty()) << "no decks under netlists/";
    for (const auto& path : files) {
        SCOPED_TRACE(path.string());
        SourceFile file(path.string(), test::read_bytes(path));
        FileRole role = test::is_top_deck(path) ? FileRole::deck : FileRole::include;
        auto r = read_back(file, role);
        EXPECT_EQ(r.fault, "");
        EXPECT_TRUE(r.rebuilt == file.text()) << "tokens do not rebuild " << path;
        if (role == FileRole::deck) {
            ASSERT_FALSE(r.kinds.empty());
            EXPECT_EQ(r.kinds.front(), K::title);
        }
    }
}

// ---- generated decks, one row each ------------------------------------------------------

struct Row {
    int line;
    const char* name;
    std::string text;
    const char* kinds;  // the card kinds, in order
    FileRole role = FileRole::deck;
};

std::vector<Row> generated_decks() {
    return {
        {__LINE__, "CRLF line ends", "crlf deck\r\nR1 a 0 1k\r\n* note\r\n\r\n.end\r\n",
         "title element comment blank dot"},
        {__LINE__, "no final newline", "t\nR1 a 0 1k\n.op", "title element dot"},
        {__LINE__, "no final newline after blanks", "t\nR1 a 0 1k\n   ", "title element blank"},
        {__LINE__, "only a title", "just a title", "title"},
        {__LINE__, "title looks like a card", "R1 1 0 1k\n.end\n", "title dot"},
        {__LINE__, "tabs everywhere", "t\n\tR1\ta\t0\t1k\t\n\t* tabbed comment\n.end\n",
         "title element comment dot"},
        {__LINE__, "UTF-8 byte-order mark", "\xEF\xBB\xBFtitle with bom\nR1 a 0 1\n",
         "title element"},
        {__LINE__, "byte-order mark only", "\xEF\xBB\xBF", "title"},
        {__LINE__, "+ continuation with comment and blank lines between",
         "t\nV1 a 0\n* about the source\n\n  $ another\n+ DC 1\n   + AC 1\nR1 a 0 1\n",
         "title element element"},
        {__LINE__, "+ continuation with end-of-line comment before it",
         "t\nV1 a 0 ; first half\n+ DC 1 $ second\n.end\n", "title element dot"},
        {__LINE__, "backslash continuation", "t\nR1 a 0 \\\\\n 1k\n.end\n", "title element dot"},
        {__LINE__, "backslash continuation, CRLF", "t\r\nR1 a 0 \\\\  \r\n 1k\r\n",
         "title element"},
        {__LINE__, ".control block",
         "t\nR1 a 0 1\n.control\nrun\n* inside\nprint v(a) $ x\n.endc\n.end\n",
         "title element control dot"},
        {__LINE__, ".control block upper case at end of file", "t\n.CONTROL\nrun\n  .ENDC",
         "title control"},
        {__LINE__, "text after .end",
         "t\nR1 a 0 1\n.end\nanything { ' \" goes\n+ here\n\x01\x02\n", "title element dot after_end"},
        {__LINE__, "text after .END with leading blank", "t\n  .END  \nX", "title dot after_end"},
        {__LINE__, ".ends is not .end", "t\n.subckt s a\nR1 a 0 1\n.ends\n.end\n",
         "title dot element dot dot"},
        {__LINE__, "{expr} over continuation lines",
         "t\n.param a={1 +\n+ 2 *\n* comment\n+ 3}\nR1 a 0 {a *\n+ 2}\n", "title dot element"},
        {__LINE__, "'expr' over continuation lines", "t\nR1 a 0 '1k *\n+ 2'\n.end\n",
         "title element dot"},
        {__LINE__, "nested braces", "t\nB1 a 0 V={max({1},{2})}\n", "title element"},
        {__LINE__, "end-of-line comments $ ; //",
         "t\nR1 a 0 1k $ dollar\nR2 a 0 2k ; semi\nR3 a 0 3k // slashes\nR4 a 0 4k;x\n",
         "title element element element element"},
        {__LINE__, "full-line comments * // $ ;", "t\n* star\n// slashes\n$ dollar\n; semi\n",
         "title comment comment comment comment"},
        {__LINE__, "commas and parentheses as separators",
         "t\nR13 n0,0,13k\nR12 (n0 0) 12k\n", "title element element"},
        {__LINE__, ".model with and without parentheses",
         "t\n.model sw1 SW(VT=1 VH=0.1 RON=1 ROFF=1MEG)\n.model sw2 sw vt=1 vh=0.1\n",
         "title dot dot"},
        {__LINE__, "a lone carriage return is a blank", "t\nR1 a\r0 1\n", "title element"},
        {__LINE__, "double-quoted file name", "t\n.include \"my lib.inc\"\n", "title dot"},
        {__LINE__, "included file has no title", "R1 a 0 1\n.end\n", "element dot",
         FileRole::include},
        {__LINE__, "empty included file", "", "", FileRole::include},
        {__LINE__, "blank first line is an empty title", "\nR1 a 0 1\n", "title element"},
    };
}

TEST(CardReader, GeneratedDecksRoundTripWithRightKinds) {
    for (const auto& row : generated_decks()) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line << ": " << row.name);
        SourceFile file("gen.cir", row.text);
        auto r = read_back(file, row.role);
        EXPECT_EQ(r.fault, "");
        EXPECT_EQ(r.rebuilt, row.text);
        EXPECT_EQ(kinds_text(r.kinds), row.kinds);
    }
}

TEST(CardReader, FiveMegabyteCommentLine) {
    std::string text = "big comment\n*" + std::string(5 * 1024 * 1024, 'x') + "\nR1 a 0 1k\n.end\n";
    SourceFile file("big.cir", text);
    auto r = read_back(file, FileRole::deck);
    EXPECT_EQ(r.fault, "");
    EXPECT_TRUE(r.rebuilt == text);
    EXPECT_EQ(kinds_text(r.kinds), "title comment element dot");
}

// ---- fields ----------------------------------------------------------------------------

struct FieldRow {
    int line;
    std::string card;    // one card (the reader sees it after a title line)
    const char* fields;  // field texts joined by '|'
};

TEST(CardReader, FieldsOfOneCard) {
    const FieldRow rows[] = {
        {__LINE__, "R1 a 0 1k", "R1|a|0|1k"},
        {__LINE__, "R13 n0,0,13k", "R13|n0|,|0|,|13k"},
        {__LINE__, "R12 (n0 0) 12k", "R12|(|n0|0|)|12k"},
        {__LINE__, "C1 a 0 c=10p", "C1|a|0|c|=|10p"},
        {__LINE__, ".model sw1 SW(VT=1 RON=1)", ".model|sw1|SW|(|VT|=|1|RON|=|1|)"},
        {__LINE__, ".model sw2 sw vt=1", ".model|sw2|sw|vt|=|1"},
        {__LINE__, "R1 a 0 1k $ c", "R1|a|0|1k"},
        {__LINE__, "R1 a 0 3k$x", "R1|a|0|3k$x"},  // '$' not after a blank: no comment
        {__LINE__, "R1 a 0 1k;c", "R1|a|0|1k"},
        {__LINE__, "R1 a 0 1k//c", "R1|a|0|1k"},
        {__LINE__, "R1 a 0 {p *\n+ 2}", "R1|a|0|{p *\n+ 2}"},
        {__LINE__, "R1 a 0 'p*2'", "R1|a|0|'p*2'"},
        {__LINE__, "V1 a 0\n* c\n+ DC 1", "V1|a|0|DC|1"},
        {__LINE__, "R1 a 0 \\\\\n 1k", "R1|a|0|1k"},
        {__LINE__, ".include \"a b.lib\"", ".include|\"a b.lib\""},
        {__LINE__, "\tV1\ta\t0\tPULSE(0 1 1n)", "V1|a|0|PULSE|(|0|1|1n|)"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        SourceFile file("f.cir", "title\n" + row.card + "\n");
        std::vector<std::string> seen;
        read_cards(file, FileRole::deck, [&](const Card& c) {
            if (c.kind != CardKind::element && c.kind != CardKind::dot) return;
            std::string joined;
            for (std::size_t i = 0; i < c.fields.size(); ++i)
                joined += (i ? "|" : "") + std::string(c.field_text(i));
            seen.push_back(joined);
        });
        ASSERT_EQ(seen.size(), 1u);
        EXPECT_EQ(seen[0], row.fields);
    }
}

TEST(CardReader, TokenKindsOfAContinuedCard) {
    SourceFile file("f.cir", "t\nR1 a 0 ; c\n+ 1k\n");
    std::vector<TokenKind> kinds;
    read_cards(file, FileRole::deck, [&](const Card& c) {
        if (c.kind == CardKind::element)
            for (const auto& t : c.tokens) kinds.push_back(t.kind);
    });
    using T = TokenKind;
    std::vector<T> expected{T::word, T::whitespace, T::word,     T::whitespace,
                            T::word, T::whitespace, T::comment,  T::line_end,
                            T::continuation, T::whitespace, T::word, T::line_end};
    EXPECT_EQ(kinds, expected);
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// Every card with every token, as text: "element|word:R1|whitespace: |...".
std::string token_dump(const SourceFile& f, bool fast) {
    std::string out;
    CardVisitor dump = [&](const Card& c) {
        out += std::to_string(static_cast<int>(c.kind));
        for (const auto& t : c.tokens)
            out += "|" + std::to_string(static_cast<int>(t.kind)) + ":" + std::string(c.text(t));
        out += "\n";
    };
    try {
        if (fast)
            read_cards(f, FileRole::deck, dump);
        else
            read_cards_reference(f, dump);
    } catch (const DeckError& e) {
        out += "error: " + render(e.diagnostic());
    }
    return out;
}

// The fast path for plain element lines must give exactly the cards and tokens of the
// general rules: decks of random lines mixing plain words with every byte that matters
// (separators, quotes, braces, comment and continuation marks, CR, tabs, non-ASCII).
TEST(CardReader, FastPathGivesTheTokensOfTheGeneralRules) {
    std::mt19937 rng(42);  // fixed: the run is repeatable
    const std::string plain = "RCLVrclv0123456789nkKuUmM.-_ab/:";
    const std::string special = " \t\r\n;$\\{}'\"=(),/+*.\f\v\xc2\xb5";
    int fast_lines = 0;
    for (int it = 0; it < 4000; ++it) {
        std::string deck = "title\n";
        for (int line = 0, n = 1 + static_cast<int>(rng() % 8); line < n; ++line) {
            std::string l = std::string(1, "RCLVX.*+ ;\n"[rng() % 11]);
            for (int k = 0, m = static_cast<int>(rng() % 14); k < m; ++k)
                l += rng() % 6 ? (rng() % 3 ? plain[rng() % plain.size()] : ' ')
                               : special[rng() % special.size()];
            deck += l + (rng() % 4 ? "\n" : "\r\n");
        }
        if (rng() % 3) deck += ".end\n";
        SourceFile f("deck.cir", deck);
        std::string fast = token_dump(f, true);
        ASSERT_EQ(fast, token_dump(f, false)) << "deck:\n" << deck;
        fast_lines += static_cast<int>(std::count(fast.begin(), fast.end(), '\n'));
    }
    EXPECT_GT(fast_lines, 10000);  // the decks really hold many cards
    // And on every deck of the project.
    for (const auto& path : test::netlist_files()) {
        if (!test::is_top_deck(path)) continue;
        SourceFile f(path.string(), test::read_bytes(path));
        EXPECT_EQ(token_dump(f, true), token_dump(f, false)) << path;
    }
}

}  // namespace
}  // namespace deckscale
