// Tests of verify_pair, the library call behind `verify` (and batch suites): its outcomes as
// data, never printed.
#include "verify/pair.hpp"

#include <gtest/gtest.h>

#include "support/common.hpp"

namespace deckscale {
namespace {

// A first-order RC low-pass at 1 kOhm / 159.155 nF (corner 1 kHz) and the same at
// Km = 10, Kf = 100: R x10, C / 1000 (common practice: R' = Km R, C' = C / (Km Kf)).
const char* kOriginal = "rc\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 159.155n\n.ac dec 10 10 100k\n.end\n";
const char* kScaled = "rc\nV1 in 0 DC 0 AC 1\nR1 in out 10k\nC1 out 0 159.155p\n.ac dec 10 1k 10meg\n.end\n";

TEST(VerifyPair, AnEquivalentPairIsComparedAndPasses) {
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"), kOriginal);
    test::write_bytes(dir.file("s.cir"), kScaled);
    PairRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");  // factors inferred from the R and C pairs
    DiskFileSystem disk;
    PairVerification v = verify_pair(r, disk);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    EXPECT_TRUE(v.report.factors_inferred);
    EXPECT_NEAR(v.report.km, 10, 1e-9);
    EXPECT_NEAR(v.report.kf, 100, 1e-9);
    EXPECT_TRUE(v.report.passed());
    ASSERT_NE(v.ac_original(), nullptr);
    ASSERT_NE(v.ac_scaled(), nullptr);
    EXPECT_NE(v.ac_original()->find("out"), nullptr);
}

TEST(VerifyPair, ProblemsAndFailuresComeBackAsData) {
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"), kOriginal);
    test::write_bytes(dir.file("s.cir"), kScaled);
    PairRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");
    r.drive = "V9";
    DiskFileSystem disk;
    PairVerification v = verify_pair(r, disk);
    EXPECT_EQ(v.outcome, PairVerification::Outcome::bad_input);
    ASSERT_EQ(v.problems.size(), 1u);
    EXPECT_EQ(v.problems[0], "--drive V9: no independent source of that name in " + r.original);

    test::write_bytes(dir.file("bad.cir"), "bad\nV1 in 0 DC 0 AC 1\nD1 in 0 nosuch\n.ac dec 5 10 1k\n.end\n");
    r.drive.clear();
    r.original = r.scaled = dir.file("bad.cir");
    r.factors_given = true;
    v = verify_pair(r, disk);
    EXPECT_EQ(v.outcome, PairVerification::Outcome::sim_failed);
    ASSERT_EQ(v.failures.size(), 2u);
    EXPECT_EQ(v.failures[0].analysis, "ac");
    EXPECT_EQ(v.failures[0].status, SimStatus::load_failed);
    EXPECT_NE(v.failures[0].message.find("nosuch"), std::string::npos) << v.failures[0].message;
}

}  // namespace
}  // namespace deckscale
