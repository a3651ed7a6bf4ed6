// Tests of deck loading: includes and libraries, structural checks, and the full rendered
// text of every class of bad input a reader can see.
#include "deck/load.hpp"

#include <gtest/gtest.h>

#include <string>

#include "support/common.hpp"

namespace deckscale {
namespace {

struct BadInputRow {
    int line;
    const char* what;
    std::vector<std::pair<std::string, std::string>> files;  // [0] is the deck
    std::string rendered;                                     // render() of the DeckError
};

std::vector<BadInputRow> bad_inputs() {
    return {
        {__LINE__, "too few fields", {{"proj/deck.cir", "t\nR1 a 0\n.end\n"}},
         "proj/deck.cir:2:1: error: too few fields for 'R1': expected R<name> n+ n- value, found 2 "
         "after the name\n"
         "  R1 a 0\n"
         "  ^~\n"},
        {__LINE__, "too few fields on a dot card", {{"proj/deck.cir", "t\n.ac dec 10 1\n"}},
         "proj/deck.cir:2:1: error: too few fields for '.ac': expected .ac dec|oct|lin points "
         "fstart fstop\n"
         "  .ac dec 10 1\n"
         "  ^~~\n"},
        {__LINE__, "'+' line with nothing before it", {{"proj/deck.cir", "t\n+ 1k\n"}},
         "proj/deck.cir:2:1: error: continuation line '+' has no card before it to continue\n"
         "  + 1k\n"
         "  ^\n"},
        {__LINE__, "'+' line after a comment at the start",
         {{"proj/deck.cir", "t\n* header\n\t+ 1k\n"}},
         "proj/deck.cir:3:2: error: continuation line '+' has no card before it to continue\n"
         "  \t+ 1k\n"
         "  \t^\n"},
        {__LINE__, "unterminated .subckt",
         {{"proj/deck.cir", "t\n.subckt filt in out\nR1 in out 1k\n.end\n"}},
         "proj/deck.cir:2:1: error: unterminated .subckt 'filt': no .ends before the end of the "
         "file\n"
         "  .subckt filt in out\n"
         "  ^~~~~~~\n"},
        {__LINE__, ".ends without .subckt", {{"proj/deck.cir", "t\nR1 a 0 1\n.ends\n"}},
         "proj/deck.cir:3:1: error: '.ends' without a '.subckt'\n"
         "  .ends\n"
         "  ^~~~~\n"},
        {__LINE__, "unterminated .control",
         {{"proj/deck.cir", "t\nR1 a 0 1\n.control\nrun\n.end\n"}},
         "proj/deck.cir:3:1: error: unterminated .control block: no .endc before the end of the "
         "file\n"
         "  .control\n"
         "  ^\n"},
        {__LINE__, "unbalanced {", {{"proj/deck.cir", "t\nR1 a 0 {1k*2\n.end\n"}},
         "proj/deck.cir:2:8: error: unbalanced '{': the card ends before the matching '}'\n"
         "  R1 a 0 {1k*2\n"
         "         ^\n"},
        {__LINE__, "unterminated 'expr'", {{"proj/deck.cir", "t\nR1 a 0 '1k*2\n"}},
         "proj/deck.cir:2:8: error: unterminated quoted expression: no closing \"'\" before the "
         "end of the card\n"
         "  R1 a 0 '1k*2\n"
         "         ^\n"},
        {__LINE__, "missing include",
         {{"proj/deck.cir", "t\n.include models/missing.lib\nR1 a 0 1\n"}},
         "proj/deck.cir:2:10: error: cannot read included file 'proj/models/missing.lib': No "
         "such file or directory\n"
         "  .include models/missing.lib\n"
         "           ^~~~~~~~~~~~~~~~~~\n"},
        {__LINE__, "include cycle",
         {{"proj/deck.cir", "t\n.include b.inc\n"},
          {"proj/b.inc", ".include c.inc\n"},
          {"proj/c.inc", "R1 a 0 1\n.inc b.inc\n"}},
         "proj/c.inc:2:6: error: include cycle: proj/b.inc -> proj/c.inc -> proj/b.inc\n"
         "  .inc b.inc\n"
         "       ^~~~~\n"
         "proj/b.inc:1:10: note: included from here\n"
         "  .include c.inc\n"
         "           ^~~~~\n"
         "proj/deck.cir:2:10: note: included from here\n"
         "  .include b.inc\n"
         "           ^~~~~\n"},
        {__LINE__, "a library section that pulls itself through another section",
         {{"proj/deck.cir", "t\n.lib 'models.lib' mos\n"},
          {"proj/models.lib", ".lib MOS\n.lib 'models.lib' res\n.endl\n"
                              ".lib RES\n.lib 'models.lib' mos\n.endl\n"}},
         "proj/models.lib:5:6: error: include cycle: proj/models.lib (mos) -> proj/models.lib (res) "
         "-> proj/models.lib (mos)\n"
         "  .lib 'models.lib' mos\n"
         "       ^~~~~~~~~~~~\n"
         "proj/models.lib:2:6: note: included from here\n"
         "  .lib 'models.lib' res\n"
         "       ^~~~~~~~~~~~\n"
         "proj/deck.cir:2:6: note: included from here\n"
         "  .lib 'models.lib' mos\n"
         "       ^~~~~~~~~~~~\n"},
        {__LINE__, "a deck that includes itself", {{"proj/deck.cir", "t\n.include ./deck.cir\n"}},
         "proj/deck.cir:2:10: error: include cycle: proj/deck.cir -> proj/./deck.cir\n"
         "  .include ./deck.cir\n"
         "           ^~~~~~~~~~\n"},
        {__LINE__, "error inside an included file",
         {{"proj/deck.cir", "t\n.lib 'parts.lib' filters\n"},
          {"proj/parts.lib", ".lib filters\nC1 a\n.endl\n"}},
         "proj/parts.lib:2:1: error: too few fields for 'C1': expected C<name> n+ n- value, found "
         "1 after the name\n"
         "  C1 a\n"
         "  ^~\n"
         "proj/deck.cir:2:6: note: included from here\n"
         "  .lib 'parts.lib' filters\n"
         "       ^~~~~~~~~~~\n"},
        {__LINE__, "empty file", {{"proj/deck.cir", ""}},
         "proj/deck.cir:1:1: error: empty file: a deck needs a title line and cards\n  \n  ^\n"},
        {__LINE__, "binary data", {{"proj/deck.cir", std::string("t\nR1 a\0 0 1\n", 11)}},
         "proj/deck.cir:2:5: error: binary data (a NUL byte): this is not a SPICE deck\n"
         "  R1 a? 0 1\n"  // control bytes are shown as '?'
         "      ^\n"},
        {__LINE__, "missing deck", {},
         "proj/deck.cir: error: cannot read the deck file: No such file or directory\n"},
        // ngspice 39 cuts an include line at a comment marker, quotes or not (tried: both stop
        // it with ".include filename missing"), so a path with one is refused, file or not.
        {__LINE__, "a ';' in an include path",
         {{"proj/deck.cir", "t\n.include \"a;b.lib\"\n"}, {"proj/a;b.lib", "R9 x 0 1k\n"}},
         "proj/deck.cir:2:10: error: ngspice 39 strips comments from this line before it reads "
         "the file name, so the ';' in the path cuts it there (it stops with \".include filename "
         "missing\"); rename the file or folder\n"
         "  .include \"a;b.lib\"\n"
         "           ^~~~~~~~~\n"},
        {__LINE__, "a '//' in a .lib path", {{"proj/deck.cir", "t\n.lib 'sub//c.lib' fast\n"}},
         "proj/deck.cir:2:6: error: ngspice 39 strips comments from this line before it reads "
         "the file name, so the '//' in the path cuts it there (it stops with \".include filename "
         "missing\"); rename the file or folder\n"
         "  .lib 'sub//c.lib' fast\n"
         "       ^~~~~~~~~~~~\n"},
    };
}

TEST(Deck, BadInputRendersInFull) {
    for (const auto& row : bad_inputs()) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line << ": " << row.what);
        MemoryFileSystem fs;
        for (const auto& [path, text] : row.files) fs.add(path, text);
        try {
            load_deck("proj/deck.cir", fs);
            ADD_FAILURE() << "no DeckError";
        } catch (const DeckError& e) {
            EXPECT_EQ(render(e.diagnostic()), row.rendered);
        }
    }
}

// ngspice 39 stops on a dot card it does not know ("unimplemented control card - error",
// tried with .step, .backanno, .wave, .net, .hdl, .alter, .spinit, .mc_source, .protect;
// tests/sim/simulate_test.cpp runs one), so the deck is refused; in a .lib section, read only
// when a deck selects it, the card is a warning.
TEST(Deck, AnUnknownDotCardIsRefused) {
    MemoryFileSystem fs;
    fs.add("d.cir", "t\nR1 a 0 {rv}\n.param rv=1k\n.step param rv list 1k 2k\n.end\n");
    try {
        load_deck("d.cir", fs);
        ADD_FAILURE() << "no DeckError";
    } catch (const DeckError& e) {
        EXPECT_EQ(render(e.diagnostic()),
                  "d.cir:4:1: error: ngspice 39 does not know the dot card '.step' (it stops "
                  "with \"unimplemented control card\"); another simulator's card cannot be "
                  "scaled here: remove it or turn it into ngspice's own form\n"
                  "  .step param rv list 1k 2k\n"
                  "  ^~~~~\n");
    }
    fs.add("d/top.cir", "t\nV1 x 0 1\n.lib m.lib slow\n.end\n");
    fs.add("d/m.lib", ".lib fast\n.frobnicate 1 2\nR5 x 0 1k\n.endl fast\n.lib slow\nR6 x 0 2k\n"
                      ".endl slow\n");
    Deck deck = load_deck("d/top.cir", fs);
    EXPECT_EQ(render(deck.warnings),
              "d/m.lib:2:1: warning: ngspice 39 stops on the unknown dot card '.frobnicate' "
              "(\"unimplemented control card\") in a .lib section a deck selects; passes through "
              "unchanged\n"
              "  .frobnicate 1 2\n"
              "  ^~~~~~~~~~~\n");
}

// Another simulator's ".tran 0 5m 0 1u" (the step left to the simulator): ngspice 39 stops
// with "TSTEP is invalid, must be greater than zero" (tried).
TEST(Deck, ATransientStepOfZeroIsRefused) {
    MemoryFileSystem fs;
    fs.add("d.cir", "t\nR1 a 0 1\n.TRAN 0 5m 0 1u\n.end\n");
    try {
        load_deck("d.cir", fs);
        ADD_FAILURE() << "no DeckError";
    } catch (const DeckError& e) {
        EXPECT_EQ(render(e.diagnostic()),
                  "d.cir:3:7: error: a .tran step of 0: ngspice 39 stops with \"TSTEP is invalid, "
                  "must be greater than zero\"; give the printing step (such as the stop time / "
                  "1000)\n"
                  "  .TRAN 0 5m 0 1u\n"
                  "        ^\n");
    }
}

// Dot cards ngspice 39 reads that belong to no analysis (tried: each loads and runs).
TEST(Deck, OptranProtAndMacroAreKnown) {
    MemoryFileSystem fs;
    fs.add("d.cir", "t\n.optran 0 0 0 100n 10u 0\n.prot\n.unprot\nX1 a b rcm\n"
                    ".MACRO rcm p q\nR1 p q 1k\n.eom\n.end\n");
    Deck deck = load_deck("d.cir", fs);
    EXPECT_EQ(render(deck.warnings), "");
    std::vector<std::string> keywords;
    deck.visit_file(0, [&](const Card& c) {
        if (c.kind == CardKind::dot) keywords.push_back(card_keyword(c));
    });
    EXPECT_EQ(keywords, (std::vector<std::string>{".optran", ".prot", ".unprot", ".subckt",
                                                  ".ends", ".end"}));
}

// A card that starts with no letter is no element to ngspice 39: it stops the load with
// "unknown device type - error" (tried: '#pragma x', '# a comment'), so the deck is refused;
// in a .lib section, which ngspice reads only when a deck selects it (tried: a '#' line in
// the section not selected loads), it is a warning.
TEST(Deck, ACardStartingWithNoLetterIsRefused) {
    for (const char* line : {"#pragma x", "# a comment", "2r a 0 1"}) {
        SCOPED_TRACE(line);
        MemoryFileSystem fs;
        fs.add("d.cir", std::string("t\nR1 a 0 1\n") + line + "\n.end\n");
        try {
            load_deck("d.cir", fs);
            ADD_FAILURE() << "no DeckError";
        } catch (const DeckError& e) {
            EXPECT_EQ(e.diagnostic().line, 3);
            EXPECT_EQ(e.diagnostic().message,
                      fmt::format("ngspice 39 reads no card starting with '{}' (it stops with "
                                  "\"unknown device type\"); for a comment, start the line with "
                                  "'*'",
                                  line[0]));
        }
    }
    MemoryFileSystem fs;
    fs.add("d/top.cir", "t\nV1 x 0 1\n.lib m.lib slow\n.end\n");
    fs.add("d/m.lib", ".lib fast\n# vendor note\nR5 x 0 1k\n.endl fast\n.lib slow\nR6 x 0 2k\n"
                      ".endl slow\n");
    Deck deck = load_deck("d/top.cir", fs);
    EXPECT_EQ(render(deck.warnings),
              "d/m.lib:2:1: warning: ngspice 39 stops on a card starting with '#' (\"unknown "
              "device type\") in a .lib section a deck selects; passes through unchanged\n"
              "  # vendor note\n"
              "  ^\n");
}

TEST(Deck, TitleCardIsFreeText) {
    // ngspice 39 takes the rest of a .title line as text: quotes and braces in it are fine.
    MemoryFileSystem fs;
    std::string text = "t\n.title Bob's {first} \"filter\n.TITLE\nR1 a 0 1\n.end\n";
    fs.add("d.cir", text);
    Deck deck = load_deck("d.cir", fs);
    EXPECT_TRUE(deck.warnings.empty()) << render(deck.warnings);
    auto r = test::read_back(deck.top(), FileRole::deck);
    EXPECT_EQ(r.fault, "");
    EXPECT_EQ(r.rebuilt, text);
}

TEST(Deck, IncludesAndLibrariesAreLoadedOnce) {
    MemoryFileSystem fs;
    fs.add("p/top.cir",
           "t\n.include sub/models.inc\n.INC \"sub/models.inc\"\n.lib lib/parts.lib lowpass\n"
           "X1 in out lp5\n.end\n.include after_end.inc\n");
    fs.add("p/sub/models.inc", "* models\n.model swm sw vt=1\n");
    fs.add("p/lib/parts.lib",
           ".lib lowpass\n.subckt lp5 in out\nR1 in out 1k\nC1 out 0 1n\n.ends lp5\n.endl\n"
           ".lib highpass\n.include ../sub/models.inc\n.endl highpass\n");
    Deck deck = load_deck("p/top.cir", fs);
    ASSERT_EQ(deck.files.size(), 3u);
    EXPECT_EQ(deck.files[0].role, FileRole::deck);
    EXPECT_EQ(deck.files[1].source->path(), "p/sub/models.inc");
    EXPECT_EQ(deck.files[1].role, FileRole::include);
    EXPECT_EQ(deck.files[2].source->path(), "p/lib/parts.lib");
    ASSERT_EQ(deck.includes.size(), 4u);
    // Includes are recorded after the included file was read, so the nested one comes first
    // among those of parts.lib.
    std::vector<std::string> seen;
    for (const auto& inc : deck.includes)
        seen.push_back(fmt::format("{}->{} [{}] {}", inc.from_file, inc.target_file, inc.section,
                                   deck.files[inc.from_file].source->view(
                                       inc.path_token.begin, inc.path_token.end)));
    std::vector<std::string> expected{"0->1 [] sub/models.inc", "0->1 [] \"sub/models.inc\"",
                                      "2->1 [] ../sub/models.inc", "0->2 [lowpass] lib/parts.lib"};
    EXPECT_EQ(seen, expected);
    EXPECT_NE(deck.include_at(0, deck.includes[0].path_token.begin), nullptr);
    EXPECT_EQ(deck.include_at(0, 0), nullptr);
    EXPECT_TRUE(deck.warnings.empty()) << render(deck.warnings);
}

// ".lib file" with no section naming an existing file is the include form some other simulators use:
// read as an include, with a warning; a ".lib name" that names no file is a section header.
TEST(Deck, LibWithoutSectionNamingAFileIsAnInclude) {
    MemoryFileSystem fs;
    fs.add("d/top.cir", "t\n.lib parts.lib\n.lib notafile\n.endl\nR1 a 0 1k\n.end\n");
    fs.add("d/parts.lib", "* parts\n.model rm r rsh=10\n");
    Deck deck = load_deck("d/top.cir", fs);
    ASSERT_EQ(deck.files.size(), 2u);
    ASSERT_EQ(deck.includes.size(), 1u);
    EXPECT_EQ(deck.includes[0].section, "");
    EXPECT_EQ(render(deck.warnings),
              "d/top.cir:2:6: warning: .lib with a file name and no section is read as .include "
              "(ngspice 39 reads it so only with 'set ngbehavior=lt' or 'ps')\n"
              "  .lib parts.lib\n"
              "       ^~~~~~~~~\n");
}

TEST(Deck, CardKeyword) {
    SourceFile f("f.cir", "t\n.SubCkt x a\nRload a 0 1\n\n");
    std::vector<std::string> words;
    read_cards(f, FileRole::deck, [&](const Card& c) { words.push_back(card_keyword(c)); });
    EXPECT_EQ(words, (std::vector<std::string>{"", ".subckt", "rload", ""}));
}

TEST(Deck, EveryNetlistDeckLoads) {
    DiskFileSystem disk;
    for (const auto& path : test::netlist_files()) {
        if (!test::is_top_deck(path)) continue;
        SCOPED_TRACE(path.string());
        try {
            Deck deck = load_deck(path.string(), disk);
            for (const auto& f : deck.files) {
                auto r = test::read_back(*f.source, f.role);
                EXPECT_EQ(r.fault, "");
                EXPECT_TRUE(r.rebuilt == f.source->text()) << f.source->path();
            }
        } catch (const DeckError& e) {
            ADD_FAILURE() << render(e.diagnostic());
        }
    }
}

// Issue 10 §4: a library that pulls another section of its own file is no include cycle; a
// cycle is the same (file, section) pair twice on one chain (ngspice 39 manual §2.8 reads only
// the named section of a `.lib file section`).
TEST(Deck, LibrarySectionsOfTheirOwnFileAreNoCycle) {
    struct Case {
        int line;
        std::vector<std::pair<std::string, std::string>> files;  // [0] is the deck
        std::size_t loaded;                                       // files read
    };
    const Case cases[] = {
        {__LINE__,
         {{"deck.cir", "t\n.lib 'models.lib' MOS\n.end\n"},
          {"models.lib", ".lib RES\n.model rm r(r=1)\n.endl RES\n"
                         ".lib MOS\n.lib 'models.lib' RES\n.model cm c(c=1)\n.endl MOS\n"}},
         2},
        // The other section refers back, but from a section nobody asked for.
        {__LINE__,
         {{"deck.cir", "t\n.lib models.lib mos\n.end\n"},
          {"models.lib", ".lib mos\n.lib models.lib res\n.endl\n"
                         ".lib spare\n.lib models.lib mos\n.endl\n.lib res\n.endl\n"}},
         2},
        // Two sections of one library pull a second library, which pulls a third section
        // of the first back.
        {__LINE__,
         {{"deck.cir", "t\n.lib a.lib x\n.lib a.lib y\n.end\n"},
          {"a.lib", ".lib x\n.lib b.lib z\n.endl\n.lib y\n.lib b.lib z\n.endl\n.lib w\n.endl\n"},
          {"b.lib", ".lib z\n.lib a.lib w\n.endl\n"}},
         3},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "load_test.cpp:" << c.line);
        MemoryFileSystem fs;
        for (const auto& [path, text] : c.files) fs.add(path, text);
        try {
            Deck d = load_deck(c.files[0].first, fs);
            EXPECT_EQ(d.files.size(), c.loaded);
        } catch (const DeckError& e) {
            ADD_FAILURE() << render(e.diagnostic());
        }
    }
}

}  // namespace
}  // namespace deckscale
