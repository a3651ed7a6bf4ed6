// What runs inside a simulator child process. Internal to the sim module.
#pragma once

#include "sim/simulate.hpp"

namespace deckscale {

// Runs `job` in embedded ngspice and streams log lines, plots and the result to `fd` (the
// write end of the pipe to the parent, wire format of sim/wire.hpp). Call it only in a
// freshly forked child: it takes over the process (standard streams, descriptors, current
// directory, environment) and ends it with _exit, never returning and never unwinding into
// the caller's frames.
[[noreturn]] void run_child(const SimJob& job, int fd) noexcept;

// The head-start path (driven by sim/head_start.cpp): a child forked before its job is known
// takes over the process like run_child (keeping `job_fd` as fd 4), loads libngspice, then
// reads one job message (sim/job_wire.hpp) from `job_fd` up to its end of stream and runs it
// like run_child. Without a whole job message it ends quietly.
[[noreturn]] void run_early_child(int fd, int job_fd) noexcept;

// The template path (driven by sim/template.cpp). prepare_template makes a freshly forked
// child a template: it takes over the process like run_child, keeping `keep_fd` as fd 3, and
// loads and initialises libngspice without loading any circuit, with the code models if
// `code_models`. Returns 3, or -1 if ngspice could not be started (the caller then ends the
// process; the direct path reports why).
int prepare_template(int keep_fd, bool code_models) noexcept;

// Runs `job` like run_child, in a process cloned from a prepared template: only `fd` (the
// write end of the job's pipe) is kept, the process gets a group of its own, enters the job's
// work_dir and sends the lines ngspice printed at initialisation before its own.
[[noreturn]] void run_cloned_child(const SimJob& job, int fd) noexcept;

}  // namespace deckscale
