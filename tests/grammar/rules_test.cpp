// Tests of the PEGTL grammars themselves: no rule can loop without consuming input
// (pegtl::analyze), and single rules match what they should, one row each.
#include <gtest/gtest.h>

#include <tao/pegtl.hpp>
#include <tao/pegtl/contrib/analyze.hpp>

#include "grammar/deck_grammar.hpp"
#include "grammar/number_grammar.hpp"

namespace deckscale {
namespace {

namespace pg = tao::pegtl;
namespace g = grammar;

TEST(Grammar, AnalyzeFindsNoProblems) {
    EXPECT_EQ(pg::analyze<g::deck_file>(), 0u);
    EXPECT_EQ(pg::analyze<g::include_file>(), 0u);
    EXPECT_EQ(pg::analyze<g::number::spice_number>(), 0u);
    EXPECT_EQ(pg::analyze<g::number::number_start>(), 0u);
}

struct RuleRow {
    int line;
    bool (*match)(const std::string&, std::size_t&);  // returns success, sets bytes left
    std::string input;
    bool success;
    std::size_t left;
};

template <typename Rule>
bool try_rule(const std::string& text, std::size_t& left) {
    pg::memory_input in(text, "row");
    bool ok = pg::parse<Rule>(in);
    left = in.size();
    return ok;
}

TEST(Grammar, RulesOneRowEach) {
    const RuleRow rows[] = {
        {__LINE__, try_rule<g::eol>, "\r\nx", true, 1},
        {__LINE__, try_rule<g::eol>, "\rx", false, 2},
        {__LINE__, try_rule<g::ws>, " \t\r x", true, 1},
        {__LINE__, try_rule<g::ws>, " \r\n", true, 2},  // CR of a CRLF is no blank
        {__LINE__, try_rule<g::comment_line>, "  * c\nR1", true, 2},
        {__LINE__, try_rule<g::comment_line>, "// c", true, 0},
        {__LINE__, try_rule<g::comment_line>, "R1 a", false, 4},
        {__LINE__, try_rule<g::blank_line>, " \t\r\nx", true, 1},
        {__LINE__, try_rule<g::word>, "13k,0", true, 2},
        {__LINE__, try_rule<g::word>, "3k$x y", true, 2},
        {__LINE__, try_rule<g::word>, "1k;c", true, 2},
        {__LINE__, try_rule<g::word>, "1k//c", true, 3},
        {__LINE__, try_rule<g::word>, "SW(VT", true, 3},
        {__LINE__, try_rule<g::brace_expr>, "{a*{b}}x", true, 1},
        {__LINE__, try_rule<g::brace_expr>, "{a +\n+ b} x", true, 2},
        {__LINE__, try_rule<g::squote_expr>, "'a +\n* c\n+ b' x", true, 2},
        {__LINE__, try_rule<g::continuation>, "\n* c\n\n  + 1k", true, 3},
        {__LINE__, try_rule<g::continuation>, " ; c\r\n+1k", true, 2},
        {__LINE__, try_rule<g::continuation>, "\\\\ \n 1k", true, 3},
        {__LINE__, try_rule<g::continuation>, "\nR2", false, 3},
        {__LINE__, try_rule<g::end_keyword>, ".END x", true, 2},
        {__LINE__, try_rule<g::end_keyword>, ".ends", false, 5},
        {__LINE__, try_rule<g::endc_keyword>, ".endc", true, 0},
        {__LINE__, try_rule<g::title_card>, ".title it's {x\nR1", true, 2},
        {__LINE__, try_rule<g::title_card>, ".titles x", false, 9},
        {__LINE__, try_rule<g::control_block>, ".control\nrun\n.endc\nR1", true, 2},
        {__LINE__, try_rule<g::bom>, "\xEF\xBB\xBFt", true, 1},
        {__LINE__, try_rule<g::number::spice_number>, "2.2MEGohm", true, 0},
        {__LINE__, try_rule<g::number::spice_number>, "1.2.3", false, 5},
        {__LINE__, try_rule<g::number::spice_number>, "4k7", false, 3},
        {__LINE__, try_rule<g::number::suffix>, "MILx", true, 1},
        {__LINE__, try_rule<g::number::suffix>, "Megx", true, 1},
        {__LINE__, try_rule<g::number::suffix>, "a", false, 1},  // no atto in ngspice 39
        {__LINE__, try_rule<g::number::exponent>, "D-3", true, 0},
        {__LINE__, try_rule<g::number::number_start>, "-.5x", true, 1},
        {__LINE__, try_rule<g::number::number_start>, ".x", false, 2},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        std::size_t left = 999;
        EXPECT_EQ(row.match(row.input, left), row.success);
        EXPECT_EQ(left, row.left);
    }
}

}  // namespace
}  // namespace deckscale
