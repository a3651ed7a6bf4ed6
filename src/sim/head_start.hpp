// Simulator processes started before their jobs are known.
//
// Each one is forked at once and loads libngspice while the caller is still reading and
// preparing the decks; simulate_all then hands it a job (sim/job_wire.hpp) over a socket of
// its own, and from there on it is an ordinary direct child: own pipe for its results, own
// process group, the job's deadline counted from the hand-over. Jobs beyond them get
// processes of their own as usual. The forks are also cheaper there: the caller has mapped
// less memory yet. Measured on the 2-core VM (verify of a 10-element filter pair, 1000-point
// AC, 31 interleaved runs): 32.6 -> 31.4 ms median.
#pragma once

#include <sys/types.h>

#include <vector>

#include "sim/simulate.hpp"

namespace deckscale {

class SimHeadStart {
  public:
    // Forks `processes` simulator processes now (fewer if fork fails).
    explicit SimHeadStart(unsigned processes);
    SimHeadStart(const SimHeadStart&) = delete;
    SimHeadStart& operator=(const SimHeadStart&) = delete;
    // Stops and reaps the processes that were never given a job, and reaps adopted ones.
    ~SimHeadStart();

    // Gives `job` to a waiting process: returns its pid and sets `result_fd` to the
    // (non-blocking) read end of its result pipe; -1 if no process is waiting or none took
    // the job whole (those are stopped).
    pid_t hand_over(const SimJob& job, int& result_fd);

    std::size_t waiting() const { return waiting_.size(); }

    // A job's process (any, not only a head-started one) that has sent its whole result and
    // is exiting: it is reaped when this ends, so that the caller need not wait for its
    // address space to be torn down (0.5-1.5 ms per process on the 2-core VM) before it
    // compares and reports.
    void adopt(pid_t pid) { exiting_.push_back(pid); }

  private:
    struct Waiting {
        pid_t pid = -1;
        int result_fd = -1;  // read end of its result pipe
        int job_fd = -1;     // our end of its job socket
    };
    static void stop(Waiting& w);
    std::vector<Waiting> waiting_;
    std::vector<pid_t> exiting_;
};

}  // namespace deckscale
