// Variable substitution in behavioural expressions (shared notes "scaling-rules.md" §0:
// time -> time*Kf, hertz -> hertz/Kf, i(x) -> i(x)*Km, ddt(u) -> ddt(u)/Kf).
#include <gtest/gtest.h>

#include "scale/expression.hpp"

namespace deckscale {
namespace {

TEST(Expression, SubstitutesTimeHertzCurrentsAndDerivatives) {
    struct Row {
        int line;
        const char* in;
        double km, kf;
        const char* out;
        bool changed;
    };
    const Row rows[] = {
        {__LINE__, "v(out)*2", 3, 2, "v(out)*2", false},
        {__LINE__, "sin(2*pi*1k*time)", 1, 1000, "sin(2*pi*1k*(time*1000))", true},
        {__LINE__, "TIME+1", 1, 2, "(time*2)+1", true},
        {__LINE__, "v(a)/(1+hertz/1)", 1, 10, "v(a)/(1+(hertz/10)/1)", true},
        {__LINE__, "i(vsense)*2", 1000, 1, "(i(vsense)*1000)*2", true},
        {__LINE__, "I (Vs)", 10, 1, "(I (Vs)*10)", true},
        {__LINE__, "0.1*ddt(v(out))", 1, 4, "0.1*(ddt(v(out))/4)", true},
        {__LINE__, "ddt(time)", 1, 2, "(ddt((time*2))/2)", true},
        {__LINE__, "v(time)+vdb(hertz)", 5, 5, "v(time)+vdb(hertz)", false},  // node names
        {__LINE__, "timer*temper", 5, 5, "timer*temper", false},              // other names
        {__LINE__, "i(v1)*time", 1, 1, "i(v1)*time", false},                 // factors of 1
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << r.line << ": " << r.in);
        auto s = substitute_variables(r.in, {r.km, r.kf});
        EXPECT_EQ(s.text, r.out);
        EXPECT_EQ(s.changed, r.changed);
        EXPECT_TRUE(s.unsupported.empty());
    }
}

TEST(Expression, UnknownConstructsAreReported) {
    auto a = substitute_variables("idt(v(a))", {2, 3});
    ASSERT_EQ(a.unsupported.size(), 1u);
    EXPECT_EQ(a.unsupported[0], "'idt()' (not an ngspice 39 function)");
    auto b = substitute_variables("@r1[i]*2", {2, 3});
    ASSERT_EQ(b.unsupported.size(), 1u);
    EXPECT_EQ(b.unsupported[0], "device parameter reference '@...'");
}

TEST(Expression, FactorsAreWrittenAsProductsOrQuotients) {
    EXPECT_EQ(times_factor(1000), "*1000");
    EXPECT_EQ(times_factor(0.001), "/1000");
    EXPECT_EQ(times_factor(1), "*1");
    EXPECT_EQ(factor_text(2 * 3.141592653589793 * 1e3), "6283.18530717959");
}

}  // namespace
}  // namespace deckscale
