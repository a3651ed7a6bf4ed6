// The one-line worst vector of a verified case, as the batch report and JUnit XML show it.
#include "batch/case_run.hpp"

#include <gtest/gtest.h>

namespace deckscale {
namespace {

Comparison comparison(const char* analysis, const char* part, const char* vector, double worst,
                      double at, const char* unit, bool passed) {
    Comparison c;
    c.analysis = analysis;
    c.part = part;
    c.axis_unit = unit;
    VectorResult v;
    v.name = vector;
    v.kind = VectorKind::voltage;
    v.worst = worst;
    v.at = at;
    v.passed = passed;
    c.vectors.push_back(v);
    return c;
}

TEST(WorstVector, TheWorstAgainstItsToleranceWithWhereAndWhichPlot) {
    VerifyReport r;
    r.comparisons.push_back(comparison("ac", "", "out", 2e-9, 1e3, "Hz", true));
    r.comparisons.push_back(comparison("tran", "", "out", 5e-4, 2e-3, "s", true));  // of 1e-3
    EXPECT_EQ(worst_vector(r), "tran out: relative error 0.0005 at 0.002 s (tolerance 0.001)");
    // A distortion product names its plot; a failing vector ranks above any passing one, and
    // among failing ones the furthest beyond its tolerance.
    r.comparisons.push_back(comparison("tran", "", "in", 2e-3, 1e-3, "s", false));
    r.comparisons.push_back(comparison("disto", "2nd harmonic", "det", 0.99, 1e5, "Hz", false));
    EXPECT_EQ(worst_vector(r),
              "disto (2nd harmonic) det: relative error 0.99 at 100000 Hz (tolerance 1e-06)");
    r.comparisons.push_back(comparison("op", "", "vcc", 2e-6, 0, "", false));
    EXPECT_EQ(worst_vector(r),
              "disto (2nd harmonic) det: relative error 0.99 at 100000 Hz (tolerance 1e-06)");
}

}  // namespace
}  // namespace deckscale
