// A tolerance yield run: N trials of a deck, each part drawn from its tolerance, the AC
// response of each judged against a mask. Never prints.
//
// How the trials run: the deck is prepared once (verify/sim_cards: its own analyses, outputs
// and .control blocks removed, includes inlined), and the trials are cut into jobs of
// consecutive trial numbers (trials_per_job: a function of the trial count only). A job's
// cards are that deck, a .save of the output node and one .control block that, per trial,
// sets every varied part with `alter` and runs the `ac` sweep: ngspice loads the circuit once
// per job and changes values in place between runs (ngspice 39 manual §17.5.3 alter, §17.5.1
// ac). The jobs run in isolated simulator processes, as many at a time as there are workers
// (sim/simulate). Each trial's values depend only on (seed, trial number, part name)
// (yield/draw) and each job's trials only on the trial count, so every figure is the same for
// any number of workers.
#pragma once

#include <chrono>
#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "deck/diagnostic.hpp"
#include "sim/simulate.hpp"
#include "yield/draw.hpp"
#include "yield/mask.hpp"
#include "yield/parts.hpp"
#include "yield/stats.hpp"

namespace deckscale {

struct YieldProgress {
    std::uint64_t done = 0, trials = 0, passed = 0;
    double seconds = 0;  // since the trials started
};

struct YieldRequest {
    std::string deck;
    std::uint64_t trials = 500;
    std::uint64_t seed = 1;
    ToleranceSpec tolerances;
    Spread spread = Spread::uniform;
    Mask mask;
    std::vector<std::string> sweep;  // "dec N F1 F2" instead of the deck's .ac; empty: the deck's
    std::string drive;               // the source that gets AC 1; empty: as the deck has it
    std::string output;              // the node whose response is judged; empty: chosen
    unsigned workers = 0;            // simulator processes at a time; 0 = one per core
    std::chrono::milliseconds timeout{600000};           // per simulator process
    std::uint64_t memory_mb = 8192;                      // per simulator process; 0 = no limit
    std::function<void(const YieldProgress&)> progress;  // after each round of jobs; may be empty
};

struct TrialResult {
    std::uint64_t trial = 0;  // 1-based
    ResponseFigures figures;
};

struct YieldFailure {
    std::string label;
    SimStatus status = SimStatus::ok;
    std::string message;
};

struct YieldResult {
    enum class Outcome { done, bad_input, sim_failed } outcome = Outcome::done;
    std::vector<std::string> problems;  // one sentence each
    std::vector<YieldFailure> failures;

    std::string output;      // the judged vector, as ngspice names it
    std::string sweep_card;  // the .ac card the trials ran
    std::vector<Part> parts;
    std::vector<Diagnostic> held;
    std::vector<double> frequency, nominal_db, low_db, high_db;  // low/high: the envelope
    std::vector<double> mask_low, mask_high;                     // NaN where no limit
    ResponseFigures nominal;
    std::vector<TrialResult> trials;  // in trial order
    std::uint64_t passed = 0;
    Interval interval;                        // Wilson, 95 %
    Summary gain, deviation, ripple, corner;  // corner: of the trials that have one
    std::string ranked_figure;                // what the sensitivities explain ("corner", "")
    std::vector<Sensitivity> sensitivities;
    std::uint64_t worst_trial = 0;                             // 0 with no trials
    std::vector<std::pair<std::string, double>> worst_values;  // its part values
    unsigned jobs = 0;
    double seconds = 0;  // wall time of the trials
};

// Trials per simulator job: about a quarter of the trials, at least 25, at most 250.
std::uint64_t trials_per_job(std::uint64_t trials);

// The value of each varied part in one trial.
std::vector<double> trial_values(const std::vector<Part>& parts, std::uint64_t seed,
                                 std::uint64_t trial, Spread spread);

// Throws DeckError for a deck that cannot be read.
YieldResult run_yield(const YieldRequest& request, const FileSystem& fs);

}  // namespace deckscale
