// The template process: libngspice loaded and initialised once per simulate_all, and each job
// run in a fresh clone of it. Internal to the sim module.
//
// Protocol (a local seqpacket socket between the caller and the template):
//   template -> caller  one byte 'R' once ngspice is initialised (end of stream: it failed)
//   caller -> template  a job index (u32) with the write end of the job's pipe attached
//   template -> caller  the new process's pid (i32), or -errno if it could not be made
// The template makes each job's process with clone(CLONE_PARENT), so it is the caller's own
// child: the caller waits for it, kills its group on timeout and reads its pipe exactly as
// for a process it forked itself. The template never loads a circuit; a job's failure,
// crash or hang stays in that job's process.
#pragma once

#include <sys/types.h>

#include <chrono>
#include <cstddef>
#include <vector>

#include "sim/simulate.hpp"

namespace deckscale {

class SimTemplate {
  public:
    SimTemplate() = default;
    SimTemplate(const SimTemplate&) = delete;
    SimTemplate& operator=(const SimTemplate&) = delete;
    ~SimTemplate() { stop(); }

    // Forks the template for `jobs` (it keeps its own copy of them) and waits until it is
    // ready, at most `wait`. False if it could not start; the caller then forks directly.
    bool start(const std::vector<SimJob>& jobs, std::chrono::milliseconds wait);

    // Starts jobs[index] in a clone of the template writing to `pipe_fd` (the caller keeps
    // and closes its own copy). Returns the new child's pid, or -1 (the template is then
    // stopped and the caller forks directly).
    pid_t spawn(std::size_t index, int pipe_fd);

    bool running() const { return pid_ > 0; }

    // Ends and reaps the template; the jobs' processes are not affected.
    void stop();

  private:
    pid_t pid_ = -1;
    int socket_ = -1;
};

// How many job processes this process has started from a template (for tests).
std::size_t jobs_started_from_template();

}  // namespace deckscale
