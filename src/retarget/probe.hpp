// Sweeps of one node's AC response by simulation: the deck is prepared once for a run
// (verify/sim_cards: its own analyses and outputs removed, includes inlined) and every sweep
// the measurement asks for runs in its own simulator process.
#pragma once

#include <chrono>
#include <cstdint>
#include <string>

#include "deck/load.hpp"
#include "retarget/measure.hpp"
#include "sim/simulate.hpp"

namespace deckscale {

struct ProbeSettings {
    std::string node;   // as the user wrote it: "out" or "v(out)"
    std::string drive;  // lower-case source that gets AC `drive_ac`; "" = as the deck has it
    double drive_ac = 1;
    std::chrono::milliseconds timeout{60000};
    std::uint64_t memory_mb = 8192;
};

// A runner for retarget/measure. `path` is the deck's file (its folder is the run's working
// folder, and it labels failures).
SweepRunner node_sweeps(const Deck& deck, const std::string& path, const ProbeSettings& settings);

// The vector of `node` ("out" or "v(out)") on a plot; null when there is none.
const SimVector* node_vector(const SimPlot& plot, const std::string& node);

// The magnitude in dB of `node` on an AC plot, with its frequencies; a problem when the plot
// has no such node.
SweepResult node_response(const SimPlot& plot, const std::string& node);

}  // namespace deckscale
