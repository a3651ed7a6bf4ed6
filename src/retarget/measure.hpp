// Measuring a feature of a node's AC response: the -3 dB corner, the peak of a band-pass
// (its centre) or a notch minimum. A coarse sweep finds the feature; fine linear sweeps over
// the bracketing interval refine it, and the last step interpolates. Never guessed from element
// values. The sweeps are run by a callback, so the search is tested on analytic responses and
// run on simulations (retarget/probe).
#pragma once

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "deck/analyses.hpp"

namespace deckscale {

enum class Feature { corner, center, notch };

const char* to_string(Feature f);

// A magnitude response: ascending frequencies (Hz) and the magnitude in dB at each.
struct Sampled {
    std::vector<double> freq;
    std::vector<double> db;
};

// One sweep's result, or why there is none (a node without a response, a failed run).
struct SweepResult {
    Sampled response;
    std::string problem;  // empty when `response` holds the sweep
};

using SweepRunner = std::function<SweepResult(const AcSweep&)>;

struct Measurement {
    std::string problem;  // empty on success: one sentence, what was searched and what to do
    Feature feature = Feature::corner;
    double freq = 0;      // Hz: the corner, centre or notch
    double level_db = 0;  // corner: the passband level it is measured from; else the extreme
    int sweeps = 0;       // simulations run
    bool ok() const { return problem.empty(); }
};

// Half power below the passband level: 10 log10(2) = 3.0103 dB (common practice: the
// "-3 dB" corner of a filter is its half-power point; a Butterworth response passes it at
// exactly its design frequency).
inline constexpr double kHalfPowerDb = 3.0102999566398120;

// The passband level is the highest magnitude on the sweep (refined when it lies inside it).
// The corner is the first half-power crossing above that peak (a low-pass or the upper edge
// of a band); when there is none, the nearest one below it (a high-pass). A centre is the
// highest, a notch the lowest point, either of which must lie inside the sweep.
Measurement measure(Feature feature, const AcSweep& coarse, const SweepRunner& run);

}  // namespace deckscale
