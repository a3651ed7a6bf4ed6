// Reading a large file in pieces on several threads must give exactly what one whole-file
// read gives: the same edits, change list, diagnostics and errors, whatever the pieces.
#include <gtest/gtest.h>

#include <random>
#include <string>

#include "base/file_system.hpp"
#include "deck/pieces.hpp"
#include "scale/rescale.hpp"
#include "support/common.hpp"
#include "write/edit.hpp"

namespace deckscale {
namespace {

// Everything a scale run produces, as one text (or the rendered error).
std::string outcome(const MemoryFileSystem& fs, unsigned threads, std::size_t* pieces = nullptr) {
    ScaleSettings settings;
    settings.factors = {7, 3};
    settings.threads = threads;
    settings.min_piece_bytes = 1;  // split even the smallest deck
    try {
        ScaledDeck s = load_and_scale("deck.cir", fs, settings);
        if (pieces) *pieces = s.deck.pieces_taken;
        std::string out;
        for (std::size_t f = 0; f < s.deck.files.size(); ++f)
            out += apply_edits(s.deck.files[f].source->text(), s.result.edits[f]) + "\n----\n";
        for (const auto& c : s.result.changes)
            out += fmt::format("{} {} {} {} {} -> {}\n", c.file, c.offset, c.element, c.field,
                               c.old_text, c.new_text);
        out += fmt::format("{} changes\n", s.result.change_count);
        out += render(s.result.unscalable) + render(s.result.notes) + render(s.deck.warnings);
        return out;
    } catch (const DeckError& e) {
        return "error: " + render(e.diagnostic());
    }
}

// Cards of an RC ladder (no title line).
std::string ladder(int sections) {
    std::string s = "V1 n0 0 DC 0 AC 1\n";
    for (int i = 0; i < sections; ++i)
        s += fmt::format("R{0} n{0} n{1} 1k\nC{0} n{1} 0 1.5n\n", i, i + 1);
    return s;
}

TEST(DeckPieces, StartsAreLineStartsWithALetter) {
    std::string text = "title\n+ cont\n* comment\n\n  R1 a b 1\nR2 a b 2\nC3 a 0 1\nC4 a 0 2\n";
    auto starts = piece_starts(text, 4);
    ASSERT_FALSE(starts.empty());
    for (auto s : starts) {
        EXPECT_EQ(text[s - 1], '\n');
        std::size_t first = text.find_first_not_of(" \t", s);  // an indented card counts
        EXPECT_TRUE(std::isalpha(static_cast<unsigned char>(text[first]))) << s;
    }
    EXPECT_TRUE(std::is_sorted(starts.begin(), starts.end()));
    EXPECT_TRUE(piece_starts(text, 1).empty());
    EXPECT_TRUE(piece_starts("t\n* only comments\n* here\n", 3).empty());
}

TEST(DeckPieces, APlainDeckIsReadInPiecesWithTheSameResult) {
    MemoryFileSystem fs;
    fs.add("deck.cir", "generated ladder\n" + ladder(400) + ".ac dec 10 1 1meg\n.end\n");
    std::size_t taken = 0;
    EXPECT_EQ(outcome(fs, 4, &taken), outcome(fs, 1));
    EXPECT_EQ(taken, 3u);  // the first piece is read by the calling thread
}

// Decks whose pieces depend on what comes before them: each must still come out exactly as
// a whole-file read gives it (a piece that cannot be kept is read again in order).
TEST(DeckPieces, ContextAcrossPiecesGivesTheSameResult) {
    struct Row {
        int line;
        std::string deck;
    };
    const std::string body = ladder(60);
    const Row rows[] = {
        // An indented deck (cards after blanks), with CRLF line ends.
        {__LINE__, [&] {
             std::string d = "t\r\n";
             for (char c : body) d += c == '\n' ? std::string("\r\n  ") : std::string(1, c);
             return d + ".end\r\n";
         }()},
        // A .subckt opened in one piece and closed in a later one.
        {__LINE__, "t\n.subckt big a b\n" + body + ".ends big\nX1 1 2 big\n.end\n"},
        // A model and a parameter declared early, used late (pieces cannot be kept).
        {__LINE__, "t\n.model rm r rsh=10\n.param rv=2k\n" + body + "R9 a b rm l=1u w=1u\n"
                   "R10 a 0 rv\nR11 a 0 {rv}\n.end\n"},
        // Names used early and declared late (the whole deck is scaled again).
        {__LINE__, "t\nR10 a 0 rv\nK1 L1 L2 0.5\n" + body +
                       "L1 a 0 1u\nL2 b 0 1u\n.param rv=2k\n.end\n"},
        // An include in the middle, and a .control block and continuation lines anywhere.
        {__LINE__, "t\n" + body.substr(0, body.size() / 2) + ".include inc.cir\n" +
                       body.substr(body.size() / 2) + ".end\n"},
        {__LINE__, "t\n.control\n" + body + ".endc\nR1 a 0 1k\n.end\n"},
        {__LINE__, "t\nR1 a 0\n" + std::string(200, '+') + "\n" + body + ".end\n"},
        // Everything after .end is kept verbatim.
        {__LINE__, "t\nR1 a 0 1k\n.end\n" + body},
        // Warnings, notes and unscalable items keep their order.
        {__LINE__, "t\n" + body + "Q1 c b e qm\n.foo 1\n" + body + "R7 a 0 2.2M\n" + body +
                       "Y1 a 0 b 0 t\n.end\n"},
        // Errors late in the file are reported as a whole-file read reports them.
        {__LINE__, "t\n" + body + "R1 a 0 1.2.3k\n" + body + ".end\n"},
        {__LINE__, "t\n" + body + ".ends\n" + body + ".end\n"},
        {__LINE__, "t\n" + body + "R5 a b\n" + body + "C1 a 0 {x\n.end\n"},
        {__LINE__, "t\n" + body + ".subckt open a\n" + body + ".end\n"},
        // A transient in one piece, the tolerances or .end in others (scale/tran_tolerances).
        {__LINE__, "t\n.tran 1u 1m\n" + body + ".options abstol=1p\n" + body + ".end\n"},
        {__LINE__, "t\n" + body + ".tran 1u 1m\n" + body + ".ac dec 1000 1 10\n.end\n"},
        // The reltol the sweeps step with, set before or after them.
        {__LINE__, "t\n.options reltol=0.3\n" + body + ".ac oct 1 1 2.5\n.end\n"},
        {__LINE__, "t\n.ac oct 1 1 2.5\n" + body + ".options reltol=0.3\n.end\n"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << r.line);
        MemoryFileSystem fs;
        fs.add("deck.cir", r.deck);
        fs.add("inc.cir", "R1 a 0 1k\n.model rm r rsh=5\n");
        std::string whole = outcome(fs, 1);
        for (unsigned threads : {2u, 3u, 5u}) EXPECT_EQ(outcome(fs, threads), whole) << threads;
    }
}

// Mutated decks: a piecewise read agrees with a whole-file read on every byte of the result,
// and on the error message when the deck is refused.
TEST(DeckPieces, MutatedDecksGiveTheSameResultInPieces) {
    std::vector<std::string> seeds;
    for (const auto& path : test::netlist_files())
        if (test::is_top_deck(path)) seeds.push_back(test::read_bytes(path));
    seeds.push_back("t\n" + ladder(30) + ".subckt s a\nR1 a 0 {p}\n.ends\n.param p=1\n.end\n");
    std::mt19937 rng(20261203);  // fixed: the run is repeatable
    const std::string alphabet = "{}()'\"=,;$/+*\\\n\r\t .0123456789eEkKmMuUnN-aRLCVK.";
    for (int it = 0; it < 400; ++it) {
        std::string s = seeds[rng() % seeds.size()];
        for (int k = 0, n = 1 + static_cast<int>(rng() % 4); k < n && !s.empty(); ++k) {
            std::size_t pos = rng() % s.size();
            char c = alphabet[rng() % alphabet.size()];
            if (rng() % 2) s[pos] = c;
            else s.insert(pos, 1, c);
        }
        MemoryFileSystem fs;
        fs.add("deck.cir", s);
        ASSERT_EQ(outcome(fs, 3), outcome(fs, 1)) << "iteration " << it << ":\n" << s;
    }
}

}  // namespace
}  // namespace deckscale
