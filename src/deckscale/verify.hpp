// The library's public surface, part 3: proving a pair of decks equivalent by simulation.
//
// Both decks run in embedded ngspice in child processes of their own (forked: a program that
// links the library needs nothing else installed but libngspice), at mapped frequencies and
// times, and every node voltage and branch current is compared, as `deckscale verify` does.
#pragma once

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "deckscale/deck.hpp"

namespace deckscale::api {

struct VerifyOptions {
    std::optional<double> km, kf;    // both, or neither: inferred from matched R, C and L values
    std::vector<std::string> sweep;  // {"dec", "50", "1k", "1meg"} instead of the original's .ac
    std::string drive;               // the source that gets AC 1; empty: as the deck has it
    double tolerance = 1e-6;         // relative, AC and operating point
    double tran_tolerance = 1e-3;    // relative to each waveform's peak
    double tolerance_db = 0;         // > 0: a magnitude limit in dB as well
    double tolerance_deg = 0;        // > 0: a phase limit in degrees as well
    double timeout_s = 60;           // per simulation
    std::uint64_t memory_mb = 8192;  // address space per simulation; 0: no limit
    // > 0: the transient runs' largest time step in seconds of the original's time (the
    // scaled run's is this / Kf), instead of the .tran card's. Decks with event-driven code
    // models resolve their edges to the time step: a finer step shows whether a transient
    // difference is that resolution (it falls with the step) or the rewrite's (it stays).
    double max_step = 0;
};

// One compared vector's worst point.
struct VectorError {
    std::string name;  // as ngspice names it: "v(n3)", "vsrc#branch"
    std::string kind;  // "voltage", "current" (scaled currents are multiplied by Km) or "other"
    double worst = 0;  // relative error at the worst point
    double at = 0;     // its frequency, time or swept value, in the original's units
    double db_error = 0, deg_error = 0;  // AC: magnitude and phase error there
    double peak = 0;                     // the magnitude errors are relative to
    bool passed = true;
    // A branch current within 10 x GMIN x the largest node voltage that would have failed:
    // the current of ngspice's GMIN shunts, passed and not judged.
    bool gmin_level = false;
    // A measurement (analysis "meas"): the deck's .meas result in each run (NaN where ngspice
    // gave none) and what it measures with the factor between them ("time (x 1/Kf)").
    double original_value = 0, scaled_value = 0;
    std::string quantity = "";
};

struct AnalysisComparison {
    // "ac", "op", "tran", "noise", "dc" (a .dc sweep), "tf", "sp", "disto", or "meas": the
    // results of the deck's own .meas cards for the analysis in `part` ("tran", "ac", "dc", "sp")
    std::string analysis;
    std::size_t points = 0;
    double first = 0, last = 0;
    bool passed = true;
    std::vector<std::string> problems;      // each fails the comparison by itself
    std::vector<std::string> not_compared;  // device-internal vectors
    std::vector<VectorError> vectors;       // judged ones worst first, then GMIN-level ones
    // The unit of first, last and each vector's `at`: "Hz", "s", or for "dc" the swept
    // quantity's ("V", "A", "Ohm", "degC"); "" for "op" and "tf".
    std::string unit;
    // Which of the analysis's plots: a "disto" comparison's product ("2nd harmonic", "IM:
    // f1+f2", ...); for "meas" the analysis measured; "" for the others.
    std::string part;
};

struct SimulationFailure {
    std::string deck, analysis;
    std::string status;  // "load failed", "crashed", "timed out", ...
    std::string message;
};

struct Verification {
    enum class Outcome {
        compared,    // `analyses` holds the comparison; `passed` says how it came out
        bad_input,   // `problems` says why nothing was simulated
        sim_failed,  // `failures` (or `problems`) says which run failed
    };
    Outcome outcome = Outcome::compared;
    bool passed = false;
    double km = 1, kf = 1;
    bool factors_inferred = false;
    std::vector<std::string> problems;
    std::vector<SimulationFailure> failures;
    std::vector<AnalysisComparison> analyses;
    std::vector<std::string> notes;
    std::string text;  // the report as `deckscale verify` prints it (compared only)
    std::string json;  // as `deckscale verify --json` writes it (compared only)
};

// Throws DeckError for a deck that cannot be read or factors that are not positive.
Verification verify(const Deck& original, const Deck& scaled, const VerifyOptions& options);

}  // namespace deckscale::api
