// How a parameter expression scales (scale/param_dims): its dimension as a combination of the
// parameters' dimensions, the side conditions, the number that carries a product of numbers,
// and the constructs whose scaling is not known. The rules are those of dimensional analysis
// (common practice): a product adds exponents, sqrt halves them, a sum and a comparison need
// equal ones, a transcendental function a dimensionless argument.
#include "scale/param_dims.hpp"

#include <gtest/gtest.h>

namespace deckscale {
namespace {

const char* const kNames[] = {"a", "b", "c"};

std::string form_text(const LinearForm& f) {
    std::string out;
    for (const auto& [id, k] : f) {
        if (!out.empty()) out += " ";
        if (k == Fraction::of(-1))
            out += "-";
        else if (k.den != 1)
            out += std::to_string(k.num) + "/" + std::to_string(k.den);
        else if (k.num != 1)
            out += std::to_string(k.num);
        out += id < 0 ? "#" + std::to_string(-id) : kNames[id];  // #n: a number with a unit
    }
    return out;
}

// "value | zero ; zero" or "opaque: why"
std::string describe(const DimAnalysis& a) {
    if (a.opaque) return "opaque: " + a.why;
    std::string out = form_text(a.value) + " |";
    for (std::size_t i = 0; i < a.zero.size(); ++i) out += (i ? " ; " : " ") + form_text(a.zero[i]);
    return out;
}

UserFunction parallel{{"x", "y"}, "x*y/(x+y)"};
UserFunction selfish{{"x"}, "me(x)"};

DimContext context() {
    return DimContext{[](const std::string& n) -> std::optional<int> {
                          for (int i = 0; i < 3; ++i)
                              if (n == kNames[i]) return i;
                          return std::nullopt;
                      },
                      [](const std::string& n) -> const UserFunction* {
                          if (n == "par") return &parallel;
                          if (n == "me") return &selfish;
                          return nullptr;
                      }};
}

TEST(ParamDims, ReadsTheScalingOfAnExpression) {
    struct Case {
        int line;
        const char* expr;
        const char* expected;
    };
    const Case cases[] = {
        {__LINE__, "a", "a |"},
        {__LINE__, "2*a/b", "a -b |"},
        {__LINE__, "a+b", "a | a -b"},
        {__LINE__, "a - 100", "a | a"},
        {__LINE__, "sqrt(a*b)", "1/2a 1/2b |"},
        {__LINE__, "a**2", "2a |"},
        {__LINE__, "a^-1", "-a |"},
        {__LINE__, "-a", "a |"},
        {__LINE__, "1/(2*3.14159*a*b)", "-a -b |"},
        {__LINE__, "exp(a/b)", " | a -b"},
        {__LINE__, "a > 1k ? b : c", "b | -#1 a ; b -c"},
        {__LINE__, "a*1k/10n + b", "-#2 #1 a | -#2 #1 a -b"},
        {__LINE__, "2.5*a*1e-3", "#1 a |"},
        {__LINE__, "min(a, b)", "a | a -b"},
        {__LINE__, "abs(a)", "a |"},
        {__LINE__, "pow(a, 3)", "3a |"},
        {__LINE__, "pow(a, b)", " | a ; b"},
        {__LINE__, "a % b", " | a ; b"},
        {__LINE__, "a == 1 && b", " | a ; b"},
        {__LINE__, "par(a, b)", "b | a -b"},
        {__LINE__, "2*par(a*c, b)", "b | a -b c"},
        {__LINE__, "v(a)*b", "opaque: 'v()', whose scaling is not known"},
        {__LINE__, "agauss(a, 0.1, 1)", "opaque: the random function agauss()"},
        {__LINE__, "time*a", "opaque: 'time' is not a parameter"},
        {__LINE__, "me(a)", "opaque: me() calls itself"},
        {__LINE__, "a*(", "opaque: an expression deckscale cannot read (an operand is missing)"},
        {__LINE__, "1k5*a",
         "opaque: an expression deckscale cannot read (cannot read the number '1k5')"},
        {__LINE__, "par(a)",
         "opaque: an expression deckscale cannot read (par() takes 2 argument(s))"},
    };
    for (const auto& c : cases)
        EXPECT_EQ(describe(analyze_dims(c.expr, context())), c.expected) << "line " << c.line;
}

TEST(ParamDims, OpaqueExpressionsStillNameTheirParameters) {
    auto a = analyze_dims("v(a)*b + par(c, 1)", context());
    ASSERT_TRUE(a.opaque);
    EXPECT_EQ(a.params, (std::set<int>{0, 1, 2}));
}

TEST(ParamDims, TooDeepANestingIsOpaqueNotACrash) {
    std::string deep = std::string(5000, '(') + "a" + std::string(5000, ')');
    auto a = analyze_dims(deep, context());
    EXPECT_TRUE(a.opaque);
    EXPECT_EQ(a.why, "an expression deckscale cannot read (nested too deeply)");
}

TEST(ParamDims, PowersThatOverflowAreOpaque) {
    std::string e = "a";
    for (int i = 0; i < 12; ++i) e = "(" + e + ")**64";
    auto a = analyze_dims(e, context());
    EXPECT_TRUE(a.opaque);
    EXPECT_EQ(a.why, "powers too large to follow");
}

// In a product of numbers only, the number with a suffix carries the scaling; with none or
// several, the last one (in the denominator it carries it inversely).
TEST(ParamDims, PicksTheNumberThatCarriesAProductOfNumbers) {
    struct Case {
        int line;
        const char* expr;
        const char* number;  // "" for none
        int power;
    };
    const Case cases[] = {
        {__LINE__, "10k", "10k", 1},
        {__LINE__, "2*3.14159265*1k", "1k", 1},
        {__LINE__, "1/(2*3.14159*10n*1k)", "1k", -1},
        {__LINE__, "1/(2*3.14159*4.7)", "4.7", -1},
        {__LINE__, "-5", "5", 1},
        {__LINE__, "1k+2k", "", 0},
        {__LINE__, "sqrt(2)*1k", "1k", 1},
        {__LINE__, "2**10", "", 0},
    };
    for (const auto& c : cases) {
        auto a = analyze_dims(c.expr, context());
        std::string_view e = c.expr;
        ASSERT_FALSE(a.opaque) << "line " << c.line;
        if (std::string(c.number).empty()) {
            EXPECT_FALSE(a.number) << "line " << c.line;
            continue;
        }
        ASSERT_TRUE(a.number) << "line " << c.line;
        EXPECT_EQ(e.substr(a.number->offset, a.number->length), c.number) << "line " << c.line;
        EXPECT_EQ(a.number->power, c.power) << "line " << c.line;
    }
}

}  // namespace
}  // namespace deckscale
