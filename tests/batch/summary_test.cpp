// The text summary: cases that missed their expectation and a totals line; a survey groups
// the refused decks by reason, most common first.
#include "batch/summary.hpp"

#include <gtest/gtest.h>

namespace deckscale {
namespace {

CaseResult result(std::size_t index, const std::string& name, CaseOutcome outcome, Expect expect,
                  std::vector<std::string> refusals = {}) {
    CaseResult r;
    r.index = index;
    r.name = name;
    r.expect = expect;
    r.outcome = outcome;
    r.worst = "ac out: relative error 1e-09 (tolerance 1e-06)";
    r.refusals = std::move(refusals);
    if (outcome == CaseOutcome::error)
        r.problems = {"a.cir:3:1: error: bad number\n  R1 a 0 1..k\n  ^"};
    if (outcome == CaseOutcome::refused) r.problems = {"some item(s) cannot be scaled exactly"};
    return r;
}

TEST(BatchSummary, SuiteListsOnlyTheCasesThatMissedTheirExpectation) {
    BatchReport r;
    r.name = "lib";
    r.suite_cases = 4;
    r.seconds = 2.04;
    r.cases = {result(0, "good", CaseOutcome::pass, Expect::pass),
               result(1, "meant to fail", CaseOutcome::fail, Expect::fail),
               result(2, "off", CaseOutcome::fail, Expect::pass),
               result(3, "bad", CaseOutcome::error, Expect::pass)};
    EXPECT_EQ(summary_text(r),
              "UNEXPECTED off: expected pass, got fail: worst ac out: relative error 1e-09 "
              "(tolerance 1e-06)\n"
              "UNEXPECTED bad: expected pass, got error: a.cir:3:1: error: bad number\n"
              "4 case(s): 1 equivalent, 2 not equivalent, 0 refused, 1 error(s); 2.0 s\n"
              "FAIL: 2 case(s) did not meet their expectation\n");
    r.cases.resize(2);
    r.shard = {2, 3};
    EXPECT_EQ(
        summary_text(r),
        "2 case(s) (shard 2/3 of 4): 1 equivalent, 1 not equivalent, 0 refused, 0 error(s); 2.0 s\n"
        "PASS: every case met its expectation\n");
}

TEST(BatchSummary, SurveyGroupsRefusalsByReason) {
    BatchReport r;
    r.survey = true;
    r.suite_cases = 5;
    r.seconds = 1;
    const std::string semi = "semiconductor devices have no exact scaling";
    const std::string ext = "EXTERNAL source";
    r.cases = {result(0, "a.cir", CaseOutcome::pass, Expect::none),
               result(1, "b.cir", CaseOutcome::refused, Expect::none, {ext, semi}),
               result(2, "c.cir", CaseOutcome::refused, Expect::none, {semi, semi}),
               result(3, "d.cir", CaseOutcome::error, Expect::none),
               result(4, "e.cir", CaseOutcome::fail, Expect::none)};
    EXPECT_EQ(summary_text(r),
              "scaled and verified (1):\n"
              "  a.cir  worst ac out: relative error 1e-09 (tolerance 1e-06)\n"
              "scaled, but the verification found differences (1):\n"
              "  e.cir  worst ac out: relative error 1e-09 (tolerance 1e-06)\n"
              "refused (2), by reason:\n"
              "  semiconductor devices have no exact scaling (2 deck(s)):\n"
              "    b.cir\n"
              "    c.cir\n"
              "  EXTERNAL source (1 deck(s)):\n"
              "    b.cir\n"
              "not read or not simulated (1):\n"
              "  d.cir  a.cir:3:1: error: bad number\n"
              "5 case(s): 1 equivalent, 1 not equivalent, 2 refused, 1 error(s); 1.0 s\n");
}

}  // namespace
}  // namespace deckscale
