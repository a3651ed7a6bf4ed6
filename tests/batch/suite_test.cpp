// Reading suite files: defaults and cases, globs, and every kind of bad suite reported at its
// place in the file (the full rendered text compared).
#include "batch/suite.hpp"

#include <gtest/gtest.h>

#include <string>

#include "deck/diagnostic.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

using test::TempDir;
using test::write_bytes;

const char* kDeck = "rc\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 1u\n.ac dec 10 10 10k\n.end\n";

// A folder with three decks and a scaled variant.
void write_library(const TempDir& dir) {
    write_bytes(dir.file("refs/a.cir"), kDeck);
    write_bytes(dir.file("refs/b.cir"), kDeck);
    write_bytes(dir.file("refs/notes.txt"), "not a deck\n");
    write_bytes(dir.file("scaled/a_50.cir"), kDeck);
    write_bytes(dir.file("scaled/b_50.cir"), kDeck);
}

std::string error_of(const TempDir& dir, const std::string& suite) {
    write_bytes(dir.file("s.toml"), suite);
    DiskFileSystem disk;
    try {
        load_suite(dir.file("s.toml"), disk);
    } catch (const DeckError& e) {
        return render(e.diagnostic());
    }
    return "(no error)";
}

TEST(BatchSuite, CasesTakeTheDefaultsAndOverrideThem) {
    TempDir dir;
    write_library(dir);
    write_bytes(
        dir.file("s.toml"),
        "[defaults]\nkm = 50\nkf = \"2*pi*1k\"\ntolerance = { ac = 1e-5, tran = 2e-3 }\n"
        "timeout = 5\nsweep = \"dec 5 1 1k\"\n\n"
        "[[case]]\ndeck = \"refs/a.cir\"\n\n"
        "[[case]]\nname = \"b vs kept\"\ndeck = \"refs/b.cir\"\nscaled = \"scaled/b_50.cir\"\n"
        "expect = \"fail\"\ntolerance = 1e-3\nmemory = 0\n\n"
        "[[case]]\nname = \"own\"\ndeck = \"refs/a.cir\"\nkm = 2\n");
    DiskFileSystem disk;
    Suite s = load_suite(dir.file("s.toml"), disk);
    ASSERT_EQ(s.cases.size(), 3u);
    EXPECT_EQ(s.name, "s");
    const SuiteCase& a = s.cases[0];
    EXPECT_EQ(a.name, "refs/a.cir");
    EXPECT_EQ(a.deck, dir.file("refs/a.cir"));
    ASSERT_TRUE(std::holds_alternative<FactorTarget>(a.target));
    EXPECT_EQ(std::get<FactorTarget>(a.target).km, 50);
    EXPECT_NEAR(std::get<FactorTarget>(a.target).kf, 2 * M_PI * 1000, 1e-9);
    EXPECT_EQ(std::get<FactorTarget>(a.target).kf_text, "2*pi*1k");
    EXPECT_EQ(a.tolerances.relative, 1e-5);
    EXPECT_EQ(a.tolerances.transient, 2e-3);
    EXPECT_EQ(a.timeout, std::chrono::milliseconds(5000));
    EXPECT_EQ(a.sweep, (std::vector<std::string>{"dec", "5", "1", "1k"}));
    EXPECT_EQ(a.expect, Expect::pass);
    const SuiteCase& b = s.cases[1];
    EXPECT_EQ(b.name, "b vs kept");
    EXPECT_EQ(b.index, 1u);
    ASSERT_TRUE(std::holds_alternative<ScaledTarget>(b.target));
    EXPECT_EQ(std::get<ScaledTarget>(b.target).path, dir.file("scaled/b_50.cir"));
    ASSERT_TRUE(std::get<ScaledTarget>(b.target).factors);  // from [defaults]: given, not inferred
    EXPECT_EQ(std::get<ScaledTarget>(b.target).factors->km, 50);
    EXPECT_EQ(b.expect, Expect::fail);
    EXPECT_EQ(b.tolerances.relative, 1e-3);
    EXPECT_EQ(b.memory_mb, 0u);
    // One factor of a case, the other from [defaults].
    EXPECT_EQ(std::get<FactorTarget>(s.cases[2].target).km, 2);
    EXPECT_NEAR(std::get<FactorTarget>(s.cases[2].target).kf, 2 * M_PI * 1000, 1e-9);
}

TEST(BatchSuite, AGlobMakesOneCasePerDeckInNameOrder) {
    TempDir dir;
    write_library(dir);
    write_bytes(
        dir.file("s.toml"),
        "[[case]]\ndeck = \"refs/*.cir\"\nkm = 10\nkf = 1\n\n"
        "[[case]]\nname = \"kept\"\ndeck = \"refs/*.cir\"\nscaled = \"scaled/{stem}_50.cir\"\n");
    DiskFileSystem disk;
    Suite s = load_suite(dir.file("s.toml"), disk);
    std::vector<std::string> names, scaled;
    for (const auto& c : s.cases) {
        names.push_back(c.name);
        if (auto* t = std::get_if<ScaledTarget>(&c.target)) scaled.push_back(t->path);
    }
    EXPECT_EQ(names, (std::vector<std::string>{"refs/a.cir", "refs/b.cir", "kept/a", "kept/b"}));
    EXPECT_EQ(scaled,
              (std::vector<std::string>{dir.file("scaled/a_50.cir"), dir.file("scaled/b_50.cir")}));
    EXPECT_FALSE(std::get<ScaledTarget>(s.cases[2].target).factors);  // inferred
}

TEST(BatchSuite, BadSuitesAreReportedAtTheirPlace) {
    TempDir dir;
    write_library(dir);
    const std::string at = dir.file("s.toml");
    struct Case {
        int line;
        std::string suite, expected;
    } cases[] = {
        {__LINE__, "[[case]]\ndeck = \"refs/a.cir\"\nkm = 2\nkf = 3\ntolerence = 1e-3\n",
         at + ":5:1: error: unknown key 'tolerence' in [[case]] (known: deck, drive, expect, hold, "
              "kf, km, memory, name, scaled, sweep, timeout, tolerance)\n  tolerence = 1e-3\n  ^\n"},
        {__LINE__, "[[case]]\ndeck = \"refs/a.cir\"\nscaled = \"scaled/a_50.cir\"\nhold = \"R1\"\n",
         at + ":4:8: error: 'hold' goes with 'km' and 'kf' (the case scales the deck); a kept "
              "scaled deck names its held parts itself\n  hold = \"R1\"\n         ^\n"},
        {__LINE__, "[[case]]\ndeck = \"refs/a.cir\"\nkm = 2\nkf = 3\nhold = [\"R1\", \"part:C1\"]\n",
         at + ":5:8: error: --hold 'part:C1': the prefixes are model: and subckt: (a bare name is "
              "an element or X instance, else a .subckt, else a .model)\n"
              "  hold = [\"R1\", \"part:C1\"]\n         ^\n"},
        {__LINE__, "[defaults]\nscaled = \"x.cir\"\n",
         at + ":2:1: error: unknown key 'scaled' in [defaults] (known: drive, expect, kf, km, "
              "memory, sweep, "
              "timeout, tolerance)\n  scaled = \"x.cir\"\n  ^\n"},
        {__LINE__, "[[case]]\ndeck = \"refs/missing.cir\"\nkm = 2\nkf = 3\n",
         at + ":2:8: error: deck '" + dir.file("refs/missing.cir") +
             "' does not exist\n  deck = \"refs/missing.cir\"\n         ^\n"},
        {__LINE__, "[[case]]\ndeck = \"refs/*.sp\"\nkm = 2\nkf = 3\n",
         at + ":2:8: error: 'refs/*.sp' matches no deck\n  deck = \"refs/*.sp\"\n         ^\n"},
        {__LINE__, "[[case]]\ndeck = \"refs/a.cir\"\nkm = \"fifty\"\nkf = 3\n",
         at + ":3:6: error: 'km': 'fifty' is not a number (write e.g. 1k, 2.2MEG, 2*pi*1k)\n  km = "
              "\"fifty\"\n"
              "       ^\n"},
        {__LINE__, "[[case]]\ndeck = 5\n",
         at + ":2:8: error: 'deck' must be a string, not an integer\n  deck = 5\n         ^\n"},
        {__LINE__,
         "[[case]]\ndeck = \"refs/a.cir\"\nscaled = \"scaled/a_50.cir\"\nexpect = \"maybe\"\n",
         at + ":4:10: error: 'expect' must be \"pass\" or \"fail\", not \"maybe\"\n  expect = "
              "\"maybe\"\n"
              "           ^\n"},
        {__LINE__, "[[case]]\ndeck = \"refs/a.cir\"\nkm = 2\n",
         at + ":1:1: error: this case has 'km' but not 'kf': give both\n  [[case]]\n  ^\n"},
        {__LINE__, "[[case]]\ndeck = \"refs/a.cir\"\n",
         at + ":1:1: error: this case needs 'scaled' (a rescaled deck) or 'km' and 'kf'\n  "
              "[[case]]\n  ^\n"},
        {__LINE__,
         "[[case]]\ndeck = \"refs/a.cir\"\nscaled = \"scaled/a_50.cir\"\nsweep = \"dec 5\"\n",
         "(sweep)"},
        {__LINE__,
         "[[case]]\ndeck = \"refs/a.cir\"\nscaled = \"scaled/a_50.cir\"\n[[case]]\n"
         "deck = \"refs/a.cir\"\nscaled = \"scaled/b_50.cir\"\n",
         at + ":5:8: error: a second case named 'refs/a.cir' (names choose shards: give 'name')\n"
              "  deck = \"refs/a.cir\"\n         ^\n"},
        {__LINE__,
         "[[case]]\ndeck = \"refs/a.cir\"\nkm = 2\nkf = 3\ntolerance = { ac = 1e-3, dc = 1 }\n",
         at + ":5:26: error: unknown key 'dc' in tolerance (known: ac, db, deg, tran)\n"
              "  tolerance = { ac = 1e-3, dc = 1 }\n                           ^\n"},
        {__LINE__, "[defaults]\nkm = 2\n[[case]]\ndeck = \"refs/a.cir\"\n",
         at + ":1:1: error: [defaults] has only one of 'km' and 'kf': give both\n  [defaults]\n  "
              "^\n"},
        {__LINE__, "[[cases]]\ndeck = \"refs/a.cir\"\n",
         at + ":1:3: error: unknown key 'cases' (a suite holds [defaults] and [[case]] tables)\n"
              "  [[cases]]\n    ^\n"},
        {__LINE__, "[defaults]\nkm = 2\nkf = 3\n",
         at + ":1:1: error: the suite has no [[case]]\n  [defaults]\n  ^\n"},
    };
    for (const auto& c : cases) {
        std::string got = error_of(dir, c.suite);
        if (c.expected == "(sweep)")  // the message is parse_sweep's own; its place is checked
            EXPECT_EQ(got.rfind(at + ":4:9: error: 'sweep': ", 0), 0u) << "line " << c.line << "\n"
                                                                       << got;
        else
            EXPECT_EQ(got, c.expected) << "line " << c.line;
    }
}

TEST(BatchSuite, BadTomlIsReportedWhereTheParserStopped) {
    // The message after "error: " is toml++ 3.3's own (Debian 12); the place and line are ours.
    TempDir dir;
    const std::string at = dir.file("s.toml");
    struct Case {
        int line;
        std::string suite, expected;
    } cases[] = {
        {__LINE__, "[[case]]\ndeck = \"refs/a.cir\nkm = 2\n",
         at + ":2:19: error: Error while parsing string: unescaped control characters other than "
              "TAB (U+0009) "
              "are explicitly prohibited\n  deck = \"refs/a.cir\n                    ^\n"},
        {__LINE__, "[[case]\n",
         at + ":1:8: error: Error while parsing table header: expected ']', saw '\\n'\n  [[case]\n "
              "        ^\n"},
        {__LINE__, "case = 5\n",
         at + ":1:8: error: 'case' must be an array of tables: [[case]]\n  case = 5\n         ^\n"},
    };
    for (const auto& c : cases) EXPECT_EQ(error_of(dir, c.suite), c.expected) << "line " << c.line;
}

TEST(BatchSuite, ASurveyTakesEveryDeckUnderTheFolder) {
    TempDir dir;
    write_library(dir);
    write_bytes(dir.file(".hidden/c.cir"), kDeck);
    Suite s = survey_suite(dir.path().string(), FactorTarget{10, 1000, "10", "1k"});
    std::vector<std::string> names;
    for (const auto& c : s.cases) {
        names.push_back(c.name);
        EXPECT_EQ(c.expect, Expect::none);
    }
    EXPECT_EQ(names, (std::vector<std::string>{"refs/a.cir", "refs/b.cir", "scaled/a_50.cir",
                                               "scaled/b_50.cir"}));
    EXPECT_TRUE(s.survey);
    EXPECT_THROW(survey_suite(dir.file("refs/a.cir"), FactorTarget{}), DeckError);
}

}  // namespace
}  // namespace deckscale
