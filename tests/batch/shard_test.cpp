// Shards: K/N parsing, a hash that is the same everywhere, and every case in exactly one shard.
#include "batch/shard.hpp"

#include <fmt/format.h>
#include <gtest/gtest.h>

#include <map>

namespace deckscale {
namespace {

TEST(BatchShard, ParsesKOverN) {
    struct Case {
        int line;
        const char* text;
        bool ok;
        unsigned k, n;
    } cases[] = {
        {__LINE__, "1/1", true, 1, 1},   {__LINE__, "3/8", true, 3, 8},
        {__LINE__, "8/8", true, 8, 8},   {__LINE__, "0/4", false, 0, 0},
        {__LINE__, "5/4", false, 0, 0},  {__LINE__, "1/0", false, 0, 0},
        {__LINE__, "1", false, 0, 0},    {__LINE__, "a/b", false, 0, 0},
        {__LINE__, "1/4x", false, 0, 0}, {__LINE__, "/4", false, 0, 0},
        {__LINE__, "-1/4", false, 0, 0},
    };
    for (const auto& c : cases) {
        auto s = parse_shard(c.text);
        ASSERT_EQ(s.has_value(), c.ok) << "line " << c.line;
        if (s) {
            EXPECT_EQ(s->k, c.k) << "line " << c.line;
            EXPECT_EQ(s->n, c.n) << "line " << c.line;
        }
    }
}

TEST(BatchShard, TheHashIsFnv1a64) {
    // Published FNV-1a 64-bit test vectors (Fowler, Noll, Vo: draft-eastlake-fnv, test suite).
    EXPECT_EQ(case_hash(""), 0xcbf29ce484222325ull);
    EXPECT_EQ(case_hash("a"), 0xaf63dc4c8601ec8cull);
    EXPECT_EQ(case_hash("foobar"), 0x85944171f73967e8ull);
}

TEST(BatchShard, EveryCaseIsInExactlyOneShard) {
    std::vector<SuiteCase> cases;
    for (int i = 0; i < 300; ++i) {
        SuiteCase c;
        c.name = fmt::format("refs/filter_{}.cir", i);
        c.index = static_cast<std::size_t>(i);
        cases.push_back(c);
    }
    for (unsigned n : {1u, 2u, 3u, 5u, 8u, 13u}) {
        std::map<std::size_t, int> seen;
        for (unsigned k = 1; k <= n; ++k) {
            auto part = shard_cases(cases, {k, n});
            // No shard is empty or holds most of the suite for these sizes.
            EXPECT_GT(part.size(), cases.size() / n / 3) << k << "/" << n;
            EXPECT_LT(part.size(), cases.size() / n * 3) << k << "/" << n;
            for (std::size_t i = 1; i < part.size(); ++i)
                EXPECT_LT(part[i - 1].index, part[i].index);
            for (const auto& c : part) ++seen[c.index];
        }
        ASSERT_EQ(seen.size(), cases.size()) << "n = " << n;
        for (const auto& [index, count] : seen)
            EXPECT_EQ(count, 1) << "case " << index << ", n = " << n;
    }
}

TEST(BatchShard, TheShardOfACaseDoesNotDependOnTheOtherCases) {
    SuiteCase a, b;
    a.name = "ladder";
    b.name = "notch";
    for (unsigned n : {2u, 3u, 7u}) {
        auto alone = shard_cases({a}, {static_cast<unsigned>(case_hash("ladder") % n) + 1, n});
        ASSERT_EQ(alone.size(), 1u);
        auto both = shard_cases({b, a}, {static_cast<unsigned>(case_hash("ladder") % n) + 1, n});
        EXPECT_TRUE(std::any_of(both.begin(), both.end(),
                                [](const SuiteCase& c) { return c.name == "ladder"; }));
    }
}

}  // namespace
}  // namespace deckscale
