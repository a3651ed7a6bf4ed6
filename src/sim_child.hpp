// What runs inside a simulator child process. Internal to the sim module.
#pragma once

#include "sim.hpp"

namespace deckscale {

// Runs `job` in embedded ngspice and streams log lines, plots and the result to `fd` (the
// write end of the pipe to the parent, wire format of sim_wire.hpp). Call it only in a
// freshly forked child: it takes over the process (standard streams, descriptors, current
// directory, environment) and ends it with _exit, never returning and never unwinding into
// the caller's frames.
[[noreturn]] void run_child(const SimJob& job, int fd) noexcept;

}  // namespace deckscale
