// The `verify` command: simulate an original deck and its rescaled version in embedded
// ngspice (each run in its own child process) and compare them at mapped points.
#pragma once

#include <ostream>

#include "cli/options.hpp"

namespace deckscale {

// Returns exit_ok (equivalent), exit_not_equivalent, exit_bad_input or exit_sim_failed.
int run_verify(const VerifyOptions& options, std::ostream& out, std::ostream& err);

}  // namespace deckscale
