// Tests of the template path of simulate_all (sim/template.hpp): ngspice initialised once in a
// template process, every job in a fresh clone of it. Results must equal the direct path
// (simulate, one freshly forked child per job), and a job that fails in any way must leave the
// others, and the next simulate_all, unaffected.
#include "sim/template.hpp"

#include <gtest/gtest.h>
#include <sys/wait.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "sim/simulate.hpp"
#include "support/sim.hpp"

namespace deckscale {
namespace {

using namespace std::chrono_literals;

using test::make_job;

using test::no_children_left;
using test::ScratchDir;

const std::vector<std::string> rc_cards = {"RC low-pass",       "V1 in 0 DC 0 AC 1", "R1 in out 1k",
                                           "C1 out 0 159.155n", ".ac dec 10 1 1meg", ".end"};
// A band-pass with a controlled source, 1000 points (the size of the benchmark's pair).
const std::vector<std::string> band_pass_cards = {"10-element band-pass",
                                                  "V1 in 0 DC 0 AC 1",
                                                  "Rs in 1 50",
                                                  "L1 1 2 1u",
                                                  "C1 2 3 10n",
                                                  "C2 3 0 2.2n",
                                                  "L2 3 0 100n",
                                                  "C3 3 4 10n",
                                                  "L3 4 5 1u",
                                                  "E1 6 0 5 0 1",
                                                  "Rl 5 0 50",
                                                  ".ac lin 1000 100k 10meg",
                                                  ".end"};
// Two plots, real data: an operating point and a transient.
const std::vector<std::string> op_tran_cards = {
    "op and tran",  "V1 in 0 DC 10 PULSE(0 1 0 1n 1n 1 2)",
    "R1 in out 1k", "R2 out 0 3k",
    "C1 out 0 1u",  ".op",
    ".tran 1u 1m",  ".end"};

// Everything a caller can see is the same, bit for bit.
::testing::AssertionResult same_outcome(const SimOutcome& got, const SimOutcome& want) {
    if (got.status != want.status || got.message != want.message)
        return ::testing::AssertionFailure()
               << to_string(got.status) << " '" << got.message << "' vs " << to_string(want.status)
               << " '" << want.message << "'";
    if (got.log != want.log) return ::testing::AssertionFailure() << "logs differ";
    if (got.plots.size() != want.plots.size())
        return ::testing::AssertionFailure() << "plot counts differ";
    for (std::size_t p = 0; p < got.plots.size(); ++p) {
        const SimPlot& a = got.plots[p];
        const SimPlot& b = want.plots[p];
        if (a.name != b.name || a.analysis != b.analysis || a.vectors.size() != b.vectors.size())
            return ::testing::AssertionFailure() << "plot " << a.name << " differs";
        for (std::size_t v = 0; v < a.vectors.size(); ++v) {
            if (a.vectors[v].name != b.vectors[v].name || a.vectors[v].kind != b.vectors[v].kind ||
                a.vectors[v].values != b.vectors[v].values)
                return ::testing::AssertionFailure()
                       << "vector " << a.name << "." << a.vectors[v].name << " differs";
        }
    }
    return ::testing::AssertionSuccess();
}

TEST(SimTemplate, ResultsEqualTheDirectPath) {
    const SimJob rc = make_job("rc", rc_cards);
    const SimJob band_pass = make_job("band-pass", band_pass_cards);
    const SimJob op_tran = make_job("op+tran", op_tran_cards);
    // A verification pair, and more jobs than processes at a time.
    for (const std::vector<SimJob>& jobs :
         {std::vector<SimJob>{band_pass, band_pass}, std::vector<SimJob>{rc, band_pass, op_tran}}) {
        SCOPED_TRACE(jobs.size());
        std::size_t cloned = jobs_started_from_template();
        std::vector<SimOutcome> outs = simulate_all(jobs, 2, SimProcesses::from_template);
        EXPECT_EQ(jobs_started_from_template() - cloned, jobs.size());  // none fell back
        ASSERT_EQ(outs.size(), jobs.size());
        for (std::size_t i = 0; i < jobs.size(); ++i) {
            SCOPED_TRACE(jobs[i].label);
            EXPECT_EQ(outs[i].status, SimStatus::ok) << outs[i].message;
            EXPECT_FALSE(outs[i].plots.empty());
            EXPECT_TRUE(same_outcome(outs[i], simulate(jobs[i])));
        }
        // The lines ngspice printed when the template was initialised open each job's log.
        EXPECT_EQ(outs[0].log.at(1), "** ngspice-39 shared library");
        EXPECT_TRUE(no_children_left());
    }
}

TEST(SimTemplate, AutomaticUsesTheTemplateOnlyForMoreJobsThanProcesses) {
    std::vector<SimJob> jobs(3, make_job("rc", rc_cards));
    std::size_t cloned = jobs_started_from_template();
    std::vector<SimOutcome> outs = simulate_all(jobs, 3);
    EXPECT_EQ(jobs_started_from_template(), cloned);
    outs = simulate_all(jobs, 2);
    EXPECT_EQ(jobs_started_from_template() - cloned, 3u);
    for (const SimOutcome& out : outs) EXPECT_EQ(out.status, SimStatus::ok) << out.message;
    outs = simulate_all(jobs, 2, SimProcesses::direct);
    EXPECT_EQ(jobs_started_from_template() - cloned, 3u);
    for (const SimOutcome& out : outs) EXPECT_EQ(out.status, SimStatus::ok) << out.message;
    EXPECT_TRUE(no_children_left());
}

TEST(SimTemplate, WorkDirIncludesAndSpiceinitAsInTheDirectPath) {
    ScratchDir dir;
    dir.write(".spiceinit", "echo spiceinit-was-read\nset ngbehavior=lt\n");
    dir.write("parts.inc", "R1 in out 1k\nC1 out 0 159.155n\n");
    SimJob job = make_job("rc-include", {"RC low-pass", "V1 in 0 DC 0 AC 1", ".include parts.inc",
                                         ".ac dec 10 1 1meg", ".end"});
    job.work_dir = dir.path.string();
    SimJob missing = job;
    missing.work_dir = (dir.path / "missing").string();
    std::vector<SimOutcome> outs = simulate_all({job, missing}, 0, SimProcesses::from_template);
    ASSERT_EQ(outs.size(), 2u);
    EXPECT_EQ(outs[0].status, SimStatus::ok) << outs[0].message;
    EXPECT_TRUE(same_outcome(outs[0], simulate(job)));
    for (const std::string& line : outs[0].log)
        EXPECT_EQ(line.find("spiceinit-was-read"), std::string::npos);
    EXPECT_EQ(outs[1].status, SimStatus::load_failed);
    EXPECT_NE(outs[1].message.find("cannot enter directory"), std::string::npos) << outs[1].message;
}

TEST(SimTemplate, FailingJobsLeaveTheGoodOnesAndTheNextCallIntact) {
    ScratchDir dir;
    dir.write("crash.sh", "kill -SEGV $PPID\n");
    const std::string ac = ".ac dec 10 1 1meg";
    std::vector<SimJob> jobs = {
        make_job("good", band_pass_cards),
        // A numparam error poisons an ngspice instance for good (notes §7).
        make_job("undefined param", {"t", "V1 in 0 AC 1", "R1 in 0 {rval}", ac, ".end"}),
        make_job("quit",
                 {"t", "V1 in 0 AC 1", "R1 in 0 1k", ac, ".control", "quit", ".endc", ".end"}),
        make_job("crash", {"t", "V1 in 0 AC 1", "R1 in 0 1k", ac, ".control",
                           "shell exec sh crash.sh", ".endc", ".end"}),
        make_job(
            "slow",
            {"slow", "V1 in 0 SIN(0 1 1k)", "R1 in out 1k", "C1 out 0 1u", ".tran 1n 10", ".end"},
            300ms),
        make_job("good again", rc_cards),
    };
    jobs[3].work_dir = dir.path.string();
    const SimOutcome good = simulate(jobs[0]);
    const SimOutcome good_again = simulate(jobs[5]);
    ASSERT_EQ(good.status, SimStatus::ok) << good.message;

    for (unsigned parallel : {2u, 6u}) {
        SCOPED_TRACE(parallel);
        std::size_t cloned = jobs_started_from_template();
        std::vector<SimOutcome> outs = simulate_all(jobs, parallel, SimProcesses::from_template);
        EXPECT_EQ(jobs_started_from_template() - cloned, jobs.size());
        ASSERT_EQ(outs.size(), jobs.size());
        EXPECT_TRUE(same_outcome(outs[0], good));
        EXPECT_EQ(outs[1].status, SimStatus::controlled_exit) << outs[1].message;
        EXPECT_NE(outs[1].message.find("rval"), std::string::npos) << outs[1].message;
        EXPECT_EQ(outs[2].status, SimStatus::controlled_exit) << outs[2].message;
        EXPECT_EQ(outs[3].status, SimStatus::crashed) << outs[3].message;
        EXPECT_NE(outs[3].message.find("signal 11"), std::string::npos) << outs[3].message;
        EXPECT_EQ(outs[4].status, SimStatus::timed_out) << outs[4].message;
        EXPECT_TRUE(same_outcome(outs[5], good_again));
        EXPECT_TRUE(no_children_left());
    }
    // A later call starts a new template and is not touched by what went before.
    std::vector<SimOutcome> again =
        simulate_all({jobs[5], jobs[0]}, 2, SimProcesses::from_template);
    EXPECT_TRUE(same_outcome(again[0], good_again));
    EXPECT_TRUE(same_outcome(again[1], good));
    EXPECT_TRUE(no_children_left());
}

TEST(SimTemplate, InvalidCardsAndEmptyListsNeedNoProcess) {
    std::vector<SimOutcome> outs =
        simulate_all({make_job("bad", {"t", "R1 a\nb 1k", ".end"}), make_job("rc", rc_cards)});
    ASSERT_EQ(outs.size(), 2u);
    EXPECT_EQ(outs[0].status, SimStatus::load_failed);
    EXPECT_EQ(outs[1].status, SimStatus::ok) << outs[1].message;
    EXPECT_TRUE(simulate_all({}).empty());
    EXPECT_TRUE(no_children_left());
}

}  // namespace
}  // namespace deckscale
