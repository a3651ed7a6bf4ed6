// Tests of what a simulator child may take from the machine and the user: a memory limit, a
// bound on what it prints, and an environment of its own.
#include <gtest/gtest.h>

#include <cstdlib>
#include <string>
#include <vector>

#include "sim/simulate.hpp"
#include "support/sim.hpp"

namespace deckscale {
namespace {

using test::make_job;

const std::vector<std::string> rc_cards = {"RC low-pass", "V1 in 0 DC 0 AC 1", "R1 in out 1k",
                                           "C1 out 0 159.155n", ".ac dec 10 1 1meg", ".end"};

bool rc_ran(const SimOutcome& out) {
    return out.status == SimStatus::ok && !out.plots.empty() && out.plots[0].find("out");
}

TEST(SimLimits, AChildOverItsMemoryLimitFailsAndTheNextRunWorks) {
    // 60 million doubles (480 MB) in a 400 MB address space: the allocation fails. (Filling
    // them without the limit takes a few seconds; the timeout leaves room for a loaded machine.)
    SimJob job = make_job("hungry", {"t", "V1 in 0 DC 1", "R1 in 0 1k", ".op", ".control",
                                     "let big = vector(60000000)", "echo still-alive", ".endc",
                                     ".end"},
                          std::chrono::seconds(120));
    job.memory_limit_mb = 400;
    SimOutcome out = simulate(job);
    EXPECT_NE(out.status, SimStatus::ok) << out.message;
    EXPECT_FALSE(out.message.empty());
    for (const std::string& line : out.log) EXPECT_EQ(line.find("still-alive"), std::string::npos);
    EXPECT_TRUE(rc_ran(simulate(make_job("rc", rc_cards))));
    // Without the limit the same deck runs (the limit, not the deck, stopped it).
    job.memory_limit_mb = 0;
    SimOutcome free = simulate(job);
    bool alive = false;
    for (const std::string& line : free.log) alive = alive || line == "still-alive";
    EXPECT_TRUE(alive) << free.message;
}

TEST(SimLimits, WhatNgspicePrintsIsBounded) {
    // 30,000 lines of talk, then an error line: the talk is cut, the error is kept.
    SimJob job = make_job("talkative", {"t", "V1 in 0 DC 1", "R1 in 0 1k", ".op", ".control",
                                        "repeat 30000", "echo chatter line", "end",
                                        "echo Error: the last word", ".endc", ".end"},
                          std::chrono::seconds(60));
    SimOutcome out = simulate(job);
    EXPECT_LE(out.log.size(), 20002u);
    EXPECT_GE(out.log.size(), 10000u);
    bool note = false, last = false;
    for (const std::string& line : out.log) {
        note = note || line.find("[deckscale: ngspice printed more than 10000 lines") == 0;
        last = last || line == "Error: the last word";
    }
    EXPECT_TRUE(note);
    EXPECT_TRUE(last);
}

TEST(SimLimits, TheChildDoesNotSeeTheUsersEnvironment) {
    // ngspice's control language falls back to environment variables for $name (checked
    // with ngspice -b 39: DSECRET=leaked makes 'echo [$DSECRET]' print [leaked]).
    ::setenv("DECKSCALE_TEST_SECRET", "leaked", 1);
    SimOutcome out = simulate(make_job("env", {"t", "V1 in 0 DC 1", "R1 in 0 1k", ".op",
                                               ".control", "echo [$DECKSCALE_TEST_SECRET]",
                                               ".endc", ".end"}));
    ::unsetenv("DECKSCALE_TEST_SECRET");
    bool echoed = false;
    for (const std::string& line : out.log) {
        EXPECT_EQ(line.find("leaked"), std::string::npos) << line;
        echoed = echoed || line.rfind("[", 0) == 0;
    }
    EXPECT_TRUE(echoed);  // the command ran; only the variable was not there
}

}  // namespace
}  // namespace deckscale
