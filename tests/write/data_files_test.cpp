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

}  // namespace
}  // namespace deckscale
