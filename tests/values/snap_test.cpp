// Tests of snapping a deck to preferred values: the spelling of rewritten values, parts left
// alone, the series option; and the response change the `snap` command reports, confirmed by
// an independent ngspice run.
#include "values/snap.hpp"

#include <gtest/gtest.h>

#include <cstdio>
#include <regex>

#include "support/common.hpp"
#include "write/edit.hpp"

namespace deckscale {
namespace {

std::string snapped_text(const std::string& deck_text, const std::string& series,
                         SnapResult* result = nullptr) {
    test::TempDir dir;
    test::write_bytes(dir.file("d.cir"), deck_text);
    DiskFileSystem disk;
    Deck deck = load_deck(dir.file("d.cir"), disk);
    std::string error;
    auto s = parse_snap_series(series, error);
    EXPECT_TRUE(s) << error;
    SnapResult r = snap_deck(deck, *s);
    std::string out = apply_edits(deck.top().text(), r.edits[0]);
    if (result) *result = std::move(r);
    return out;
}

TEST(Snap, RoundsEachKindInItsSeriesKeepingTheSpelling) {
    struct {
        int line;
        const char* card;
        const char* series;
        const char* expected;
    } rows[] = {
        {__LINE__, "R1 a b 1.234k", "R=E96", "R1 a b 1.24k"},
        {__LINE__, "R1 a b 1234", "R=E96", "R1 a b 1240"},
        {__LINE__, "C1 a 0 542.9635pF", "C=E12", "C1 a 0 560pF"},
        {__LINE__, "C3 a 0 808.7704p", "C=E24", "C3 a 0 820p"},
        {__LINE__, "L2 a b 978.5059nH", "L=E12", "L2 a b 1uH"},
        {__LINE__, "L2 a b 978.5059nH", "R=E12", "L2 a b 978.5059nH"},  // L not chosen
        {__LINE__, "R7 a b 4.7k", "R=E3", "R7 a b 4.7k"},               // a member stays as written
        {__LINE__, "R2 a b r=2.05k", "r=e6", "R2 a b r=2.2k"},
    };
    for (const auto& r : rows) {
        std::string deck = std::string("t\n") + r.card + "\n.end\n";
        EXPECT_EQ(snapped_text(deck, r.series), std::string("t\n") + r.expected + "\n.end\n")
            << "line " << r.line;
    }
}

TEST(Snap, AnExpressionIsLeftAloneAndSaidSo) {
    SnapResult r;
    std::string out =
        snapped_text("t\n.param rv=1.234k\nR1 a b {2*rv}\nR2 a 0 1.234k\n.end\n", "R=E24", &r);
    EXPECT_EQ(out, "t\n.param rv=1.234k\nR1 a b {2*rv}\nR2 a 0 1.2k\n.end\n");
    ASSERT_EQ(r.left_alone.size(), 1u);
    EXPECT_EQ(r.left_alone[0].message, "'{2*rv}' is not a plain number: R1 is left as written");
    ASSERT_EQ(r.parts.size(), 1u);
    EXPECT_NEAR(r.parts[0].error(), 1.2 / 1.234 - 1, 1e-12);
}

TEST(Snap, AParameterThatIsOnlyPartsValuesIsRoundedAtItsDefinition) {
    SnapResult r;
    std::string out = snapped_text(
        "t\n.param rv=1.234k cv=3.3n\nR1 a b {rv}\nC1 b 0 ' CV '\nR2 b c r={rv}\nR3 c 0 "
        "4.99k\n.end\n",
        "R=E24,C=E6", &r);
    EXPECT_EQ(out,
              "t\n.param rv=1.2k cv=3.3n\nR1 a b {rv}\nC1 b 0 ' CV '\nR2 b c r={rv}\nR3 c 0 "
              "5.1k\n.end\n");
    EXPECT_TRUE(r.left_alone.empty());
    ASSERT_EQ(r.parts.size(), 3u);  // in file order: rv and cv at their definitions, then R3
    EXPECT_EQ(r.parts[0].name, "rv");
    EXPECT_EQ(r.parts[0].line, 2u);
    EXPECT_EQ(r.parts[0].elements, (std::vector<std::string>{"R1", "R2"}));
    EXPECT_EQ(r.parts[1].name, "cv");
    EXPECT_EQ(r.parts[1].new_text, "3.3n");  // an E6 member stays as written
    EXPECT_EQ(r.parts[1].elements, (std::vector<std::string>{"C1"}));
    EXPECT_EQ(r.parts[2].name, "R3");
    EXPECT_TRUE(r.parts[2].elements.empty());
}

// A parameter is rounded only when nothing but the whole value of parts of one kind uses it;
// otherwise every part using it is left alone, with the first other use named.
TEST(Snap, AParameterWithOtherUsesIsLeftAloneWithTheUseNamed) {
    struct {
        int line;
        const char* cards;
        const char* message;
    } rows[] = {
        {__LINE__, ".param rv=1.234k\nR1 a b {rv}\nR2 b 0 {rv/2}\n",
         "'{rv}' is parameter rv, which is also used in '{rv/2}' (R2, d.cir:4): R1 is left as "
         "written"},
        {__LINE__, ".param rv=1.234k\n.param rw={rv*3}\nR1 a b {rv}\n",
         "'{rv}' is parameter rv, which is used in the definition of rw (.param, d.cir:3): R1 is "
         "left as written"},
        {__LINE__, ".param rv=1.234k\nR1 a b {rv}\nC1 b 0 {rv}\n",
         "'{rv}' is parameter rv, which is the value of both a resistor (R1) and a capacitor (C1): "
         "R1 is left as written"},
        {__LINE__, ".param rv=1.234k\n.param rv=1.5k\nR1 a b {rv}\n",
         "'{rv}' is parameter rv, which is defined more than once: R1 is left as written"},
        {__LINE__, ".param rv={1k+234}\nR1 a b {rv}\n",
         "'{rv}' is parameter rv, which is defined as '{1k+234}', not as a plain number (.param, "
         "d.cir:2): R1 is left as written"},
        // '1mil' is 1e-3 in a .param but 25.4e-6 on an element line (deck-syntax notes).
        {__LINE__, ".param rv=1mil\nR1 a b {rv}\n",
         "'{rv}' is parameter rv, which is defined as '1mil', not as a plain number (.param, "
         "d.cir:2): R1 is left as written"},
        {__LINE__, ".param rv=1.234k\nR1 a b {rv}\n.ac dec 10 1 {rv}\n",
         "'{rv}' is parameter rv, which is also used in '{rv}' (.ac, d.cir:4): R1 is left as "
         "written"},
        {__LINE__, ".param rv=1.234k\nR1 a b {rv}\n.model rm r(rsh={rv})\n",
         "'{rv}' is parameter rv, which is also used in '{rv}' (.model, d.cir:4): R1 is left as "
         "written"},
        {__LINE__, ".param rv=1.234k\nR1 a b {rv}\n.if (rv > 1k)\n.endif\n",
         "'{rv}' is parameter rv, which decides an .if (.if, d.cir:4): R1 is left as written"},
        {__LINE__, ".param rv=1.234k\nR1 a b {rv}\n.control\nalterparam rv=2k\n.endc\n",
         "'{rv}' is parameter rv, which is used in a .control block (.control, d.cir:5): R1 is "
         "left as written"},
        {__LINE__, ".subckt arm a b params: rv=1.234k\nR1 a b {rv}\n.ends\n",
         "'{rv}' is parameter rv, which is a parameter of subcircuit arm: R1 is left as written"},
    };
    for (const auto& row : rows) {
        SnapResult r;
        std::string deck = std::string("t\n") + row.cards + ".end\n";
        EXPECT_EQ(snapped_text(deck, "R=E24,C=E12", &r), deck) << "line " << row.line;
        ASSERT_FALSE(r.left_alone.empty()) << "line " << row.line;
        std::string message =
            std::regex_replace(r.left_alone[0].message, std::regex("/[^ ]*/d\\.cir"), "d.cir");
        EXPECT_EQ(message, row.message) << "line " << row.line;
    }
}

TEST(Snap, SeriesOption) {
    struct {
        int line;
        const char* text;
        const char* error;
    } rows[] = {
        {__LINE__, "R=E96,C=E12,L=E12", ""},
        {__LINE__, "c=e192", ""},
        {__LINE__, "E24", ""},
        {__LINE__, "e12,R=E96", ""},
        {__LINE__, "R=E97",
         "'R=E97': write KIND=SERIES, KIND one of R, C, L and SERIES one of E3, E6, E12, "
         "E24, E48, E96, E192 (e.g. R=E96,C=E12,L=E12), or one series for every kind not "
         "named (E24, or E12,R=E96)"},
        {__LINE__, "Q=E12",
         "'Q=E12': write KIND=SERIES, KIND one of R, C, L and SERIES one of E3, E6, E12, "
         "E24, E48, E96, E192 (e.g. R=E96,C=E12,L=E12), or one series for every kind not "
         "named (E24, or E12,R=E96)"},
        {__LINE__, "E24,E12",
         "'E12': write KIND=SERIES, KIND one of R, C, L and SERIES one of E3, E6, E12, "
         "E24, E48, E96, E192 (e.g. R=E96,C=E12,L=E12), or one series for every kind not "
         "named (E24, or E12,R=E96)"},
    };
    for (const auto& r : rows) {
        std::string error;
        auto s = parse_snap_series(r.text, error);
        EXPECT_EQ(s.has_value(), *r.error == 0) << "line " << r.line;
        EXPECT_EQ(error, r.error) << "line " << r.line;
    }
    // A bare series is for every kind not named, wherever it stands.
    std::string error;
    auto all = parse_snap_series("E24", error);
    ASSERT_TRUE(all && all->r && all->c && all->l);
    EXPECT_EQ(all->r->n, 24);
    EXPECT_EQ(all->l->n, 24);
    auto mixed = parse_snap_series("C=E6,E12,R=E96", error);
    ASSERT_TRUE(mixed && mixed->r && mixed->c && mixed->l);
    EXPECT_EQ(mixed->r->n, 96);
    EXPECT_EQ(mixed->c->n, 6);
    EXPECT_EQ(mixed->l->n, 12);
}

// A 5th-order 0.5 dB Chebyshev low-pass, 50 Ohm, ripple band to 10 MHz, shunt-C first
// (g = 1.70577, 1.22963, 2.54083: Matthaei, Young & Jones 1964, sec. 4.05; denormalized
// C = g/(R0 wc), L = g R0/wc, common practice).
const char* kChebyshev =
    "chebyshev 0.5 dB n=5 50 ohm 10 MHz\n"
    "V1 in 0 dc 0 ac 2\n"
    "RS in n1 50\n"
    "C1 n1 0 542.9635p\n"
    "L2 n1 n2 978.5059n\n"
    "C3 n2 0 808.7704p\n"
    "L4 n2 out 978.5059n\n"
    "C5 out 0 542.9635p\n"
    "RL out 0 50\n"
    ".ac dec 50 100k 100meg\n"
    ".end\n";

// Runs ngspice on `deck` plus `extra` cards and returns the number after `label`.
double ngspice_number(const test::TempDir& dir, const std::string& deck, const std::string& extra,
                      const std::string& label) {
    // The deck's own .ac sweep goes: ngspice would run it too, and .meas reads the first plot.
    std::string text = std::regex_replace(test::read_bytes(deck), std::regex("\n\\.ac [^\n]*"), "");
    text.insert(text.rfind(".end"), extra);
    test::write_bytes(dir.file("referee.cir"), text);
    std::string cmd = test::ngspice_batch() + test::shell_quote(dir.file("referee.cir")) + " 2>&1";
    std::string out;
    if (FILE* p = popen(cmd.c_str(), "r")) {
        char buf[4096];
        while (std::size_t n = fread(buf, 1, sizeof buf, p)) out.append(buf, n);
        pclose(p);
    }
    std::smatch m;
    if (std::regex_search(out, m, std::regex(label + "\\s*=\\s*([-+0-9.eE]+)")))
        return std::stod(m[1]);
    ADD_FAILURE() << out;
    return 0;
}

TEST(SnapCommand, ChebyshevRippleChangeIsConfirmedByNgspice) {
    test::TempDir dir;
    test::write_bytes(dir.file("cheb.cir"), kChebyshev);
    test::RunResult r = test::run_binary(
        {"snap", "cheb.cir", "--series", "C=E24,L=E24", "-o", "e24.cir", "--plot", "e24.svg"},
        dir.path());
    ASSERT_EQ(r.exit_code, 0) << r.out << r.err;
    EXPECT_NE(r.out.find("  C1              542.9635p           560p   +3.138%"), std::string::npos)
        << r.out;
    std::smatch m;
    ASSERT_TRUE(std::regex_search(r.out, m,
                                  std::regex("ripple     ideal ([0-9.]+) dB \\(deepest valley at "
                                             "[^)]*\\), rounded ([0-9.]+) dB \\(deepest valley at "
                                             "([0-9.]+) ([kM]?)Hz\\)")))
        << r.out;
    double ideal = std::stod(m[1]), rounded = std::stod(m[2]);
    double valley = std::stod(m[3]) * (m[4] == "M" ? 1e6 : m[4] == "k" ? 1e3 : 1);
    // The ideal ladder ripples by its design 0.5 dB (the dense sweep may miss the exact valley).
    EXPECT_NEAR(ideal, 0.5, 0.01);
    EXPECT_GT(std::abs(rounded - ideal), 0.01) << "rounding to E24 changes the ripple";
    // ngspice's own: the highest and lowest dB of the rounded deck from 100 kHz to just past
    // the deepest valley (ngspice 39 manual, .meas MAX/MIN with FROM/TO; .save all keeps the
    // vectors .meas reads).
    std::string cards = fmt::format(
        ".save all\n.ac lin 40001 100k {0:.9g}\n.meas ac top max vdb(out) from=100k to={0:.9g}\n"
        ".meas ac bottom min vdb(out) from=100k to={0:.9g}\n",
        valley * 1.02);
    double top = ngspice_number(dir, dir.file("e24.cir"), cards, "top");
    double bottom = ngspice_number(dir, dir.file("e24.cir"), cards, "bottom");
    EXPECT_NEAR(top - bottom, rounded, 0.005) << r.out;
    EXPECT_NE(r.out.find("    corner     "), std::string::npos) << r.out;
    // The overlay: both traces named, the rounded corner marked.
    std::string svg = test::read_bytes(dir.file("e24.svg"));
    EXPECT_NE(svg.find("out ideal dB"), std::string::npos);
    EXPECT_NE(svg.find("out rounded dB"), std::string::npos);
    EXPECT_NE(svg.find("rounded corner 10.3"), std::string::npos);
}

// The same ladder with its values as parameters (the symmetric C1 = C5 and L2 = L4 share one
// each): snap rounds the parameters, and ngspice reads the rounded parameter deck exactly
// as the rounded deck of written values.
TEST(SnapCommand, AParameterDeckRoundsAsTheDeckOfWrittenValues) {
    test::TempDir dir;
    std::string params = std::regex_replace(
        std::regex_replace(std::regex_replace(kChebyshev, std::regex(" 542\\.9635p"), " {cend}"),
                           std::regex(" 978\\.5059n"), " 'lmid'"),
        std::regex(" 808\\.7704p"), " {cmid}");
    params.insert(params.find("V1"), ".param cend=542.9635p lmid=978.5059n cmid=808.7704p\n");
    test::write_bytes(dir.file("cheb.cir"), kChebyshev);
    test::write_bytes(dir.file("param.cir"), params);
    for (const char* deck : {"cheb", "param"}) {
        test::RunResult r = test::run_binary({"snap", std::string(deck) + ".cir", "--series",
                                              "C=E24,L=E24", "-o", std::string(deck) + "_e24.cir"},
                                             dir.path());
        ASSERT_EQ(r.exit_code, 0) << r.out << r.err;
        EXPECT_EQ(r.err.find("left as written"), std::string::npos) << r.err;
        if (std::string(deck) == "param")
            EXPECT_NE(
                r.out.find("  cend            542.9635p           560p   +3.138%  .param, the "
                           "value of C1, C5"),
                std::string::npos)
                << r.out;
    }
    EXPECT_NE(
        test::read_bytes(dir.file("param_e24.cir")).find(".param cend=560p lmid=1u cmid=820p\n"),
        std::string::npos);
    std::string cards = ".save all\n.ac lin 3 1meg 20meg\n.meas ac at9 find vdb(out) at=9meg\n";
    double written = ngspice_number(dir, dir.file("cheb_e24.cir"), cards, "at9");
    double param = ngspice_number(dir, dir.file("param_e24.cir"), cards, "at9");
    EXPECT_NEAR(written, param, 1e-9);
    EXPECT_NE(written, ngspice_number(dir, dir.file("cheb.cir"), cards, "at9"));
}

// A ladder whose shunt capacitors live in an include: the rounded include is written beside
// the output as "<stem>-snapped<ext>" (the deck is not scaled), and one bare series names
// every kind.
TEST(SnapCommand, AnIncludeIsCopiedAsSnappedAndABareSeriesIsForEveryKind) {
    test::TempDir dir;
    std::string main = std::regex_replace(kChebyshev, std::regex("C1 n1 0 542\\.9635p\n"),
                                          ".include shunts.inc\n");
    test::write_bytes(dir.file("cheb.cir"), main);
    test::write_bytes(dir.file("shunts.inc"), "C1 n1 0 542.9635p\n");
    test::RunResult r = test::run_binary(
        {"snap", "cheb.cir", "--series", "E24", "-o", "out/e24.cir"}, dir.path());
    // The output folder must exist.
    EXPECT_EQ(r.exit_code, 2) << r.out << r.err;
    std::filesystem::create_directory(dir.file("out"));
    r = test::run_binary({"snap", "cheb.cir", "--series", "E24", "-o", "out/e24.cir"}, dir.path());
    ASSERT_EQ(r.exit_code, 0) << r.out << r.err;
    EXPECT_NE(r.out.find("(R=E24, C=E24, L=E24;"), std::string::npos) << r.out;
    EXPECT_EQ(test::read_bytes(dir.file("out/shunts-snapped.inc")), "C1 n1 0 560p\n");
    EXPECT_NE(test::read_bytes(dir.file("out/e24.cir")).find(".include shunts-snapped.inc\n"),
              std::string::npos);
    EXPECT_EQ(test::read_bytes(dir.file("shunts.inc")), "C1 n1 0 542.9635p\n");
}

// The report's node: 'out' unless --node names one. A deck without 'out' is still rounded
// and written, with a note that the response change is not shown (exit 0); a node named by
// --node that is not there is an error in the command (exit 2), the rounded deck written.
TEST(SnapCommand, AMissingReportNodeIsANoteUnlessNamed) {
    test::TempDir dir;
    test::write_bytes(dir.file("rc.cir"),
                      "rc\nV1 a 0 ac 1\nR1 a b 1.234k\nC1 b 0 1.11n\n.ac dec 10 1k 1meg\n.end\n");
    test::RunResult r =
        test::run_binary({"snap", "rc.cir", "--series", "E12", "-o", "e12.cir"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    EXPECT_NE(r.err.find("deckscale: note: rc.cir has no node 'out' in its AC results, so the "
                         "response change is not shown (--node names the node to report on)"),
              std::string::npos)
        << r.err;
    EXPECT_NE(test::read_bytes(dir.file("e12.cir")).find("R1 a b 1.2k\nC1 b 0 1.2n\n"),
              std::string::npos);
    r = test::run_binary({"snap", "rc.cir", "--series", "E12", "-o", "e12.cir", "--node", "x"},
                         dir.path());
    EXPECT_EQ(r.exit_code, 2) << r.out << r.err;
    EXPECT_NE(r.err.find("error: rc.cir has no node 'x' in its AC results (--node names"),
              std::string::npos)
        << r.err;
    r = test::run_binary({"snap", "rc.cir", "--series", "E12", "-o", "e12.cir", "--node", "b"},
                         dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    EXPECT_NE(r.out.find("response change at node b"), std::string::npos) << r.out;
}

}  // namespace
}  // namespace deckscale
