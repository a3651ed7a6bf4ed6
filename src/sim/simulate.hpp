// Simulation in embedded ngspice (libngspice 39), isolated in child processes.
//
// Each job runs in its own child process that has libngspice loaded with dlopen (by itself,
// or once by a template process it was cloned from), loads the cards, runs every analysis they
// contain, and streams the resulting vectors back over a pipe.
// A simulator error, crash, ControlledExit or hang therefore never reaches the calling
// process and never leaks state into the next job. This module is the only one that
// includes <ngspice/sharedspice.h>.
#pragma once

#include <chrono>
#include <complex>
#include <cstdint>
#include <string>
#include <vector>

namespace deckscale {

struct SimJob {
    std::string label;               // names the job in messages (usually the deck path)
    std::vector<std::string> cards;  // [0] = title, one card per entry (no '\n'), last = ".end"
    std::string work_dir;            // the child chdir()s here: .include paths resolve as in the deck
    std::chrono::milliseconds timeout{60000};
    std::uint64_t memory_limit_mb = 0;  // address space the child may use (RLIMIT_AS); 0 = none
};

// What a vector holds, from ngspice's own vector type. The noise kinds are those of a
// .noise analysis: spectral densities (V/sqrt(Hz), A/sqrt(Hz)) and, with ngspice's
// `sqrnoise` option, their squares (V^2/Hz, A^2/Hz; integrated noise then in V^2, A^2).
enum class VectorKind {
    voltage,
    current,
    frequency,
    time,
    voltage_density,
    current_density,
    voltage_squared_density,
    current_squared_density,
    voltage_squared,
    current_squared,
    other,
};

struct SimVector {
    std::string name;  // as ngspice names it: "out", "v(2)", "v1#branch", "frequency", "time"
    VectorKind kind = VectorKind::other;
    std::vector<std::complex<double>> values;  // real data is stored with imaginary part 0
};

struct SimPlot {
    std::string name;      // ngspice plot type name: "ac1", "op1", "tran1", ...
    std::string analysis;  // ngspice's plot name: "AC Analysis", "Operating Point", ...
    std::vector<SimVector> vectors;
    const SimVector* find(const std::string& name) const;  // case-insensitive; nullptr if absent
};

enum class SimStatus {
    ok,
    load_failed,      // ngspice rejected the deck (its error lines are in message)
    run_failed,       // the deck loaded but an analysis failed or produced no plot
    controlled_exit,  // ngspice asked to exit (fatal error or 'quit')
    crashed,          // the child died from a signal or exited unexpectedly
    timed_out,        // killed after job.timeout
    interrupted,      // stopped on request (sim/interrupt) before it ended
};

struct SimOutcome {
    SimStatus status = SimStatus::ok;
    std::string message;            // why it failed, quoting ngspice's own words; empty when ok
    std::vector<std::string> log;   // every line ngspice printed, in order
    std::vector<SimPlot> plots;     // the plots the run created, in creation order
};

const char* to_string(SimStatus s);

// Runs one job in a child process and waits for it.
SimOutcome simulate(const SimJob& job);

// How simulate_all starts the process of each job. Either way every job runs in a process of
// its own that ends with the job.
enum class SimProcesses {
    // A template process loads and initialises libngspice once, and each job runs in a fresh
    // clone of it (no circuit is ever loaded in the template). Falls back to `direct` if the
    // template cannot start.
    from_template,
    // Each job's process is forked from the caller and loads and initialises libngspice itself.
    direct,
    // from_template when there are more jobs than `parallel`, else direct. Measured on a 2-core
    // VM (1000-point AC jobs, parallel 2): direct is faster for 1 job (21 vs 27 ms) and level for
    // 2 (32 vs 34 ms), where the initialisations run side by side anyway; the template is
    // faster from 3 jobs on (4: 67 -> 57 ms, 8: 142 -> 113 ms).
    automatic,
};

class SimHeadStart;  // sim/head_start.hpp

// Runs several jobs, at most `parallel` at a time (0 = number of cores); the outcomes are in
// the order of the jobs. Processes waiting in `head_start` take the first jobs, and with a
// head_start the processes that sent their whole results may still be exiting on return:
// they are reaped when it ends. Without one, every process has been reaped on return.
std::vector<SimOutcome> simulate_all(const std::vector<SimJob>& jobs, unsigned parallel = 0,
                                     SimProcesses how = SimProcesses::automatic,
                                     SimHeadStart* head_start = nullptr);

}  // namespace deckscale
