// Cases on worker processes, with real simulations (ngspice as referee of the equivalence):
// a scaled deck passes, a capacitor 1 % off fails, and a refused deck, a hung simulation, a
// simulation that dies of its memory limit and a deck that cannot be read each fail their own
// case only, in a run whose other cases are untouched.
#include "batch/workers.hpp"

#include <gtest/gtest.h>
#include <signal.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <map>
#include <regex>
#include <thread>

#include "support/common.hpp"
#include "support/sim.hpp"

namespace deckscale {
namespace {

using test::TempDir;
using test::write_bytes;

// RC low-pass, corner 1/(2 pi 1k 1u) = 159 Hz.
const char* kRc = "rc\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 1u\n.ac dec 10 10 10k\n.end\n";
// The same at Km = 10, Kf = 100 (R x10, C / 1000, sweep x100), C1 1 % high.
const char* kRcOff =
    "rc\nV1 in 0 DC 0 AC 1\nR1 in out 10k\nC1 out 0 1.01n\n.ac dec 10 1k 1meg\n.end\n";
// Five million time steps at most 1 ns apart: far more than a half-second timeout allows.
const char* kLong =
    "rc\nV1 in 0 PULSE(0 1 0 1n 1n 1 2)\nR1 in out 1k\nC1 out 0 1u\n.tran 1n 5m 0 1n\n.end\n";
// An XSPICE device whose model is not in the deck: refused, not guessed.
const char* kOrphan =
    "a\nV1 in 0 DC 0 AC 1\nR1 in a 1k\nA1 a b amp\nR2 b 0 1k\n.ac dec 5 10 1k\n.end\n";

SuiteCase make_case(std::size_t index, std::string name, std::string deck, CaseTarget target) {
    SuiteCase c;
    c.index = index;
    c.name = std::move(name);
    c.deck = std::move(deck);
    c.target = std::move(target);
    c.timeout = std::chrono::seconds(30);
    return c;
}

TEST(BatchWorkers, EachCaseFailsOnItsOwn) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kRc);
    write_bytes(dir.file("rc_off.cir"), kRcOff);
    write_bytes(dir.file("long.cir"), kLong);
    write_bytes(dir.file("orphan.cir"), kOrphan);
    FactorTarget f{10, 100, "10", "100"};
    std::vector<SuiteCase> cases;
    cases.push_back(make_case(0, "made", dir.file("rc.cir"), f));
    // With the factors given (inferred ones would absorb the error of the only capacitor).
    cases.push_back(
        make_case(1, "off", dir.file("rc.cir"), ScaledTarget{dir.file("rc_off.cir"), f}));
    cases.push_back(make_case(2, "hung", dir.file("long.cir"), f));
    cases.back().timeout = std::chrono::milliseconds(500);
    cases.push_back(make_case(3, "starved", dir.file("rc.cir"), f));
    cases.back().memory_mb = 8;  // too little address space to load libngspice
    cases.push_back(make_case(4, "refused", dir.file("orphan.cir"), f));
    cases.push_back(make_case(5, "gone", dir.file("missing.cir"), f));
    cases.push_back(
        make_case(6, "off, as meant", dir.file("rc.cir"), ScaledTarget{dir.file("rc_off.cir"), f}));
    cases.back().expect = Expect::fail;
    cases.push_back(make_case(7, "made again", dir.file("rc.cir"), f));

    std::vector<BatchProgress> seen;
    WorkerSettings settings;
    settings.workers = 3;
    settings.progress = [&](const BatchProgress& p) { seen.push_back(p); };
    std::vector<CaseResult> r = run_cases(cases, settings);
    ASSERT_EQ(r.size(), cases.size());
    struct Expected {
        int line;
        CaseOutcome outcome;
        bool met;
        std::string problem;  // found in the first problem
    } expected[] = {
        {__LINE__, CaseOutcome::pass, true, ""},
        {__LINE__, CaseOutcome::fail, false, ""},
        {__LINE__, CaseOutcome::error, false, "timed out"},
        {__LINE__, CaseOutcome::error, false, "failed"},
        {__LINE__, CaseOutcome::refused, false, "1 item(s) cannot be scaled exactly"},
        {__LINE__, CaseOutcome::error, false, "missing.cir"},
        {__LINE__, CaseOutcome::fail, true, ""},
        {__LINE__, CaseOutcome::pass, true, ""},
    };
    for (std::size_t i = 0; i < r.size(); ++i) {
        const auto& e = expected[i];
        EXPECT_EQ(r[i].index, i) << "line " << e.line;
        EXPECT_EQ(r[i].name, cases[i].name) << "line " << e.line;
        EXPECT_EQ(r[i].outcome, e.outcome)
            << "line " << e.line << ": " << testing::PrintToString(r[i].problems);
        EXPECT_EQ(r[i].met(), e.met) << "line " << e.line;
        if (!e.problem.empty()) {
            ASSERT_FALSE(r[i].problems.empty()) << "line " << e.line;
            EXPECT_NE(r[i].problems.front().find(e.problem), std::string::npos)
                << "line " << e.line << ": " << r[i].problems.front();
        }
    }
    // The capacitor's node is the worst vector, far beyond the tolerance.
    EXPECT_TRUE(std::regex_match(
        r[1].worst, std::regex("ac out: relative error [-+.0-9e]+ at [-+.0-9e]+ Hz \\(tolerance 1e-06\\)")))
        << r[1].worst;
    EXPECT_FALSE(r[1].report.is_null());
    EXPECT_EQ(r[4].refusals,
              std::vector<std::string>{"XSPICE A device whose model 'amp' is not in the deck"});
    EXPECT_NE(r[0].km, 1);
    ASSERT_FALSE(seen.empty());
    EXPECT_EQ(seen.back().done, cases.size());
    EXPECT_EQ(seen.back().unmet, 5u);
    EXPECT_TRUE(test::no_children_left());
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

TEST(BatchWorkers, AWorkerPastItsDeadlineIsStoppedWithItsSimulations) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kRc);
    write_bytes(dir.file("long.cir"), kLong);
    FactorTarget f{10, 100, "10", "100"};
    std::vector<SuiteCase> cases = {make_case(0, "long", dir.file("long.cir"), f),
                                    make_case(1, "short", dir.file("rc.cir"), f)};
    WorkerSettings settings;
    settings.workers = 2;
    settings.deadline = std::chrono::milliseconds(1500);  // the simulations alone may take 30 s
    auto start = std::chrono::steady_clock::now();
    std::vector<CaseResult> r = run_cases(cases, settings);
    EXPECT_LT(std::chrono::steady_clock::now() - start, std::chrono::seconds(10));
    ASSERT_EQ(r.size(), 2u);
    EXPECT_EQ(r[0].outcome, CaseOutcome::error);
    EXPECT_EQ(r[0].problems,
              std::vector<std::string>{"the case did not finish within 1.5 s and was stopped"});
    EXPECT_EQ(r[1].outcome, CaseOutcome::pass) << testing::PrintToString(r[1].problems);
    EXPECT_TRUE(test::no_children_left());
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// The pids that are children of process `pid` (all its threads), from /proc (Linux 3.5+).
std::vector<pid_t> children_of(pid_t pid) {
    std::vector<pid_t> out;
    std::error_code ec;
    std::string tasks = "/proc/" + std::to_string(pid) + "/task";
    for (const auto& t : std::filesystem::directory_iterator(tasks, ec)) {
        std::ifstream in(t.path() / "children");
        for (pid_t c; in >> c;) out.push_back(c);
    }
    return out;
}

// Gone, or a zombie that nobody of ours has to reap.
bool gone(pid_t pid) {
    std::ifstream in("/proc/" + std::to_string(pid) + "/stat");
    std::string stat((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
    auto paren = stat.rfind(')');
    return stat.empty() || (paren != std::string::npos && stat.substr(paren + 2, 1) == "Z");
}

// A worker killed from outside (here SIGKILL, as the out-of-memory killer would) fails its own
// case with the signal named; its simulations die with it (PR_SET_PDEATHSIG) and the next case
// runs on a new worker.
TEST(BatchWorkers, AWorkerKilledFromOutsideFailsItsCaseOnly) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kRc);
    write_bytes(dir.file("long.cir"), kLong);
    FactorTarget f{10, 100, "10", "100"};
    std::vector<SuiteCase> cases = {make_case(0, "killed", dir.file("long.cir"), f),
                                    make_case(1, "after", dir.file("rc.cir"), f)};
    std::vector<pid_t> simulations;
    bool killed = false;
    WorkerSettings settings;
    settings.workers = 1;
    settings.progress = [&](const BatchProgress& p) {
        if (killed || p.done != 0) return;
        std::vector<pid_t> workers = children_of(::getpid());
        if (workers.size() != 1) return;
        simulations = children_of(workers[0]);
        if (simulations.empty()) return;  // not simulating yet: wait for the next report
        ::kill(workers[0], SIGKILL);
        killed = true;
    };
    std::vector<CaseResult> r = run_cases(cases, settings);
    ASSERT_TRUE(killed) << "the long case finished before a report came";
    ASSERT_EQ(r.size(), 2u);
    EXPECT_EQ(r[0].outcome, CaseOutcome::error);
    EXPECT_EQ(r[0].problems, std::vector<std::string>{
                                 "the worker process of this case died (killed by signal 9)"});
    EXPECT_EQ(r[1].outcome, CaseOutcome::pass) << testing::PrintToString(r[1].problems);
    EXPECT_TRUE(test::no_children_left());
    auto until = std::chrono::steady_clock::now() + std::chrono::seconds(10);
    for (pid_t s : simulations) {
        while (!gone(s) && std::chrono::steady_clock::now() < until)
            std::this_thread::sleep_for(std::chrono::milliseconds(20));
        EXPECT_TRUE(gone(s)) << "simulation " << s << " outlived its worker";
    }
}

}  // namespace
}  // namespace deckscale
