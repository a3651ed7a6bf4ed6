// Tests of how the parent judges a simulator child (sim/end.hpp).
#include "sim/end.hpp"

#include <gtest/gtest.h>
#include <signal.h>

#include <string>

namespace deckscale {
namespace {

using namespace std::chrono_literals;
using Kind = ChildEnd::Kind;
using wire::StreamState;

// A wait status as waitpid reports it (glibc's encoding on Linux).
int exited_with(int code) { return (code & 0xff) << 8; }
int killed_by(int sig) { return sig & 0x7f; }

SimOutcome passed_run() {
    SimOutcome o;
    o.status = SimStatus::ok;
    o.log = {"Circuit: rc", "Doing analysis at TEMP = 27.000000 and TNOM = 27.000000"};
    o.plots.push_back({"ac1", "AC Analysis", {{"out", VectorKind::voltage, {{0.5, -0.5}}}}});
    return o;
}

struct Case {
    const char* name;
    StreamState state;
    ChildEnd end;
    SimStatus status;
    const char* message;  // the whole message
};

const Case cases[] = {
    // The result frame arrived: the verdict is the stream's, not the process's.
    {"result received, still exiting", StreamState::complete, {Kind::result_received, 0},
     SimStatus::ok, ""},
    {"result received, then exit 0", StreamState::complete, {Kind::exited, exited_with(0)},
     SimStatus::ok, ""},
    {"result received, then killed", StreamState::complete, {Kind::exited, killed_by(SIGKILL)},
     SimStatus::ok, ""},
    {"result received, then exit 3", StreamState::complete, {Kind::exited, exited_with(3)},
     SimStatus::ok, ""},
    // No result frame: the process's end says what happened.
    {"crash before the result", StreamState::truncated, {Kind::exited, killed_by(SIGSEGV)},
     SimStatus::crashed,
     "the simulator process for rc.cir died from signal 11 (Segmentation fault); its last line "
     "was: Doing analysis at TEMP = 27.000000 and TNOM = 27.000000"},
    {"exit before the result", StreamState::truncated, {Kind::exited, exited_with(120)},
     SimStatus::crashed,
     "the simulator process for rc.cir exited (code 120) with incomplete result data; its last "
     "line was: Doing analysis at TEMP = 27.000000 and TNOM = 27.000000"},
    {"garbled stream", StreamState::garbled, {Kind::exited, exited_with(0)}, SimStatus::crashed,
     "the simulator process for rc.cir exited (code 0) with garbled result data; its last line "
     "was: Doing analysis at TEMP = 27.000000 and TNOM = 27.000000"},
    {"killed at the deadline", StreamState::truncated, {Kind::timed_out, killed_by(SIGKILL)},
     SimStatus::timed_out,
     "rc.cir did not finish within 300 ms and was stopped; its last line was: Doing analysis at "
     "TEMP = 27.000000 and TNOM = 27.000000"},
};

TEST(SimEnd, TheStreamDecidesOnceItIsCompleteTheProcessBefore) {
    for (const Case& c : cases) {
        SCOPED_TRACE(c.name);
        SimOutcome out = judge_child("rc.cir", 300ms, c.state, passed_run(), c.end);
        EXPECT_EQ(to_string(out.status), std::string(to_string(c.status)));
        EXPECT_EQ(out.message, c.message);
        EXPECT_EQ(out.log, passed_run().log);  // the log is kept either way
        EXPECT_EQ(out.plots.size(), c.status == SimStatus::ok ? 1u : 0u);
    }
}

TEST(SimEnd, AFailureTheChildReportedStaysItsOwn) {
    SimOutcome failed;
    failed.status = SimStatus::load_failed;
    failed.message = "Error on line 2 : r1 in 0 abc";
    SimOutcome out = judge_child("", 300ms, StreamState::complete, failed,
                                 {Kind::exited, killed_by(SIGKILL)});
    EXPECT_EQ(out.status, SimStatus::load_failed);
    EXPECT_EQ(out.message, failed.message);
    out = judge_child("", 300ms, StreamState::truncated, {}, {Kind::exited, exited_with(1)});
    EXPECT_EQ(out.message, "the simulator process for the deck exited (code 1) with incomplete "
                           "result data");
}

}  // namespace
}  // namespace deckscale
