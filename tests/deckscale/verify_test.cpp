// The library's public surface for verification: a pair proven equivalent in forked ngspice
// children from a plain function call, decks on disk or still in memory.
#include "deckscale/verify.hpp"

#include <gtest/gtest.h>

#include "deckscale/scale.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

using test::run_binary;
using test::TempDir;

std::string demo_deck() { return test::source_dir() + "/netlists/demo/ladder5_proto.cir"; }

TEST(ApiVerify, TheDemoPairInMemoryPassesWithTheCommandLinesFigures) {
    api::ScaleOptions o;
    o.km = 50;
    o.kf = api::parse_factor("2*pi*10meg");
    api::Deck original = api::read_deck(demo_deck());
    api::Scaled s = api::scale(original, o);
    api::VerifyOptions v;
    v.km = o.km;
    v.kf = o.kf;
    api::Verification r = api::verify(original, api::scaled_deck(s), v);
    ASSERT_EQ(r.outcome, api::Verification::Outcome::compared);
    EXPECT_TRUE(r.passed) << r.text;
    ASSERT_EQ(r.analyses.size(), 1u);
    const api::AnalysisComparison& ac = r.analyses[0];
    EXPECT_EQ(ac.analysis, "ac");
    EXPECT_EQ(ac.points, 101u);  // dec 50 over two decades
    EXPECT_FALSE(ac.vectors.empty());
    for (const auto& vec : ac.vectors) EXPECT_LT(vec.worst, 1e-6) << vec.name;
    EXPECT_NE(r.json.find("\"passed\": true"), std::string::npos);

    // The same pair written to disk and verified by the command line: the same worst figures.
    TempDir dir;
    o.output = dir.file("scaled.cir");
    api::write(api::scale(original, o));
    auto cli = run_binary(
        {"verify", demo_deck(), dir.file("scaled.cir"), "--km", "50", "--kf", "2*pi*10meg"},
        dir.path());
    ASSERT_EQ(cli.exit_code, 0) << cli.err;
    api::Verification on_disk = api::verify(original, api::read_deck(dir.file("scaled.cir")), v);
    EXPECT_EQ(on_disk.text, cli.out);
}

TEST(ApiVerify, FactorsAreInferredOrGivenBoth) {
    api::ScaleOptions o;
    o.km = 600;
    o.kf = 3;
    api::Deck original = api::read_deck(demo_deck());
    api::Scaled s = api::scale(original, o);
    api::Verification r = api::verify(original, api::scaled_deck(s), {});
    ASSERT_EQ(r.outcome, api::Verification::Outcome::compared);
    EXPECT_TRUE(r.factors_inferred);
    EXPECT_NEAR(r.km, 600, 600e-9);
    EXPECT_NEAR(r.kf, 3, 3e-9);
    EXPECT_TRUE(r.passed) << r.text;
    api::VerifyOptions half;
    half.km = 600;
    EXPECT_THROW(api::verify(original, original, half), DeckError);
}

TEST(ApiVerify, AWrongFactorFailsAndBadInputIsReported) {
    api::Deck original = api::read_deck(demo_deck());
    api::ScaleOptions o;
    o.km = 2;
    api::Scaled s = api::scale(original, o);
    api::VerifyOptions v;
    v.km = 3;
    v.kf = 1;
    api::Verification r = api::verify(original, api::scaled_deck(s), v);
    ASSERT_EQ(r.outcome, api::Verification::Outcome::compared);
    EXPECT_FALSE(r.passed);
    v.km = 2;
    v.drive = "vnothere";
    api::Verification bad = api::verify(original, api::scaled_deck(s), v);
    EXPECT_EQ(bad.outcome, api::Verification::Outcome::bad_input);
    ASSERT_EQ(bad.problems.size(), 1u);
    EXPECT_NE(bad.problems[0].find("no independent source"), std::string::npos);
}

}  // namespace
}  // namespace deckscale
