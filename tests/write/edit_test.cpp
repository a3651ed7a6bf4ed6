// Tests of the edit set: sorted, conflict-checked byte-range edits and the one function that
// applies them.
#include "write/edit.hpp"

#include <gtest/gtest.h>

#include <stdexcept>
#include <string>

namespace deckscale {
namespace {

const std::string kText = "R1 a 0 1k\nC1 a 0 10n\n";  // 21 bytes: 1k at 7, 10n at 17

TEST(EditSet, NoEditsGiveTheInputBack) {
    EditSet edits;
    EXPECT_TRUE(edits.empty());
    EXPECT_EQ(apply_edits(kText, edits), kText);
    EXPECT_EQ(apply_edits("", edits), "");
}

TEST(EditSet, EditsAreKeptSortedWhateverTheOrderAdded) {
    EditSet edits;
    edits.add(kText, {17, 3, "20n"});
    edits.add(kText, {0, 2, "Rx"});
    edits.add(kText, {7, 2, "2k"});
    ASSERT_EQ(edits.size(), 3u);
    EXPECT_EQ(edits.at(0).offset, 0u);
    EXPECT_EQ(edits.at(1).offset, 7u);
    EXPECT_EQ(edits.at(2).offset, 17u);
    EXPECT_EQ(apply_edits(kText, edits), "Rx a 0 2k\nC1 a 0 20n\n");
}

// Sets made for consecutive pieces of a file are joined in order; a set that would go
// before or overlap the last edit is refused.
TEST(EditSet, AppendJoinsLaterEdits) {
    EditSet first, later, empty;
    first.add(kText, {0, 2, "Rx"});
    first.add(kText, {7, 2, "2k"});
    later.add(kText, {17, 3, "20n"});
    first.append(std::move(later));
    first.append(std::move(empty));
    ASSERT_EQ(first.size(), 3u);
    EXPECT_EQ(apply_edits(kText, first), "Rx a 0 2k\nC1 a 0 20n\n");

    EditSet none, only;
    only.add(kText, {7, 2, "3k"});
    none.append(std::move(only));
    EXPECT_EQ(apply_edits(kText, none), "R1 a 0 3k\nC1 a 0 10n\n");

    EditSet a, b;
    a.add(kText, {7, 2, "2k"});
    b.add(kText, {8, 3, "xyz"});
    EXPECT_THROW(a.append(std::move(b)), std::logic_error);
    EditSet c, d;
    c.add(kText, {17, 3, "20n"});
    d.add(kText, {0, 2, "Rx"});
    EXPECT_THROW(c.append(std::move(d)), std::logic_error);
}

// Appended sets keep their own storage; reading, applying and adding work across them,
// and an edit further back than the last one still lands in order.
TEST(EditSet, AppendedSetsActAsOne) {
    const std::string text = "R1 a 0 1k\nR2 a 0 2k\nR3 a 0 3k\n";  // values at 7, 17, 27
    EditSet a, b, c;
    a.reserve(10, 100);
    a.add(text, {7, 2, "5k"});
    b.add(text, {17, 2, "6k"});
    c.add(text, {27, 2, "7k"});
    a.append(std::move(b));
    a.append(std::move(c));
    ASSERT_EQ(a.size(), 3u);
    EXPECT_EQ(a.at(1).text, "6k");
    EXPECT_EQ(apply_edits(text, a), "R1 a 0 5k\nR2 a 0 6k\nR3 a 0 7k\n");
    EXPECT_EQ(apply_edits(text, a, 10, 22), "R2 a 0 6k\nR3");
    EXPECT_THROW(a.add(text, {28, 1, "x"}), std::logic_error);  // overlaps the last
    a.add(text, {20, 0, "*"});                                  // before the last: merged
    a.add(text, {0, 0, "+"});
    EXPECT_EQ(apply_edits(text, a), "+R1 a 0 5k\nR2 a 0 6k\n*R3 a 0 7k\n");
    EXPECT_THROW(a.add(text, {18, 1, "x"}), std::logic_error);
}

TEST(EditSet, AnEditThatChangesNothingIsNotStored) {
    EditSet edits;
    edits.add(kText, {7, 2, "1k"});
    EXPECT_TRUE(edits.empty());
    // ...and so it cannot conflict with a real edit of the same bytes.
    edits.add(kText, {7, 2, "2k"});
    EXPECT_EQ(edits.size(), 1u);
}

TEST(EditSet, InsertionsAndDeletions) {
    EditSet edits;
    edits.add(kText, {0, 0, "* scaled\n"});
    edits.add(kText, {10, 11, ""});
    EXPECT_EQ(apply_edits(kText, edits), "* scaled\nR1 a 0 1k\n");
}

struct OverlapRow {
    int line;
    Edit first, second;
    const char* message;
};

TEST(EditSet, OverlappingEditsThrowNamingBoth) {
    const OverlapRow rows[] = {
        {__LINE__, {7, 2, "2k"}, {8, 1, "M"},
         "overlapping edits [7, 9) -> \"2k\" and [8, 9) -> \"M\""},
        {__LINE__, {8, 1, "M"}, {7, 2, "2k"},  // the stored edit is named first
         "overlapping edits [8, 9) -> \"M\" and [7, 9) -> \"2k\""},
        {__LINE__, {7, 2, "2k"}, {7, 2, "3k"},
         "overlapping edits [7, 9) -> \"2k\" and [7, 9) -> \"3k\""},
        {__LINE__, {7, 0, "x"}, {7, 0, "y"},
         "overlapping edits [7, 7) -> \"x\" and [7, 7) -> \"y\""},
        {__LINE__, {0, 10, "gone"}, {7, 0, "y"},
         "overlapping edits [0, 10) -> \"gone\" and [7, 7) -> \"y\""},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        EditSet edits;
        edits.add(kText, row.first);
        try {
            edits.add(kText, row.second);
            ADD_FAILURE() << "no exception";
        } catch (const std::logic_error& e) {
            EXPECT_EQ(std::string(e.what()), row.message);
        }
        EXPECT_EQ(edits.size(), 1u);  // the set is unchanged
    }
}

TEST(EditSet, AdjacentEditsDoNotConflict) {
    EditSet edits;
    edits.add(kText, {7, 1, "2"});
    edits.add(kText, {8, 1, "M"});
    EXPECT_EQ(apply_edits(kText, edits), "R1 a 0 2M\nC1 a 0 10n\n");
}

TEST(EditSet, EditOutsideTheFileThrows) {
    EditSet edits;
    EXPECT_THROW(edits.add(kText, {20, 10, "x"}), std::logic_error);
}

TEST(EditSet, ApplyToARange) {
    EditSet edits;
    edits.add(kText, {0, 0, "<"});    // insertion at the start of line 1
    edits.add(kText, {7, 2, "2k"});
    edits.add(kText, {10, 0, ">"});   // insertion at the start of line 2
    edits.add(kText, {17, 3, "20n"});
    struct {
        int line;
        std::uint32_t begin, end;
        const char* expected;
    } rows[] = {
        {__LINE__, 0, 10, "<R1 a 0 2k\n"},  // the insertion at 10 belongs to the next range
        {__LINE__, 10, 21, ">C1 a 0 20n\n"},
        {__LINE__, 0, 21, "<R1 a 0 2k\n>C1 a 0 20n\n"},
        {__LINE__, 3, 6, "a 0"},
        {__LINE__, 21, 21, ""},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        EXPECT_EQ(apply_edits(kText, edits, row.begin, row.end), row.expected);
    }
    EXPECT_EQ(apply_edits(kText, edits), "<R1 a 0 2k\n>C1 a 0 20n\n");
}

TEST(EditSet, InsertionAtTheVeryEndIsApplied) {
    EditSet edits;
    edits.add(kText, {21, 0, ".end\n"});
    EXPECT_EQ(apply_edits(kText, edits), kText + ".end\n");
}

// Text for a file's end follows an insertion already there (the last card's own, when the
// file ends without a newline); elsewhere add_after is add.
TEST(EditSet, AddAfterFollowsAnInsertionAtTheSameOffset) {
    EditSet edits;
    edits.add(kText, {21, 0, " m=2"});
    edits.add_after(kText, 21, "\n.options gmin=1e-13\n");
    EXPECT_EQ(edits.size(), 1u);
    EXPECT_EQ(apply_edits(kText, edits), kText + " m=2\n.options gmin=1e-13\n");
    EditSet alone;
    alone.add_after(kText, 21, ".end\n");
    EXPECT_EQ(apply_edits(kText, alone), kText + ".end\n");
    EXPECT_THROW(alone.add(kText, {21, 0, "x"}), std::logic_error);
}

}  // namespace
}  // namespace deckscale
