// The JSON report: a round trip keeps every field, and shard reports merge into the report
// of the whole suite, or are refused with the reason.
#include "batch/report.hpp"

#include <gtest/gtest.h>

#include <stdexcept>

namespace deckscale {
namespace {

CaseResult result(std::size_t index, const std::string& name, CaseOutcome outcome,
                  Expect expect = Expect::pass) {
    CaseResult r;
    r.index = index;
    r.name = name;
    r.deck = "refs/" + name + ".cir";
    r.km = 50;
    r.kf = 2e7 * 3.14159;
    r.expect = expect;
    r.outcome = outcome;
    r.seconds = 0.25 * static_cast<double>(index + 1);
    r.worst = outcome == CaseOutcome::pass || outcome == CaseOutcome::fail
                  ? "ac n2: relative error 0.01"
                  : "";
    if (outcome == CaseOutcome::refused) r.refusals = {"semiconductor model"};
    if (outcome != CaseOutcome::pass) r.problems = {"why " + name};
    r.report = {{"passed", outcome == CaseOutcome::pass}, {"km", 50}};
    return r;
}

BatchReport shard_of(std::vector<CaseResult> cases, unsigned k, unsigned n, std::size_t total) {
    BatchReport r;
    r.suite = "lib/suite.toml";
    r.name = "suite";
    r.shard = {k, n};
    r.suite_cases = total;
    r.cases = std::move(cases);
    r.seconds = k;
    return r;
}

TEST(BatchReport, JsonRoundTripKeepsEveryField) {
    BatchReport r = shard_of(
        {result(0, "a", CaseOutcome::pass), result(1, "b", CaseOutcome::fail, Expect::fail),
         result(2, "c", CaseOutcome::refused), result(3, "d", CaseOutcome::error)},
        2, 3, 9);
    BatchReport back = batch_from_json(batch_json(r));
    EXPECT_EQ(batch_json(back), batch_json(r));
    EXPECT_EQ(back.shard.k, 2u);
    EXPECT_EQ(back.shard.n, 3u);
    EXPECT_EQ(back.suite_cases, 9u);
    ASSERT_EQ(back.cases.size(), 4u);
    EXPECT_EQ(back.cases[1].expect, Expect::fail);
    EXPECT_EQ(back.cases[2].refusals, std::vector<std::string>{"semiconductor model"});
    EXPECT_EQ(back.cases[0].report, r.cases[0].report);
    EXPECT_EQ(back.unmet(), 2u);
    auto j = nlohmann::json::parse(batch_json(r));
    EXPECT_EQ(j["totals"]["unmet"], 2);
    EXPECT_EQ(j["totals"]["refused"], 1);
}

TEST(BatchReport, ShardsMergeIntoSuiteOrder) {
    auto a = result(0, "a", CaseOutcome::pass), b = result(1, "b", CaseOutcome::fail),
         c = result(2, "c", CaseOutcome::pass);
    BatchReport whole = shard_of({a, b, c}, 1, 1, 3);
    BatchReport merged = merge_reports({shard_of({b}, 2, 2, 3), shard_of({a, c}, 1, 2, 3)});
    EXPECT_EQ(merged.shard.n, 1u);
    merged.seconds = whole.seconds;
    EXPECT_EQ(batch_json(merged), batch_json(whole));
}

TEST(BatchReport, MergeRefusesReportsThatAreNotOneRun) {
    auto a = result(0, "a", CaseOutcome::pass), b = result(1, "b", CaseOutcome::pass);
    BatchReport other = shard_of({b}, 2, 2, 2);
    other.name = "other";
    struct Case {
        int line;
        std::vector<BatchReport> shards;
        std::string message;
    } cases[] = {
        {__LINE__,
         {shard_of({a}, 1, 2, 2)},
         "the reports hold 1 of the suite's 2 cases: a shard's report is missing"},
        {__LINE__, {shard_of({a}, 1, 2, 2), shard_of({a}, 1, 2, 2)}, "shard 1/2 is given twice"},
        {__LINE__,
         {shard_of({a}, 1, 2, 2), shard_of({a, b}, 2, 2, 2)},
         "case 'a' is in two reports"},
        {__LINE__,
         {shard_of({a}, 1, 2, 2), shard_of({b}, 2, 3, 2)},
         "the reports are not shards of one run: suite 'suite' (2 cases, 2 shards) and suite "
         "'suite' (2 cases, 3 "
         "shards)"},
        {__LINE__,
         {shard_of({a}, 1, 2, 2), other},
         "the reports are not shards of one run: suite 'suite' (2 cases, 2 shards) and suite "
         "'other' (2 cases, 2 "
         "shards)"},
        {__LINE__, {}, "no reports to merge"},
    };
    for (const auto& c : cases) {
        try {
            merge_reports(c.shards);
            ADD_FAILURE() << "line " << c.line << ": no error";
        } catch (const std::runtime_error& e) {
            EXPECT_EQ(std::string(e.what()), c.message) << "line " << c.line;
        }
    }
}

TEST(BatchReport, ReadingRefusesWhatIsNotAReport) {
    struct Case {
        int line;
        std::string text, start;
    } cases[] = {
        {__LINE__, "{", "not JSON: "},
        {__LINE__, "{\"cases\": []}", "not a batch report (no \"format\": \"deckscale-batch\")"},
        {__LINE__, "{\"format\": \"deckscale-batch\", \"version\": 1}", "not a batch report: "},
        {__LINE__, "{\"format\": \"deckscale-batch\", \"version\": 7}",
         "report version 7 is not known"},
    };
    for (const auto& c : cases) {
        try {
            batch_from_json(c.text);
            ADD_FAILURE() << "line " << c.line << ": no error";
        } catch (const std::runtime_error& e) {
            EXPECT_EQ(std::string(e.what()).rfind(c.start, 0), 0u)
                << "line " << c.line << ": " << e.what();
        }
    }
}

}  // namespace
}  // namespace deckscale
