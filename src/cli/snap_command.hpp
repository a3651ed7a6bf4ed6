// The `snap` command: every R, C and L of a deck rounded to preferred values (values/snap),
// the deck written, each part's error listed and the response change measured by simulation.
#pragma once

#include <ostream>

#include "cli/options.hpp"

namespace deckscale {

// Returns exit_ok, exit_bad_input or exit_sim_failed.
int run_snap(const SnapOptions& options, std::ostream& out, std::ostream& err);

}  // namespace deckscale
