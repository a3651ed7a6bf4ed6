// Tests of scale-factor parsing: SPICE numbers, "pi", products and quotients.
#include "scale/factor.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <optional>

namespace deckscale {
namespace {

TEST(Factor, Table) {
    constexpr double pi = std::numbers::pi;
    struct {
        int line;
        const char* text;
        std::optional<double> value;
    } rows[] = {
        {__LINE__, "1", 1},
        {__LINE__, "50", 50},
        {__LINE__, "1k", 1e3},
        {__LINE__, "2.2MEG", 2.2e6},
        {__LINE__, "1e-3", 1e-3},
        {__LINE__, "pi", pi},
        {__LINE__, "PI", pi},
        {__LINE__, "2*pi*1k", 2 * pi * 1e3},
        {__LINE__, "2*pi*10meg", 2 * pi * 1e7},
        {__LINE__, "1/50", 1.0 / 50},
        {__LINE__, "1/2/5", 0.1},
        {__LINE__, "2 * pi", 2 * pi},
        {__LINE__, "0", 0},   // a number; the CLI refuses it as a factor
        {__LINE__, "-1", -1},
        {__LINE__, "", std::nullopt},
        {__LINE__, "abc", std::nullopt},
        {__LINE__, "1kOhm", std::nullopt},  // no unit letters in a factor
        {__LINE__, "4k7", std::nullopt},
        {__LINE__, "2*", std::nullopt},
        {__LINE__, "*2", std::nullopt},
        {__LINE__, "1/0", std::nullopt},
        {__LINE__, "2+3", std::nullopt},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line << ": '" << row.text << "'");
        auto v = parse_factor(row.text);
        ASSERT_EQ(v.has_value(), row.value.has_value());
        if (v) EXPECT_NEAR(*v, *row.value, std::fabs(*row.value) * 1e-15);
    }
}

}  // namespace
}  // namespace deckscale
