// .param arithmetic as ngspice 39 evaluates it. The expected values marked "tried" were
// printed by ngspice 39 (`print @r1[resistance]` of `R1 x 0 {expr}` in `ngspice -b`).
#include "deck/param_eval.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <optional>
#include <string>

namespace deckscale {
namespace {

TEST(ParamEval, ExpressionsEvaluateAsNgspiceReadsThem) {
    struct Case {
        int line;
        std::string expr;
        std::optional<double> value;
    };
    ParamTable params;
    params.define("a", "2");
    params.define("B", "{a**3}");  // names are case-insensitive
    params.define("c", "'sqrt(16)+a^2'");
    const Case cases[] = {
        {__LINE__, "1k", 1e3},
        {__LINE__, "1meg/2", 5e5},  // tried: 500000
        {__LINE__, "1MEGohm", 1e6},
        {__LINE__, "1mil*1000", 1},  // tried: one suffix letter, so mil is milli here
        {__LINE__, "2.2uF", 2.2e-6},
        {__LINE__, "1e3*2", 2e3},
        {__LINE__, ".5e-3", 5e-4},
        {__LINE__, "b", 8},         // tried: {a**3} = 8
        {__LINE__, "c", 8},         // tried: 'sqrt(16)+a^2' = 8
        {__LINE__, "-a+10", 8},     // tried: 8
        {__LINE__, "2**3**2", 64},  // tried: left-associative
        {__LINE__, "-2**2+10", 6},  // tried: -(2**2)
        {__LINE__, "2**-1", 0.5},
        {__LINE__, "log(100)", std::log(100.0)},  // tried: 4.60517, natural logarithm
        {__LINE__, "log10(100)", 2},              // tried
        {__LINE__, "nint(2.5)", 2},               // tried
        {__LINE__, "int(-2.5)+10", 8},            // tried
        {__LINE__, "max(a, 3) * min(1, 2)", 3},
        {__LINE__, "(1 + 2) * (3 - 1) / 4", 1.5},
        {__LINE__, "1/(2*3.14159265358979*1k*1u)", 1 / (2 * 3.14159265358979 * 1e-3)},
        // No value: pi is unknown to ngspice 39 (tried: "Undefined parameter [pi]"), as are
        // unknown names; RKM and Fortran-exponent numbers stop ngspice (deck-syntax notes
        // from the ngspice-39.3 numparam reader); syntax errors.
        {__LINE__, "2*pi", std::nullopt},
        {__LINE__, "nope", std::nullopt},
        {__LINE__, "1k5", std::nullopt},
        {__LINE__, "1d3", std::nullopt},
        {__LINE__, "(1+2", std::nullopt},
        {__LINE__, "1+", std::nullopt},
        {__LINE__, "sqrt(1, 2)", std::nullopt},
        {__LINE__, "1/0", std::nullopt},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "param_eval_test.cpp:" << c.line << ": " << c.expr);
        auto v = params.evaluate(c.expr);
        ASSERT_EQ(v.has_value(), c.value.has_value());
        if (v) EXPECT_NEAR(*v, *c.value, 1e-12 * std::fabs(*c.value));
    }
}

TEST(ParamEval, TableIsOrderIndependentAndLaterDefinitionsWin) {
    struct Case {
        int line;
        std::string name;
        std::optional<double> value;
    };
    ParamTable params;
    params.define("r2", "{r1*2}");  // uses r1 before it is defined
    params.define("r1", "1k");
    params.define("r1", "3k");  // the later definition wins
    params.define("x", "{y+1}");
    params.define("y", "{x+1}");  // a cycle has no value
    const Case cases[] = {
        {__LINE__, "r1", 3e3},         {__LINE__, "r2", 6e3},         {__LINE__, "x", std::nullopt},
        {__LINE__, "y", std::nullopt}, {__LINE__, "z", std::nullopt},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "param_eval_test.cpp:" << c.line << ": " << c.name);
        auto v = params.value(c.name);
        ASSERT_EQ(v.has_value(), c.value.has_value());
        if (v) EXPECT_DOUBLE_EQ(*v, *c.value);
    }
}

}  // namespace
}  // namespace deckscale
