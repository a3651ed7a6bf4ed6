// Verifying a pair of decks as one library call: both decks read, the factors taken or
// inferred, both simulated in isolated child processes at mapped points (the original's .ac
// sweep or --sweep, .op, .tran, .noise), and every vector compared. Never prints; the `verify`
// command, batch suites and retargeting all go through here.
#pragma once

#include <chrono>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "base/file_system.hpp"
#include "sim/simulate.hpp"
#include "verify/report.hpp"

namespace deckscale {

class SimHeadStart;

struct PairRequest {
    std::string original, scaled;  // paths; each deck runs in its own folder
    bool factors_given = false;    // else inferred from matched R, C and L values
    double km = 1, kf = 1;
    std::vector<std::string> sweep;  // "dec N F1 F2" overriding the original's .ac; empty: none
    std::string drive;               // the source that gets AC 1; empty: as the deck has it
    Tolerances tolerances;
    std::chrono::milliseconds timeout{60000};  // per simulation
    std::uint64_t memory_mb = 8192;             // per simulation; 0 = no limit
    // > 0: the transient runs' largest time step, in the original's time (the scaled run gets
    // it divided by Kf) instead of the .tran card's; a finer step resolves the edges of
    // event-driven models more finely (verify/event_timing.hpp).
    double max_step = 0;
};

// A simulation that did not give results.
struct SimFailure {
    std::string label;     // the deck's path
    std::string analysis;  // "ac", "op", "tran"
    SimStatus status = SimStatus::ok;
    std::string message;   // ngspice's own words where it gave any
};

struct PairVerification {
    enum class Outcome {
        compared,    // `report` is complete (passed or not)
        bad_input,   // `problems` says why nothing was simulated
        sim_failed,  // `failures` (or `problems`) says which run failed
    };
    Outcome outcome = Outcome::compared;
    std::vector<std::string> problems;  // one sentence each, without a "deckscale: error:" prefix
    std::vector<SimFailure> failures;
    VerifyReport report;
    // Every run's outcome: the original's and the scaled deck's for each compared analysis.
    std::vector<SimOutcome> outcomes;
    // The AC plots of both decks, for drawing (null without an AC sweep).
    const SimPlot* ac_original() const { return ac_plot(0); }
    const SimPlot* ac_scaled() const { return ac_plot(1); }

    std::optional<std::size_t> ac_run;  // index into outcomes of the original's AC run

private:
    const SimPlot* ac_plot(std::size_t which) const {
        if (!ac_run) return nullptr;
        for (const auto& p : outcomes[*ac_run + which].plots)
            if (p.name.rfind("ac", 0) == 0) return &p;
        return nullptr;
    }
};

// Throws DeckError for a deck that cannot be read (rendered with its file:line:col).
// `head_start`: simulator processes started early (the first jobs go to them), or null.
PairVerification verify_pair(const PairRequest& request, const FileSystem& fs,
                             SimHeadStart* head_start = nullptr);

}  // namespace deckscale
