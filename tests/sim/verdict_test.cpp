// Tests of judging ngspice's printed lines (sim/verdict.hpp). The lines are as libngspice 39
// printed them in the runs of sim/simulate_test.cpp.
#include "sim/verdict.hpp"

#include <gtest/gtest.h>

#include <string>
#include <vector>

#include "sim/simulate.hpp"

namespace deckscale {
namespace {

TEST(SimVerdict, ErrorAndSubstitutionLines) {
    struct Case {
        const char* line;
        bool error, substitution, chatter;
    };
    const Case cases[] = {
        {"Error: circuit not parsed.", true, false, false},
        {"ERROR: AC startfreq <= 0", true, false, false},
        {"Fatal error: k1: coupling to non-existant inductor l2.", true, false, false},
        {"run simulation(s) aborted", true, false, false},
        {"Error: ngspice.dll cannot recover and awaits to be detached", true, false, false},
        {"Warning: r1: resistance to low, set to 1 mOhm", false, true, false},
        {"warning, can't find model 'nosuchmodel' from line", false, true, false},
        {"Circuit: rc low-pass", false, false, false},
        {"Note: Starting dynamic gmin stepping", false, false, true},
        {"Warning: Further gmin increment", false, false, true},
        {"Supplies reduced to   0.0000% ", false, false, true},
        {"", false, false, true},
        // A .meas card without a result (ngspice 39's words, tried): compared, not a failed run.
        {"Error: measure  dd failed:", false, false, false},
        {"Error: no such vector as idb(v1).", false, false, false},
        {"Error: syntax error for measure statement; expecting next field to be 'param'.", false,
         false, false},
    };
    for (const Case& c : cases) {
        SCOPED_TRACE(c.line);
        EXPECT_EQ(is_error_line(c.line), c.error);
        EXPECT_EQ(is_substitution_warning(c.line), c.substitution);
        EXPECT_EQ(is_chatter(c.line), c.chatter);
    }
    EXPECT_TRUE(is_measure_error("Error: measure  t1  WHEN(v(out)) : out of interval"));
    EXPECT_FALSE(is_measure_error("Error: circuit not parsed."));
}

TEST(SimVerdict, QuotingKeepsStderrProblemsOnce) {
    std::vector<PrintedLine> lines = {
        strip_channel("stdout Circuit: vv loop"),
        strip_channel("stderr Warning: singular matrix:  check node v1#branch"),
        strip_channel("stderr Warning: singular matrix:  check node v1#branch"),
        strip_channel("stderr Note: Starting source stepping"),
        strip_channel("stdout AC operating point failed -"),
        strip_channel("stderr run simulation(s) aborted\r"),
    };
    EXPECT_EQ(quote_problems(lines, 0, lines.size()),
              "Warning: singular matrix:  check node v1#branch\nrun simulation(s) aborted");
    EXPECT_EQ(quote_problems(lines, 0, 1), "");
    EXPECT_TRUE(any_problem(lines, 0, lines.size(), true));    // "aborted"
    EXPECT_FALSE(any_problem(lines, 0, lines.size(), false));  // no substitution warning
    EXPECT_FALSE(any_problem(lines, 0, 5, true));
    lines.push_back(strip_channel("stderr Warning: r1: resistance to low, set to 1 mOhm"));
    EXPECT_TRUE(any_problem(lines, 0, lines.size(), false));
    EXPECT_TRUE(any_problem(lines, 0, 99, false));  // a range past the end stops at the end
    std::vector<PrintedLine> many(20, strip_channel("stderr Error: x"));
    for (std::size_t i = 0; i < many.size(); ++i) many[i].text += std::to_string(i);
    std::string quoted = quote_problems(many, 0, many.size());
    EXPECT_NE(quoted.find("Error: x11\n(8 more lines in the log)"), std::string::npos) << quoted;
}

TEST(SimVerdict, ChannelPrefixAndTitles) {
    EXPECT_EQ(strip_channel("stderr Error: x").text, "Error: x");
    EXPECT_TRUE(strip_channel("stderr Error: x").to_stderr);
    EXPECT_FALSE(strip_channel("stdout Circuit: t").to_stderr);
    EXPECT_EQ(strip_channel(" Reference value :  3.28e+06\r").text, " Reference value :  3.28e+06");
    EXPECT_TRUE(same_title("RC Low-Pass ", "rc low-pass"));
    EXPECT_FALSE(same_title("RC low-pass", "rc low-pass 2"));
    EXPECT_EQ(std::string(to_string(SimStatus::controlled_exit)), "controlled exit");
    // ngspice 39 takes a .title card (even as the first line) as the circuit's title.
    EXPECT_EQ(expected_title({"first line", "R1 a 0 1", ".end"}), "first line");
    EXPECT_EQ(expected_title({".title foo", "R1 a 0 1", ".end"}), "foo");
    EXPECT_EQ(expected_title({"t", "  .TITLE  Bar baz ", ".end"}), "Bar baz");
    EXPECT_EQ(expected_title({"t", ".titles x", ".end"}), "t");
}

}  // namespace
}  // namespace deckscale
