// The library's public surface for scaling: the same bytes as the command line, errors as the
// one diagnostic type, and never a write over a deck's own files.
#include "deckscale/scale.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <filesystem>
#include <numbers>

#include "support/common.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;
using test::read_bytes;
using test::run_binary;
using test::TempDir;
using test::write_bytes;

std::string demo_deck() { return test::source_dir() + "/netlists/demo/ladder5_proto.cir"; }

api::ScaleOptions demo_options() {
    api::ScaleOptions o;
    o.km = 50;
    o.kf = api::parse_factor("2*pi*10meg");
    return o;
}

TEST(ApiScale, TheDemoDeckIsTheCommandLinesOutputByteForByte) {
    TempDir dir;
    auto cli = run_binary({"scale", demo_deck(), "--km", "50", "--kf", "2*pi*10meg"}, dir.path());
    ASSERT_EQ(cli.exit_code, 0) << cli.err;
    api::Scaled one_pass = api::scale_file(demo_deck(), demo_options());
    api::Scaled two_steps = api::scale(api::read_deck(demo_deck()), demo_options());
    ASSERT_EQ(one_pass.files.size(), 1u);
    EXPECT_EQ(one_pass.text(), cli.out);
    EXPECT_EQ(two_steps.text(), cli.out);
    EXPECT_EQ(one_pass.files[0].path, "");
    EXPECT_EQ(one_pass.changes.size(), two_steps.changes.size());
    EXPECT_TRUE(one_pass.refusals.empty());
}

// The demo's 5th-order maximally flat prototype, g_k = 2 sin((2k-1) pi / 10) (Matthaei, Young
// & Jones 1964, sec. 4.05), at 50 Ohm and 10 MHz: C = g/(2 pi fc R0), L = g R0/(2 pi fc)
// (common practice).
TEST(ApiScale, TheChangeListHoldsTheDenormalizedLadder) {
    api::Scaled s = api::scale_file(demo_deck(), demo_options());
    const double r0 = 50, wc = 2 * std::numbers::pi * 10e6;
    int seen = 0;
    for (const auto& c : s.changes) {
        if (c.element.size() != 2 || (c.element[0] != 'C' && c.element[0] != 'L')) continue;
        int k = c.element[1] - '0';
        double g = 2 * std::sin((2 * k - 1) * std::numbers::pi / 10);
        double want = c.element[0] == 'C' ? g / (wc * r0) : g * r0 / wc;
        EXPECT_NEAR(std::stod(c.new_text) / want, 1, 1e-6) << c.element << " " << c.new_text;
        EXPECT_EQ(c.file, demo_deck());
        EXPECT_GT(c.line, 4u);
        ++seen;
    }
    EXPECT_EQ(seen, 5);
    EXPECT_NE(s.changes_text.find("C1  value  0.618034 -> "), std::string::npos) << s.changes_text;
    EXPECT_NE(s.changes_json.find("\"km\": 50"), std::string::npos);
}

TEST(ApiScale, IncludedCopiesAndRepointedIncludesEqualTheCommandLines) {
    TempDir dir;
    write_bytes(dir.file("proj/lib/parts.inc"), "R9 a 0 2k\n");
    write_bytes(dir.file("proj/d.cir"), "include test\n.include lib/parts.inc\nR1 a 0 1k\n.end\n");
    fs::create_directories(dir.file("cli"));
    auto cli = run_binary({"scale", "proj/d.cir", "--km", "10", "-o", "cli/out.cir"}, dir.path());
    ASSERT_EQ(cli.exit_code, 0) << cli.err;
    api::ScaleOptions o;
    o.km = 10;
    o.output = dir.file("lib/out.cir");
    fs::create_directories(dir.file("lib"));
    api::Scaled s = api::scale(api::read_deck(dir.file("proj/d.cir")), o);
    ASSERT_EQ(s.files.size(), 2u);
    EXPECT_EQ(s.files[0].path, dir.file("lib/parts-scaled.inc"));
    EXPECT_EQ(s.files[0].text, read_bytes(dir.file("cli/parts-scaled.inc")));
    EXPECT_EQ(s.files[1].path, dir.file("lib/out.cir"));
    EXPECT_EQ(s.files[1].text, read_bytes(dir.file("cli/out.cir")));
    EXPECT_FALSE(fs::exists(dir.file("lib/out.cir")));  // scale() writes nothing
    api::write(s);
    EXPECT_EQ(read_bytes(dir.file("lib/out.cir")), s.files[1].text);
    EXPECT_EQ(read_bytes(dir.file("lib/parts-scaled.inc")), s.files[0].text);
    // Without an output path, a changed include is an error, as for standard output.
    o.output.clear();
    try {
        api::scale(api::read_deck(dir.file("proj/d.cir")), o);
        ADD_FAILURE() << "no error";
    } catch (const DeckError& e) {
        EXPECT_EQ(e.diagnostic().line, 2u);
        EXPECT_EQ(e.diagnostic().column, 10u);
    }
}

TEST(ApiScale, ATextDeckReadsItsIncludesBesideItsName) {
    TempDir dir;
    write_bytes(dir.file("sub.inc"), "C2 a 0 1n\n");
    api::Deck d = api::read_text("t\n.include sub.inc\nR1 a 0 1k\n.end\n", dir.file("virtual.cir"));
    EXPECT_EQ(d.files().size(), 2u);
    EXPECT_EQ(d.text(1), "C2 a 0 1n\n");
    EXPECT_FALSE(fs::exists(dir.file("virtual.cir")));
    api::ScaleOptions o;
    o.km = 2;
    o.output = dir.file("out/v.cir");
    api::Scaled s = api::scale(d, o);
    ASSERT_EQ(s.files.size(), 2u);
    EXPECT_EQ(s.files[0].text, "C2 a 0 500p\n");
    EXPECT_EQ(s.text(), "t\n.include sub-scaled.inc\nR1 a 0 2k\n.end\n");
    // The output read back from memory, its include from memory too.
    api::Deck back = api::scaled_deck(s);
    EXPECT_EQ(back.path(), dir.file("out/v.cir"));
    EXPECT_EQ(back.text(1), "C2 a 0 500p\n");
    EXPECT_FALSE(fs::exists(dir.file("out")));
}

TEST(ApiScale, BadInputThrowsTheDiagnosticWithItsPlace) {
    try {
        api::ScaleOptions two;
        two.km = 2;
        api::scale(api::read_text("title\nR1 a 0 1.2.3k\n.end\n", "bad.cir"), two);
        ADD_FAILURE() << "no error";
    } catch (const DeckError& e) {
        const Diagnostic& d = e.diagnostic();
        EXPECT_EQ(d.file, "bad.cir");
        EXPECT_EQ(d.line, 2u);
        EXPECT_EQ(d.column, 8u);
        EXPECT_EQ(render(d).rfind("bad.cir:2:8: error: ", 0), 0u) << render(d);
        EXPECT_NE(render(d).find("R1 a 0 1.2.3k\n"), std::string::npos);
    }
    EXPECT_THROW(api::read_deck("/nonexistent/deck.cir"), DeckError);
    EXPECT_THROW(api::parse_factor("-2"), DeckError);
    EXPECT_THROW(api::parse_factor("fifty"), DeckError);
    EXPECT_DOUBLE_EQ(api::parse_factor("1/50"), 0.02);
    api::ScaleOptions o;
    o.km = 0;
    EXPECT_THROW(api::scale_file(demo_deck(), o), DeckError);
    o.km = 1;
    o.digits = 2;
    EXPECT_THROW(api::scale_file(demo_deck(), o), DeckError);
}

TEST(ApiScale, WriteNeverReplacesAFileTheDeckWasReadFrom) {
    TempDir dir;
    const std::string deck = "t\nR1 a 0 1k\n.end\n";
    write_bytes(dir.file("d.cir"), deck);
    api::ScaleOptions o;
    o.km = 3;
    for (std::string target : {dir.file("d.cir"), dir.file("./d.cir"), std::string()}) {
        o.output = target;
        api::Scaled s = api::scale_file(dir.file("d.cir"), o);
        EXPECT_THROW(api::write(s), DeckError) << target;
    }
    fs::create_symlink(dir.file("d.cir"), dir.file("link.cir"));
    o.output = dir.file("link.cir");
    EXPECT_THROW(api::write(api::scale_file(dir.file("d.cir"), o)), DeckError);
    EXPECT_EQ(read_bytes(dir.file("d.cir")), deck);
}

TEST(ApiScale, ARefusedRunHasNoFilesAndWritesNothing) {
    TempDir dir;
    api::ScaleOptions o;
    o.km = 10;
    o.output = dir.file("out.cir");
    const char* deck = "t\nR1 a 0 1k\nY1 a 0 c 0 tm\n.end\n";
    api::Scaled s = api::scale(api::read_text(deck, dir.file("d.cir")), o);
    EXPECT_TRUE(s.refused());
    ASSERT_EQ(s.refusals.size(), 1u);
    EXPECT_EQ(s.refusals[0].line, 3u);
    EXPECT_THROW(api::write(s), DeckError);
    EXPECT_THROW(api::scaled_deck(s), DeckError);
    EXPECT_FALSE(fs::exists(dir.file("out.cir")));
    o.leave_unscalable = true;
    api::Scaled anyway = api::scale(api::read_text(deck, dir.file("d.cir")), o);
    EXPECT_FALSE(anyway.refused());
    EXPECT_NE(anyway.text().find("R1 a 0 10k\n* deckscale: left unscaled:"), std::string::npos);
}

}  // namespace
}  // namespace deckscale
