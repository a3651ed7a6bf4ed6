// A deck prepared for one verification run: its own analyses, output cards (but the
// measurements of the run's analysis, on request) and .control blocks removed (a .control block may run shell commands: it never runs here), every
// include inlined, and the verifier's analysis card added.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "deck/load.hpp"
#include "scale/units.hpp"

namespace deckscale {

struct SimDeckOptions {
    std::string analysis;     // e.g. ".ac dec 50 1 1meg"
    std::string drive;        // lower-case source name that gets an AC value; "" = as written
    double drive_ac = 1;      // the AC magnitude written on the driving source
    // Km and Kf of this deck against the original ({1, 1} for the original itself). When set
    // and the deck has junction devices, the run uses tight tolerances scaled by them
    // (verify/tight_tolerances.hpp), so that both runs of a nonlinear deck converge alike.
    std::optional<ScaleFactors> tight_tolerances = std::nullopt;
    // The deck's .meas cards of this analysis ("tran", "ac", "dc", "sp") stay, so that the
    // run prints their results (verify/meas_compare.hpp); "" removes every .meas card.
    std::string keep_measures = "";
    // Cards added before the analysis card (the `meas` commands of a .control block as .meas
    // cards).
    std::vector<std::string> extra_cards = {};
};

// One card per entry (continuation lines as their own entries), title first, ".end" last.
std::vector<std::string> simulation_cards(const Deck& deck, const SimDeckOptions& options);

}  // namespace deckscale
