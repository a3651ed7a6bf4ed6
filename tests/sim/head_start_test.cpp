// Tests of simulator processes started before their jobs (sim/head_start.hpp).
#include "sim/head_start.hpp"

#include <gtest/gtest.h>

#include <chrono>
#include <complex>
#include <string>
#include <vector>

#include "support/sim.hpp"

namespace deckscale {
namespace {

using namespace std::chrono_literals;
using test::make_job;
using test::no_children_left;
using test::ScratchDir;

// A resistive divider: out = 1/3 at every frequency (Ohm's law).
const std::vector<std::string> divider = {"divider", "V1 in 0 DC 0 AC 1", "R1 in out 2k",
                                          "R2 out 0 1k", ".ac dec 5 1 1k", ".end"};

::testing::AssertionResult divides_by_three(const SimOutcome& out) {
    if (out.status != SimStatus::ok)
        return ::testing::AssertionFailure() << to_string(out.status) << ": " << out.message;
    if (out.plots.size() != 1) return ::testing::AssertionFailure() << "want one plot";
    const SimVector* v = out.plots[0].find("out");
    if (!v || v->values.size() != 16) return ::testing::AssertionFailure() << "want 16 points";
    for (std::complex<double> x : v->values)
        if (std::abs(x - 1.0 / 3) > 1e-12) return ::testing::AssertionFailure() << x;
    return ::testing::AssertionSuccess();
}

TEST(SimHeadStart, WaitingProcessesTakeTheFirstJobsAndOthersAreForked) {
    std::vector<SimJob> jobs(3, make_job("divider", divider));
    {
        SimHeadStart head(2);
        ASSERT_EQ(head.waiting(), 2u);
        std::vector<SimOutcome> outs = simulate_all(jobs, 2, SimProcesses::direct, &head);
        EXPECT_EQ(head.waiting(), 0u);
        ASSERT_EQ(outs.size(), 3u);
        for (const SimOutcome& out : outs) EXPECT_TRUE(divides_by_three(out));
    }
    EXPECT_TRUE(no_children_left());
}

TEST(SimHeadStart, ProcessesNeverGivenAJobAreStoppedAndReaped) {
    {
        SimHeadStart head(2);
        EXPECT_EQ(head.waiting(), 2u);
    }
    EXPECT_TRUE(no_children_left());
    {
        SimHeadStart head(2);
        EXPECT_TRUE(divides_by_three(
            simulate_all({make_job("divider", divider)}, 1, SimProcesses::direct, &head)[0]));
        EXPECT_EQ(head.waiting(), 1u);
    }
    EXPECT_TRUE(no_children_left());
}

TEST(SimHeadStart, AJobTooLargeToHandOverWholeGetsAProcessOfItsOwn) {
    // About 4 MB of comment cards: more than a socket takes at once.
    std::vector<std::string> cards = divider;
    cards.insert(cards.begin() + 1, 40000, "* " + std::string(100, 'x'));
    SimHeadStart head(1);
    SimOutcome out = simulate_all({make_job("large", cards)}, 1, SimProcesses::direct, &head)[0];
    EXPECT_TRUE(divides_by_three(out));
    EXPECT_EQ(head.waiting(), 0u);  // the process that could not take it was stopped
}

TEST(SimHeadStart, JobsKeepTheirDirectoryFailuresAndDeadlines) {
    ScratchDir dir;
    dir.write("parts.inc", "R1 in out 2k\nR2 out 0 1k\n");
    SimJob include = make_job("include", {"divider", "V1 in 0 DC 0 AC 1", ".include parts.inc",
                                          ".ac dec 5 1 1k", ".end"});
    include.work_dir = dir.path.string();
    SimJob bad = make_job("bad", {"t", "V1 in 0 DC 1", "R1 in 0 1k", ".end"});
    SimJob slow = make_job("slow",
                           {"slow transient", "V1 in 0 SIN(0 1 1k)", "R1 in out 1k", "C1 out 0 1u",
                            ".tran 1n 10", ".end"},
                           300ms);
    std::vector<SimOutcome> outs;
    {
        SimHeadStart head(3);
        outs = simulate_all({include, bad, slow}, 3, SimProcesses::direct, &head);
    }  // processes still exiting after their results are reaped here
    EXPECT_TRUE(no_children_left());
    ASSERT_EQ(outs.size(), 3u);
    EXPECT_TRUE(divides_by_three(outs[0]));
    EXPECT_EQ(outs[1].status, SimStatus::run_failed) << outs[1].message;
    EXPECT_NE(outs[1].message.find("No job"), std::string::npos) << outs[1].message;
    EXPECT_EQ(outs[2].status, SimStatus::timed_out) << outs[2].message;
}

TEST(SimHeadStart, APlotLargerThanThePipeArrivesWhole) {
    // 100000 points x 4 vectors x 16 bytes: 6.4 MB through a pipe of at most 1 MB.
    std::vector<std::string> cards = divider;
    cards[4] = ".ac lin 100000 1 1meg";
    SimHeadStart head(1);
    SimOutcome out = simulate_all({make_job("long", cards)}, 1, SimProcesses::direct, &head)[0];
    ASSERT_EQ(out.status, SimStatus::ok) << out.message;
    ASSERT_EQ(out.plots.size(), 1u);
    const SimVector* f = out.plots[0].find("frequency");
    const SimVector* v = out.plots[0].find("out");
    ASSERT_TRUE(f && v);
    ASSERT_EQ(v->values.size(), 100000u);
    EXPECT_NEAR(f->values.back().real(), 1e6, 1e-3);  // ngspice adds the step 99999 times
    for (std::complex<double> x : v->values) ASSERT_LT(std::abs(x - 1.0 / 3), 1e-12);
}

}  // namespace
}  // namespace deckscale
