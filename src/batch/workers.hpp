// Running a suite's cases on worker processes: one process per case, at most `workers` at a
// time, each forked from this (single-threaded) process. A worker runs its case (whose
// simulations are child processes of its own), sends the result record back through a pipe
// as JSON and exits. A worker that dies, sends no record or outlives its case deadline (it is
// then killed, and its simulations with it) fails its own case only.
#pragma once

#include <chrono>
#include <functional>
#include <optional>
#include <vector>

#include "batch/case_result.hpp"
#include "batch/suite.hpp"

namespace deckscale {

struct BatchProgress {
    std::size_t done = 0, total = 0;
    std::size_t unmet = 0;  // finished cases that did not meet their expectation
    double elapsed_s = 0;
};

struct WorkerSettings {
    unsigned workers = 0;  // 0: one per core
    // Called on the parent's side after each finished case and about every half second.
    std::function<void(const BatchProgress&)> progress;
    // Replaces case_deadline() for every case when set.
    std::optional<std::chrono::milliseconds> deadline;
};

// The deadline of a whole case: verify_pair runs at most six simulations, none longer than
// the case's timeout, plus a minute for reading and scaling.
std::chrono::milliseconds case_deadline(const SuiteCase& c);

// The results in the order of `cases`.
std::vector<CaseResult> run_cases(const std::vector<SuiteCase>& cases,
                                  const WorkerSettings& settings);

}  // namespace deckscale
