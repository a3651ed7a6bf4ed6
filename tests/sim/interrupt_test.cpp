// Stopping simulations on request: the running children are killed, the jobs not yet started
// end at once, nothing is left behind, and without a check nothing changes.
#include "sim/interrupt.hpp"

#include <gtest/gtest.h>

#include <atomic>
#include <chrono>
#include <string>
#include <vector>

#include "sim/simulate.hpp"
#include "support/sim.hpp"

namespace deckscale {
namespace {

using test::make_job;

// A transient of 50 million steps: far longer than any test may wait.
SimJob endless(const std::string& label) {
    return make_job(label,
                    {"endless", "V1 in 0 SIN(0 1 1k)", "R1 in out 1k", "C1 out 0 1u",
                     ".tran 1n 50m", ".end"},
                    std::chrono::minutes(10));
}

TEST(SimInterrupt, ACheckThatSaysStopEndsEveryJobAndLeavesNoChild) {
    std::atomic<int> asked{0};
    auto start = std::chrono::steady_clock::now();
    // Stop once the children have run for a moment (the check is asked at least once a second).
    InterruptScope scope([&] {
        ++asked;
        return std::chrono::steady_clock::now() - start > std::chrono::milliseconds(300);
    });
    std::vector<SimJob> jobs{endless("a"), endless("b"), endless("c")};
    std::vector<SimOutcome> out = simulate_all(jobs, 2);
    ASSERT_EQ(out.size(), 3u);
    for (std::size_t i = 0; i < out.size(); ++i) {
        EXPECT_EQ(out[i].status, SimStatus::interrupted) << i << ": " << out[i].message;
        EXPECT_EQ(out[i].message, jobs[i].label + ": stopped on request");
    }
    EXPECT_GT(asked.load(), 0);
    // Within a few polls of the request, not after a job's 10-minute deadline.
    EXPECT_LT(std::chrono::steady_clock::now() - start, std::chrono::seconds(60));
    EXPECT_TRUE(test::no_children_left());
    EXPECT_STREQ(to_string(SimStatus::interrupted), "interrupted");
}

TEST(SimInterrupt, WithoutACheckOrWhenItSaysNoTheRunIsUnchanged) {
    EXPECT_FALSE(interrupt_requested());
    std::vector<std::string> rc = {"RC low-pass", "V1 in 0 DC 0 AC 1", "R1 in out 1k",
                                   "C1 out 0 159.155n", ".ac dec 10 1 1meg", ".end"};
    {
        InterruptScope never([] { return false; });
        SimOutcome o = simulate(make_job("rc", rc));
        EXPECT_EQ(o.status, SimStatus::ok) << o.message;
        {
            InterruptScope inner([] { return true; });
            EXPECT_TRUE(interrupt_requested());
            EXPECT_EQ(simulate(make_job("rc", rc)).status, SimStatus::interrupted);
        }
        EXPECT_FALSE(interrupt_requested());  // the outer check again
    }
    EXPECT_FALSE(interrupt_requested());
    EXPECT_EQ(simulate(make_job("rc", rc)).status, SimStatus::ok);
    EXPECT_TRUE(test::no_children_left());
}

}  // namespace
}  // namespace deckscale
