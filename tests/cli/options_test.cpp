// Tests of option parsing (parse_command_line, a pure function) and of the real binary:
// scaling by 1 reproduces every deck byte for byte, bad input exits with 2 and writes nothing.
#include "cli/options.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>

#include "support/common.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;
using test::read_bytes;
using test::run_binary;
using test::write_bytes;
using W = Invocation::What;

// ---- parse_command_line ----------------------------------------------------------------

TEST(Cli, ParseTable) {
    constexpr double pi = std::numbers::pi;
    struct {
        int line;
        std::vector<std::string> args;
        W what;
        double km, kf;
        const char* text;  // the usage error, or a piece of the help text
    } rows[] = {
        {__LINE__, {"--help"}, W::help, 1, 1, "deckscale"},
        {__LINE__, {}, W::help, 1, 1, "scale"},
        {__LINE__, {"scale", "--help"}, W::help, 1, 1, "--km"},
        {__LINE__, {"--version"}, W::version, 1, 1, "deckscale 0."},
        {__LINE__, {"scale", "d.cir", "--km", "50", "--kf", "2*pi*1k"}, W::scale, 50, 2 * pi * 1e3,
         ""},
        {__LINE__, {"scale", "d.cir", "--km", "1/50"}, W::scale, 1.0 / 50, 1, ""},
        {__LINE__, {"scale", "d.cir", "--kf", "2.2MEG"}, W::scale, 1, 2.2e6, ""},
        {__LINE__, {"scale", "--km", "2"}, W::usage_error, 1, 1, "DECK is required"},
        {__LINE__, {"scale", "d.cir", "--km", "0"}, W::usage_error, 1, 1,
         "--km: the factor must be positive, got '0'"},
        {__LINE__, {"scale", "d.cir", "--km", "-1"}, W::usage_error, 1, 1,
         "--km: the factor must be positive, got '-1'"},
        {__LINE__, {"scale", "d.cir", "--km", "abc"}, W::usage_error, 1, 1,
         "--km: 'abc' is not a number (write e.g. 1k, 2.2MEG, 2*pi*1k)"},
        {__LINE__, {"scale", "d.cir", "--kf", "1/0"}, W::usage_error, 1, 1,
         "--kf: '1/0' is not a number (write e.g. 1k, 2.2MEG, 2*pi*1k)"},
        {__LINE__, {"scale", "d.cir", "-i", "-o", "x.cir"}, W::usage_error, 1, 1,
         "-i/--in-place and -o/--output exclude each other"},
        {__LINE__, {"verify", "a.cir", "b.cir", "--max-step", "0"}, W::usage_error, 1, 1,
         "--max-step: the step must be positive, got '0'"},
        {__LINE__, {"verify", "a.cir", "b.cir", "--max-step", "1u?"}, W::usage_error, 1, 1,
         "--max-step: '1u?' is not a number (write e.g. 1k, 2.2MEG, 2*pi*1k)"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        Invocation inv = parse_command_line(row.args);
        EXPECT_EQ(inv.what, row.what) << inv.text;
        if (row.what == W::usage_error)
            EXPECT_NE(inv.text.find(row.text), std::string::npos) << inv.text;
        if (row.what == W::usage_error && std::string(row.text).starts_with("--"))
            EXPECT_EQ(inv.text, row.text);
        if (row.what == W::help || row.what == W::version)
            EXPECT_NE(inv.text.find(row.text), std::string::npos) << inv.text;
        if (row.what == W::scale) {
            EXPECT_EQ(inv.scale.deck, "d.cir");
            EXPECT_NEAR(inv.scale.km, row.km, row.km * 1e-15);
            EXPECT_NEAR(inv.scale.kf, row.kf, row.kf * 1e-15);
        }
    }
}

TEST(Cli, ScaleOptionsAreKept) {
    Invocation inv = parse_command_line({"scale", "d.cir", "-o", "out.cir", "--km", "1k"});
    ASSERT_EQ(inv.what, W::scale);
    EXPECT_EQ(inv.scale.output, "out.cir");
    EXPECT_EQ(inv.scale.km_text, "1k");
    EXPECT_FALSE(inv.scale.in_place);
    EXPECT_FALSE(inv.scale.follow_flicker);
    EXPECT_EQ(inv.scale.threads, 0u);  // one per core
    inv = parse_command_line({"scale", "d.cir", "--follow-flicker"});
    ASSERT_EQ(inv.what, W::scale);
    EXPECT_TRUE(inv.scale.follow_flicker);
    inv = parse_command_line({"scale", "-i", "d.cir", "--threads", "1"});
    ASSERT_EQ(inv.what, W::scale);
    EXPECT_TRUE(inv.scale.in_place);
    EXPECT_EQ(inv.scale.threads, 1u);
    EXPECT_EQ(parse_command_line({"scale", "d.cir", "--threads", "0"}).what, W::usage_error);
    // --hold: comma lists and repeats; the deck stays the positional argument.
    inv = parse_command_line({"scale", "--hold", "XU1,model:qn", "d.cir", "--hold", "subckt:op"});
    ASSERT_EQ(inv.what, W::scale) << inv.text;
    EXPECT_EQ(inv.scale.deck, "d.cir");
    EXPECT_EQ(inv.scale.hold, (std::vector<std::string>{"XU1", "model:qn", "subckt:op"}));
    inv = parse_command_line({"scale", "d.cir", "--hold", "chip:U1"});
    EXPECT_EQ(inv.what, W::usage_error);
    EXPECT_EQ(inv.text,
              "--hold 'chip:U1': the prefixes are model: and subckt: (a bare name is an element "
              "or X instance, else a .subckt, else a .model)");
}

TEST(Cli, VerifyMaxStepIsASpiceNumber) {
    Invocation inv = parse_command_line({"verify", "a.cir", "b.cir", "--max-step", "50n"});
    ASSERT_EQ(inv.what, W::verify) << inv.text;
    EXPECT_DOUBLE_EQ(inv.verify.max_step, 50e-9);
    inv = parse_command_line({"verify", "a.cir", "b.cir"});
    ASSERT_EQ(inv.what, W::verify) << inv.text;
    EXPECT_EQ(inv.verify.max_step, 0);  // as the .tran card says
}

// ---- the binary: scale by 1 -------------------------------------------------------------

TEST(Binary, ScaleByOneReproducesEveryNetlistDeck) {
    test::TempDir tmp;
    fs::copy(fs::path(test::source_dir()) / "netlists", tmp.path() / "netlists",
             fs::copy_options::recursive);
    int decks = 0;
    for (const auto& original : test::netlist_files()) {
        if (!test::is_top_deck(original)) continue;
        ++decks;
        SCOPED_TRACE(original.string());
        auto rel = fs::relative(original, fs::path(test::source_dir()) / "netlists");
        fs::path copy = tmp.path() / "netlists" / rel;
        // Written beside the deck, so that include paths need no repointing.
        auto r = run_binary({"scale", copy.filename().string(), "--km", "1", "--kf", "1", "-o",
                             "scaled-by-one.out"},
                            copy.parent_path());
        EXPECT_EQ(r.exit_code, 0) << r.err;
        EXPECT_TRUE(read_bytes(copy.parent_path() / "scaled-by-one.out") == read_bytes(original));
        fs::remove(copy.parent_path() / "scaled-by-one.out");
        EXPECT_TRUE(read_bytes(copy) == read_bytes(original));  // the input is untouched
    }
    EXPECT_GE(decks, 5);
}

TEST(Binary, ScaleByOneReproducesGeneratedDecks) {
    struct {
        int line;
        std::string text;
    } rows[] = {
        {__LINE__, "crlf\r\nV1 a 0 DC 1 AC 1\r\nR1 a b 1k\r\nC1 b 0 1n\r\n.ac dec 5 1k 1meg\r\n.end\r\n"},
        {__LINE__, "no final newline\nV1 a 0 1\nR1 a 0 1k\n.op\n.end"},
        {__LINE__, "\xEF\xBB\xBF" "bom\nV1 a 0 1\nR1 a 0 1k\n.op\n.end\n"},
        {__LINE__, "tabs\n\tV1\ta\t0\t1\nR13 a,b,13k\nR12 (b 0) 12k\n.op\n.end\n"},
        {__LINE__, "continuations\nV1 a 0\n* between\n\n  + DC 1\nR1 a 0 \\\\\n 1k\n"
                   "R2 a 0 {1k *\n+ 2}\nR3 a 0 '1k\n+ *3' ; c\n.op\n.end\n"},
        {__LINE__, "control\nV1 a 0 1\nR1 a 0 1k $ load\n.control\nop\nprint v(a)\n.endc\n"
                   ".end\n* after the end\n"},
        {__LINE__, "models\nV1 a 0 1\nS1 a 0 a 0 sw1\nS2 a 0 a 0 sw2\n"
                   ".model sw1 SW(VT=1 VH=0.1 RON=1 ROFF=1MEG)\n.model sw2 sw vt=1 vh=0.1\n.op\n.end\n"},
        {__LINE__, "big comment\n*" + std::string(5 * 1024 * 1024, '-') + "\nV1 a 0 1\nR1 a 0 1k\n"},
    };
    test::TempDir tmp;
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        write_bytes(tmp.path() / "gen.cir", row.text);
        fs::remove(tmp.path() / "gen.out");
        auto r = run_binary({"scale", "gen.cir", "--km", "1", "--kf", "1", "-o", "gen.out"},
                            tmp.path());
        EXPECT_EQ(r.exit_code, 0) << r.err;
        EXPECT_TRUE(read_bytes(tmp.path() / "gen.out") == row.text);
        // ...and to standard output.
        r = run_binary({"scale", "gen.cir", "--km", "1", "--kf", "1"}, tmp.path());
        EXPECT_EQ(r.exit_code, 0) << r.err;
        EXPECT_TRUE(r.out == row.text);
    }
}

// ---- the binary: bad input -------------------------------------------------------------

TEST(Binary, BadInputExitsWithTwoAndWritesNothing) {
    struct {
        int line;
        std::vector<std::pair<std::string, std::string>> files;  // [0] is deck.cir
        std::string err;  // standard error, in full
    } rows[] = {
        {__LINE__, {{"deck.cir", "t\nR1 a 0 1.2.3k\nV1 a 0 1\n.op\n.end\n"}},
         "deck.cir:2:8: error: malformed number '1.2.3k': ngspice 39 would silently read only "
         "'1.2'\n  R1 a 0 1.2.3k\n         ^~~~~~\n"},
        {__LINE__, {{"deck.cir", "t\nC1 a 0\n"}},
         "deck.cir:2:1: error: too few fields for 'C1': expected C<name> n+ n- value, found 2 "
         "after the name\n  C1 a 0\n  ^~\n"},
        {__LINE__, {{"deck.cir", "t\n  + 1k\n"}},
         "deck.cir:2:3: error: continuation line '+' has no card before it to continue\n"
         "    + 1k\n    ^\n"},
        {__LINE__, {{"deck.cir", "t\n.subckt s a\nR1 a 0 1\n"}},
         "deck.cir:2:1: error: unterminated .subckt 's': no .ends before the end of the file\n"
         "  .subckt s a\n  ^~~~~~~\n"},
        {__LINE__, {{"deck.cir", "t\nR1 a 0 1\n.control\nrun\n"}},
         "deck.cir:3:1: error: unterminated .control block: no .endc before the end of the "
         "file\n  .control\n  ^\n"},
        {__LINE__, {{"deck.cir", "t\nR1 a 0 {2*(1k\n"}},
         "deck.cir:2:8: error: unbalanced '{': the card ends before the matching '}'\n"
         "  R1 a 0 {2*(1k\n         ^\n"},
        {__LINE__, {{"deck.cir", "t\n.inc \"gone.inc\"\n"}},
         "deck.cir:2:6: error: cannot read included file 'gone.inc': No such file or directory\n"
         "  .inc \"gone.inc\"\n       ^~~~~~~~~~\n"},
        {__LINE__, {{"deck.cir", "t\n.include a.inc\n"}, {"a.inc", ".include deck.cir\n"}},
         "a.inc:1:10: error: include cycle: deck.cir -> a.inc -> deck.cir\n"
         "  .include deck.cir\n           ^~~~~~~~\n"
         "deck.cir:2:10: note: included from here\n  .include a.inc\n           ^~~~~\n"},
        {__LINE__, {{"deck.cir", ""}},
         "deck.cir:1:1: error: empty file: a deck needs a title line and cards\n  \n  ^\n"},
        {__LINE__, {{"deck.cir", std::string("\x7f" "ELF\x02\x01\x01\0\0\0", 10)}},
         "deck.cir:1:8: error: binary data (a NUL byte): this is not a SPICE deck\n"
         "  ?ELF??????\n         ^\n"},  // control bytes are shown as '?'

        {__LINE__, {}, "deck.cir: error: cannot read the deck file: No such file or directory\n"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        test::TempDir tmp;
        for (const auto& [name, text] : row.files) write_bytes(tmp.path() / name, text);
        auto r = run_binary({"scale", "deck.cir", "--km", "2", "--kf", "3", "-o", "out.cir"},
                            tmp.path());
        EXPECT_EQ(r.exit_code, 2);
        EXPECT_EQ(r.err, row.err);
        EXPECT_EQ(r.out, "");
        EXPECT_FALSE(fs::exists(tmp.path() / "out.cir"));
        std::size_t entries = std::distance(fs::directory_iterator(tmp.path()), {});
        EXPECT_EQ(entries, row.files.size());  // no temporary file left behind either
    }
}

TEST(Binary, UsageErrorsExitWithTwo) {
    test::TempDir tmp;
    write_bytes(tmp.path() / "d.cir", "t\nR1 a 0 1k\n.end\n");
    auto r = run_binary({"scale", "d.cir", "--km", "abc"}, tmp.path());
    EXPECT_EQ(r.exit_code, 2);
    EXPECT_EQ(r.err,
              "deckscale: error: --km: 'abc' is not a number (write e.g. 1k, 2.2MEG, 2*pi*1k)\n"
              "Run 'deckscale --help' for usage.\n");
    EXPECT_EQ(run_binary({"--version"}, tmp.path()).exit_code, 0);
}

TEST(Binary, OutputOnTheInputIsRefusedWithoutInPlace) {
    test::TempDir tmp;
    const std::string text = "t\nR1 a 0 1k\n.end\n";
    write_bytes(tmp.path() / "d.cir", text);
    auto r = run_binary({"scale", "d.cir", "--km", "2", "-o", "./d.cir"}, tmp.path());
    EXPECT_EQ(r.exit_code, 2);
    EXPECT_EQ(r.err,
              "deckscale: error: './d.cir' is the input deck; refusing to overwrite it (use "
              "-i/--in-place for that)\n");
    EXPECT_EQ(read_bytes(tmp.path() / "d.cir"), text);
}

TEST(Binary, InPlaceRewritesAtomically) {
    test::TempDir tmp;
    write_bytes(tmp.path() / "d.cir", "t\nV1 a 0 1\nR1 a 0 1k\n.op\n.end\n");
    auto r = run_binary({"scale", "-i", "d.cir", "--km", "2"}, tmp.path());
    EXPECT_EQ(r.exit_code, 0) << r.err;
    EXPECT_EQ(read_bytes(tmp.path() / "d.cir"), "t\nV1 a 0 1\nR1 a 0 2k\n.op\n.end\n");
    std::vector<std::string> names;
    for (const auto& e : fs::directory_iterator(tmp.path())) names.push_back(e.path().filename());
    EXPECT_EQ(names, std::vector<std::string>{"d.cir"});  // the temporary file was renamed
    // Scaling by 1 in place leaves every byte.
    r = run_binary({"scale", "-i", "d.cir", "--km", "1"}, tmp.path());
    EXPECT_EQ(r.exit_code, 0) << r.err;
    EXPECT_EQ(read_bytes(tmp.path() / "d.cir"), "t\nV1 a 0 1\nR1 a 0 2k\n.op\n.end\n");
}

}  // namespace
}  // namespace deckscale
