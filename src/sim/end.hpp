// How the parent judges a simulator child: from its stream, and from its exit only when the
// stream did not end with a result. Internal to the sim module.
#pragma once

#include <chrono>
#include <string>

#include "sim/simulate.hpp"
#include "sim/wire.hpp"

namespace deckscale {

// What the parent knows about a child when it judges it.
struct ChildEnd {
    enum class Kind {
        result_received,  // its stream is complete; the process may still be exiting
        exited,           // the process has ended (wait_status says how)
        timed_out,        // it was killed at its deadline
    };
    Kind kind = Kind::exited;
    int wait_status = 0;  // as waitpid reports it, for `exited`
};

// The outcome of a child whose stream ended in `state`, decoded into `out`. A complete stream
// is the verdict, whatever happens to the process after it sent its last frame (its data were
// whole and checked frame by frame). A stream without its result frame is a crash: a signal,
// or an exit with incomplete or garbled data; a timeout is a timeout. Failures keep the log
// and drop the plots.
SimOutcome judge_child(const std::string& label, std::chrono::milliseconds timeout,
                       wire::StreamState state, SimOutcome out, ChildEnd end);

}  // namespace deckscale
