// The process a simulator child runs in: taken over from the program it was forked from, and
// the private directory ngspice is initialised in. Internal to the sim module.
#pragma once

#include <optional>
#include <string>

namespace deckscale {

// Exit codes of a child that could not even report (the parent then says "crashed").
constexpr int exit_pipe_broken = 120;
constexpr int exit_setup_failed = 121;
constexpr int exit_internal = 122;

// Standard streams to /dev/null, the pipe `fd` on fd 3 (and `job_fd`, if there is one, on
// fd 4), every other inherited descriptor closed (a sibling child's pipe must not stay open
// here), default signal handling, death with the parent, and a process group of its own.
// Returns 3; ends the process if it cannot.
int take_over_process(int fd, int job_fd = -1);

// Maps `bytes` of heap in one call (MADV_POPULATE_WRITE) for malloc to hand out later,
// instead of one page fault per page as ngspice's allocations touch them, and keeps malloc
// from giving heap back or serving large blocks from separate mappings. For a simulator
// process only: it changes how malloc behaves in the whole process.
void prefault_heap(std::size_t bytes);

// A fresh private directory holding an empty .spiceinit and, unless `spinit` is empty, an
// init script "spinit" with that text, for ngspice to be initialised in; "" if none could
// be made. See sim/process.cpp.
std::string make_start_dir(const std::string& spinit);
void remove_start_dir(const std::string& dir);

// The whole file at `path`, or nothing if it cannot be read.
std::optional<std::string> read_small_file(const std::string& path);

// Everything `fd` gives up to its end (blocking), or nothing on a read error.
std::optional<std::string> read_to_end(int fd);

}  // namespace deckscale
