// What rounding to preferred values did to a response, by simulation: the ideal and the
// rounded deck swept side by side at the same points, the largest change in dB and in
// degrees with the frequency where each occurs, the passband ripple of each and the shift
// of the -3 dB corner (retarget/measure).
#pragma once

#include <optional>
#include <string>

#include "deck/analyses.hpp"
#include "deck/load.hpp"
#include "retarget/probe.hpp"

namespace deckscale {

// Passband ripple (a low-pass or band-pass view): the highest point of the sweep minus the
// lowest local minimum between the start of the sweep and the first half-power point above
// the highest point; 0 for a response without such a valley.
struct Ripple {
    double db = 0;
    double valley_hz = 0;  // where the lowest valley lies (0: none)
};
Ripple passband_ripple(const Sampled& response);

struct ResponseChange {
    std::string problem;  // empty when the rest is filled in
    bool missing_node = false;  // the problem is that a deck has no such node
    long points = 0;
    double max_db = 0, max_db_hz = 0;    // largest |dB(rounded) - dB(ideal)| and where
    double max_deg = 0, max_deg_hz = 0;  // largest |phase difference| and where
    Ripple ripple_ideal, ripple_rounded;
    std::optional<double> corner_ideal, corner_rounded;  // Hz; none without a corner in the sweep
    SimPlot ideal_ac, rounded_ac;                        // the two dense sweeps, for drawing
};

// `sweep`'s range is swept with 200 points a decade on both decks.
ResponseChange response_change(const Deck& ideal, const std::string& ideal_path,
                               const Deck& rounded, const std::string& rounded_path,
                               const ProbeSettings& probe, const AcSweep& sweep);

}  // namespace deckscale
