// Tests of the one diagnostic type and its rendering.
#include "deck/diagnostic.hpp"

#include <gtest/gtest.h>

#include "deck/source_file.hpp"

namespace deckscale {
namespace {

TEST(Diagnostic, RendersFileLineColumnSourceAndCaret) {
    SourceFile f("deck.cir", "title\nR1 in out 1.2.3k\n");
    auto d = f.diagnose(Severity::error, 16, 6, "malformed number");
    EXPECT_EQ(render(d),
              "deck.cir:2:11: error: malformed number\n"
              "  R1 in out 1.2.3k\n"
              "            ^~~~~~\n");
}

TEST(Diagnostic, Table) {
    SourceFile f("sub/d.cir", "t\r\n\tR1\ta 0 x\r\nlast line no newline");
    struct {
        int line;
        Diagnostic d;
        std::string expected;
    } rows[] = {
        {__LINE__, f.diagnose(Severity::warning, 9, 1, "w"),
         "sub/d.cir:2:7: warning: w\n  \tR1\ta 0 x\n  \t  \t  ^\n"},
        {__LINE__, f.diagnose(Severity::note, 3, 3, "n"),
         "sub/d.cir:2:1: note: n\n  \tR1\ta 0 x\n  ^~~\n"},
        // the underline stops at the end of the line
        {__LINE__, f.diagnose(Severity::error, 9, 40, "e"),
         "sub/d.cir:2:7: error: e\n  \tR1\ta 0 x\n  \t  \t  ^~~\n"},
        {__LINE__, f.diagnose(Severity::error, 18, 4, "e"),
         "sub/d.cir:3:5: error: e\n  last line no newline\n      ^~~~\n"},
        // an offset past the end points at the end of the last line
        {__LINE__, f.diagnose(Severity::error, 1000, 1, "e"),
         "sub/d.cir:3:21: error: e\n  last line no newline\n" + std::string(22, ' ') + "^\n"},
        {__LINE__, Diagnostic{Severity::error, "x.cir", 0, 0, 0, "", "cannot read", {}},
         "x.cir: error: cannot read\n"},
        {__LINE__, Diagnostic{Severity::error, "", 0, 0, 0, "", "no file", {}},
         "error: no file\n"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        EXPECT_EQ(render(row.d), row.expected);
    }
}

TEST(Diagnostic, NotesFollowTheMainText) {
    SourceFile inc("lib.inc", "R1 a\n");
    SourceFile top("top.cir", "t\n.include lib.inc\n");
    auto d = inc.diagnose(Severity::error, 0, 2, "too few");
    d.notes.push_back(top.diagnose(Severity::note, 11, 7, "included from here"));
    EXPECT_EQ(render(d),
              "lib.inc:1:1: error: too few\n"
              "  R1 a\n"
              "  ^~\n"
              "top.cir:2:10: note: included from here\n"
              "  .include lib.inc\n"
              "           ^~~~~~~\n");
    EXPECT_EQ(render(std::vector<Diagnostic>{d, d}), render(d) + render(d));
    EXPECT_EQ(render(std::vector<Diagnostic>{}), "");
}

TEST(SourceFile, PositionsAndLines) {
    SourceFile f("f", "ab\r\ncd\n\nef");
    struct {
        int line;
        std::uint32_t offset, want_line, want_column;
    } rows[] = {
        {__LINE__, 0, 1, 1}, {__LINE__, 3, 1, 4}, {__LINE__, 4, 2, 1},
        {__LINE__, 7, 3, 1}, {__LINE__, 8, 4, 1}, {__LINE__, 9, 4, 2},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        auto p = f.position(row.offset);
        EXPECT_EQ(p.line, row.want_line);
        EXPECT_EQ(p.column, row.want_column);
    }
    EXPECT_EQ(f.line_text(1), "ab");
    EXPECT_EQ(f.line_text(2), "cd");
    EXPECT_EQ(f.line_text(3), "");
    EXPECT_EQ(f.line_text(4), "ef");
    EXPECT_EQ(f.line_text(5), "");
}

// A long line is shown as a window around the column, with the caret under the same byte;
// control bytes are shown as '?'.
TEST(SourceFile, LongLinesAreWindowedAndControlBytesHidden) {
    std::string line = "R1 a b " + std::string(500, 'x') + " 1.2.3";
    SourceFile f("long.cir", "t\n" + line + "\n");
    std::uint32_t offset = 2 + static_cast<std::uint32_t>(line.find("1.2.3"));
    Diagnostic d = f.diagnose(Severity::error, offset, 5, "bad");
    EXPECT_EQ(d.column, 509u);
    std::string shown = "..." + std::string(60, 'x').substr(0, 59) + " 1.2.3";
    EXPECT_EQ(render(d), "long.cir:2:509: error: bad\n  " + shown + "\n  " +
                             std::string(shown.size() - 5, ' ') + "^~~~~\n");
    SourceFile b("bin.cir", std::string("t\nR1\x01\x7f a\n", 9));
    EXPECT_EQ(render(b.diagnose(Severity::error, 4, 1, "x")), "bin.cir:2:3: error: x\n  R1?? a\n    ^\n");
}

// A long quoted text in a message is shortened to its start and end with its length.
TEST(Diagnostic, LongQuotedTextIsShortened) {
    Diagnostic d;
    d.file = "d.cir";
    std::string word = std::string(50, 'a') + std::string(1000000, 'x') + std::string(20, 'z');
    d.message = "'" + word + "' is neither a value, a parameter nor a model; 'R1' is fine";
    EXPECT_EQ(render(d), "d.cir: error: '" + std::string(40, 'a') +
                             "...(1000070 bytes)..." + std::string(20, 'z') +
                             "' is neither a value, a parameter nor a model; 'R1' is fine\n");
    d.message = "an apostrophe's lone quote stays";
    EXPECT_EQ(render(d), "d.cir: error: an apostrophe's lone quote stays\n");
    std::string prose = "ngspice's reader " + std::string(100, '.') + " then 'R1'";
    d.message = prose;  // the apostrophe pairs with a quote across blanks: left alone
    EXPECT_EQ(render(d), "d.cir: error: " + prose + "\n");
}

}  // namespace
}  // namespace deckscale
