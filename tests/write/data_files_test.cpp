// Notes for code-model data files that a scaled deck written to another folder would not find.
#include "write/data_files.hpp"

#include <gtest/gtest.h>

#include <string>

namespace deckscale {
namespace {

const char* kDeck =
    "replay\n"
    "a1 [%v o1] fs1\n.model fs1 filesource(file=\"rec.txt\" timescale=1m)\n"
    "a2 [%v o2] fs2\n.model fs2 filesource(file=\"/abs/rec.txt\" timescale=1m)\n"
    "a3 [%v o3] fs3\n.model fs3 filesource(file=\"missing.txt\" timescale=1m)\n"
    "R1 o1 0 1k\nR2 o2 0 1k\nR3 o3 0 1k\n.tran 1u 1m\n.end\n";

std::vector<Diagnostic> notes_for(const std::string& output, bool copied) {
    MemoryFileSystem fs;
    fs.add("in/deck.cir", kDeck);
    fs.add("in/rec.txt", "0 0\n1 1\n");
    if (copied) fs.add("out/rec.txt", "0 0\n1 1\n");
    Deck d = load_deck("in/deck.cir", fs);
    return data_files_left_behind(d, "in/deck.cir", output, fs);
}

// Only the relative path that exists beside the original and not beside the output: not
// the absolute one, not the one missing beside the original too, not when the output is in
// the original's folder or the file was copied, not for standard output.
TEST(DataFiles, ARelativeDataFileLeftBehindIsNoted) {
    auto notes = notes_for("out/deck-scaled.cir", false);
    ASSERT_EQ(notes.size(), 1u);
    EXPECT_EQ(render(notes),
              "in/deck.cir:3:28: note: model 'fs1' reads 'rec.txt' from the folder ngspice runs "
              "in; it is beside the original but not beside the output in 'out': copy it there "
              "as it is (the model's parameters carry the factors), or the scaled deck will not "
              "find it\n"
              "  .model fs1 filesource(file=\"rec.txt\" timescale=1m)\n"
              "                             ^~~~~~~~~\n");
    EXPECT_TRUE(notes_for("out/deck-scaled.cir", true).empty());
    EXPECT_TRUE(notes_for("in/deck-scaled.cir", false).empty());
    EXPECT_TRUE(notes_for("", false).empty());
}

// d_source's file: rewritten into the output's folder, read from the folder of the deck's top
// file; what cannot be is an error at the model's value.
TEST(DataFiles, APatternFileIsRewrittenBesideTheOutput) {
    MemoryFileSystem fs;
    const std::string deck = "pat\na1 [a] m\n.model m d_source(input_file=\"p.txt\")\n.end\n";
    fs.add("in/deck.cir", deck);
    fs.add("in/p.txt", "* times\n0 1s\n2m 0s\n");
    Deck d = load_deck("in/deck.cir", fs);
    auto offset = static_cast<std::uint32_t>(deck.find("\"p.txt\""));
    std::vector<DataFileCopy> copies = {{0, offset, 7, "p.txt", "p-scaled.txt", 1e-3}};
    auto files = data_file_outputs(d, copies, "out/deck-scaled.cir", fs, 9);
    ASSERT_EQ(files.size(), 1u);
    EXPECT_EQ(files[0].path, "out/p-scaled.txt");
    EXPECT_EQ(files[0].origin, "in/p.txt");
    EXPECT_EQ(files[0].content, "* times\n0 1s\n2e-06 0s\n");
    // Two cards naming the same file: one copy.
    copies.push_back(copies.front());
    EXPECT_EQ(data_file_outputs(d, copies, "out/deck-scaled.cir", fs, 9).size(), 1u);
    // In a plan: before the main deck.
    OutputPlan plan = plan_output(d, std::vector<EditSet>(d.files.size()), "out/deck-scaled.cir",
                                  false);
    add_data_files(plan, std::move(files));
    ASSERT_EQ(plan.files.size(), 2u);
    EXPECT_EQ(plan.files.back().path, "out/deck-scaled.cir");
    // No note that the original's file was left behind: its copy is written.
    fs.add("in/p.txt", "0 1s\n");
    EXPECT_TRUE(data_files_left_behind(d, "in/deck.cir", "out/deck-scaled.cir", fs, copies).empty());
    EXPECT_EQ(data_files_left_behind(d, "in/deck.cir", "out/deck-scaled.cir", fs).size(), 1u);

    auto error_of = [&](const std::vector<DataFileCopy>& c, const std::string& output) {
        try {
            data_file_outputs(d, c, output, fs, 9);
        } catch (const DeckError& e) {
            EXPECT_EQ(e.diagnostic().line, 3u);
            EXPECT_EQ(e.diagnostic().column, 30u);
            return e.diagnostic().message;
        }
        return std::string("no error");
    };
    EXPECT_NE(error_of({copies.front()}, "").find("give an output file (-o)"), std::string::npos);
    DataFileCopy missing = copies.front();
    missing.path = "gone.txt";
    missing.copy = "gone-scaled.txt";
    EXPECT_NE(error_of({missing}, "out/x.cir").find("cannot read 'gone.txt'"), std::string::npos);
    DataFileCopy other = copies.front();
    other.path = "sub/p.txt";
    fs.add("in/sub/p.txt", "0 1s\n");
    EXPECT_NE(error_of({copies.front(), other}, "out/x.cir").find("would both be rewritten"),
              std::string::npos);
    fs.add("in/p.txt", "0 1s\nlater 0s\n");
    EXPECT_EQ(error_of({copies.front()}, "out/x.cir"),
              "cannot rewrite the times of 'p.txt': line 2: 'later' is not a time");
}

}  // namespace
}  // namespace deckscale
