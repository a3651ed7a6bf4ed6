// The `yield` command: Monte Carlo tolerance yield of a deck against a response mask, each
// trial simulated in embedded ngspice (src/yield/run.hpp says how).
#pragma once

#include <ostream>

#include "cli/options.hpp"

namespace deckscale {

// Returns exit_ok when the trials ran (whatever the yield), exit_bad_input or exit_sim_failed.
// A progress line goes to `err` only when standard error is a terminal.
int run_yield_command(const YieldOptions& options, std::ostream& out, std::ostream& err);

}  // namespace deckscale
