// Lexemes of .control expressions, with their file offsets.
#include "scale/expression_lexer.hpp"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace deckscale {
namespace {

// Each lexeme as "kind:text@offset" (kinds by their enum order).
std::vector<std::string> lex(std::string_view text, std::uint32_t base = 100) {
    static const char* kinds[] = {"number", "name", "op",    "open", "close",
                                  "lbrack", "rbrack", "comma", "end",  "bad"};
    ExpressionLexer l(text, base);
    std::vector<std::string> out;
    for (int guard = 0; l.current().kind != Lexeme::end && guard < 100; ++guard) {
        out.push_back(std::string(kinds[l.current().kind]) + ":" +
                      std::string(l.current().text) + "@" + std::to_string(l.current().begin));
        if (l.current().kind == Lexeme::bad) break;
        l.next();
    }
    return out;
}

using V = std::vector<std::string>;

TEST(ExpressionLexer, NumbersNamesAndOperators) {
    EXPECT_EQ(lex("time gt 1.1m"), (V{"name:time@100", "name:gt@105", "number:1.1m@108"}));
    EXPECT_EQ(lex("$&x+2e-3"), (V{"name:$&x@100", "op:+@103", "number:2e-3@104"}));
    EXPECT_EQ(lex("@r1[i]*.5"), (V{"name:@r1[i]@100", "op:*@106", "number:.5@107"}));
    EXPECT_EQ(lex("v(out)<=v1#branch"),
              (V{"name:v@100", "open:(@101", "name:out@102", "close:)@105", "op:<=@106",
                 "name:v1#branch@108"}));
    EXPECT_EQ(lex("x[1,2]"), (V{"name:x@100", "lbrack:[@101", "number:1@102", "comma:,@103",
                                "number:2@104", "rbrack:]@105"}));
    EXPECT_EQ(lex("a ? b"), (V{"name:a@100", "bad:?@102"}));
}

TEST(ExpressionLexer, WordOperatorsInAnyCase) {
    ExpressionLexer l("AND", 0);
    EXPECT_TRUE(l.at_op({"and", "&"}));
    EXPECT_FALSE(l.at_op({"or"}));
}

}  // namespace
}  // namespace deckscale
