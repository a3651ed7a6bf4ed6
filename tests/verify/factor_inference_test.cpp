// Km and Kf read off a pair of decks, and the element whose ratio disagrees.
#include <cmath>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "deck/load.hpp"
#include "verify/factor_inference.hpp"

namespace deckscale {
namespace {

std::vector<ElementValue> values_of(const std::string& path, const std::string& text) {
    MemoryFileSystem fs;
    fs.add(path, text);
    return element_values(load_deck(path, fs));
}

const char* kOriginal =
    "band-pass section\n"
    "V1 in 0 dc 0 ac 1\n"
    "Rs in a 1\n"
    "L1 a b 2.5\n"
    "C1 b out c=0.4\n"
    "Rl out 0 r=1\n"
    "C2 out 0 1.5 ic=0\n"
    ".end\n";

TEST(ElementValues, ReadsPositionalAndKeyedValuesWithTheirLines) {
    auto v = values_of("o.cir", kOriginal);
    ASSERT_EQ(v.size(), 5u);
    struct Want {
        const char* name;
        char letter;
        double value;
        unsigned line;
        const char* text;
    };
    const Want want[] = {{"rs", 'r', 1, 3, "1"},     {"l1", 'l', 2.5, 4, "2.5"}, {"c1", 'c', 0.4, 5, "0.4"},
                         {"rl", 'r', 1, 6, "1"},     {"c2", 'c', 1.5, 7, "1.5"}};
    for (std::size_t i = 0; i < v.size(); ++i) {
        SCOPED_TRACE(want[i].name);
        EXPECT_EQ(v[i].name, want[i].name);
        EXPECT_EQ(v[i].letter, want[i].letter);
        EXPECT_EQ(v[i].value, want[i].value);
        EXPECT_EQ(v[i].file, "o.cir");
        EXPECT_EQ(v[i].line, want[i].line);
        EXPECT_EQ(v[i].text, want[i].text);
    }
}

TEST(ElementValues, SkipsParameterisedValues) {
    auto v = values_of("p.cir", "p\n.param rv=1k\nR1 a 0 {rv}\nC1 a 0 1n\n.end\n");
    ASSERT_EQ(v.size(), 1u);
    EXPECT_EQ(v[0].name, "c1");
}

// The original scaled by hand with Km = 50, Kf = 2e6 (C / 1e8, L x 2.5e-5).
const char* kScaled =
    "band-pass section\n"
    "V1 in 0 dc 0 ac 1\n"
    "Rs in a 50\n"
    "L1 a b 62.5u\n"
    "C1 b out c=4n\n"
    "Rl out 0 r=50\n"
    "C2 out 0 15n ic=0\n"
    ".end\n";

TEST(InferFactors, FromResistorsAndReactances) {
    auto o = values_of("o.cir", kOriginal), s = values_of("s.cir", kScaled);
    FactorInference f = infer_factors(o, s);
    ASSERT_TRUE(f.ok) << f.message;
    EXPECT_NEAR(f.km, 50, 1e-12);
    EXPECT_NEAR(f.kf, 2e6, 2e6 * 1e-12);
    EXPECT_EQ(f.resistor_pairs, 2);
    EXPECT_EQ(f.reactive_pairs, 3);
    EXPECT_TRUE(check_ratios(o, s, f.km, f.kf, 1e-9).empty());
}

TEST(InferFactors, OneCapacitorOffByOnePercentIsReportedWithItsLines) {
    std::string bad = kScaled;
    bad.replace(bad.find("15n"), 3, "15.15n");
    auto o = values_of("o.cir", kOriginal), s = values_of("s.cir", bad);
    FactorInference f = infer_factors(o, s);
    ASSERT_TRUE(f.ok);
    // The median of three reactive estimates ignores the one outlier.
    EXPECT_NEAR(f.kf, 2e6, 2e6 * 1e-12);
    auto m = check_ratios(o, s, f.km, f.kf, 1e-5);
    ASSERT_EQ(m.size(), 1u);
    EXPECT_EQ(m[0].original.name, "c2");
    EXPECT_EQ(m[0].original.file, "o.cir");
    EXPECT_EQ(m[0].original.line, 7u);
    EXPECT_EQ(m[0].scaled.file, "s.cir");
    EXPECT_EQ(m[0].scaled.line, 7u);
    EXPECT_EQ(m[0].scaled.text, "15.15n");
    EXPECT_NEAR(m[0].expected, 15e-9, 1e-21);
    EXPECT_NEAR(m[0].deviation, 0.01, 1e-12);
}

TEST(InferFactors, OnlyCapacitorsAndInductors) {
    auto o = values_of("o.cir", "lc\nL1 a b 2\nC1 b 0 3\n.end\n");
    auto s = values_of("s.cir", "lc\nL1 a b 0.4\nC1 b 0 0.006\n.end\n");  // Km = 10, Kf = 50
    FactorInference f = infer_factors(o, s);
    ASSERT_TRUE(f.ok);
    EXPECT_NEAR(f.km, 10, 1e-12);
    EXPECT_NEAR(f.kf, 50, 1e-12);
}

TEST(InferFactors, FailuresAndFallbacks) {
    struct Case {
        int line;
        std::string original, scaled;
        bool ok;
        std::string message;
        double km, kf;
    };
    const std::vector<Case> cases{
        {__LINE__, "x\nC1 a 0 1\n.end\n", "x\nC1 a 0 2\n.end\n", false,
         "no matched resistors (by name) to infer Km from; give --km and --kf", 1, 1},
        {__LINE__, "x\nC1 a 0 1\nC2 a 0 1\n.end\n", "x\nC1 a 0 2\nC2 a 0 2\n.end\n", false,
         "without matched resistors both a capacitor and an inductor are needed; give --km and --kf", 1, 1},
        {__LINE__, "x\nR1 a 0 1\nRx a 0 5\n.end\n", "x\nR1 a 0 7\nRy a 0 5\n.end\n", true,
         "no matched capacitors or inductors: Kf taken as 1", 7, 1},
    };
    for (const auto& k : cases) {
        SCOPED_TRACE(k.line);
        FactorInference f = infer_factors(values_of("o.cir", k.original), values_of("s.cir", k.scaled));
        EXPECT_EQ(f.ok, k.ok);
        EXPECT_EQ(f.message, k.message);
        if (k.ok) {
            EXPECT_NEAR(f.km, k.km, 1e-12);
            EXPECT_NEAR(f.kf, k.kf, 1e-12);
        }
    }
}

}  // namespace
}  // namespace deckscale
