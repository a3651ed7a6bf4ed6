// The `stress` command: per-part current, voltage and power of a rescaled deck against its
// original, with flags for growth and ratings (src/stress/measure.hpp says how).
#pragma once

#include <ostream>

#include "cli/options.hpp"

namespace deckscale {

// Returns exit_ok (nothing flagged), exit_not_equivalent (a part is flagged), exit_bad_input or
// exit_sim_failed.
int run_stress_command(const StressOptions& options, std::ostream& out, std::ostream& err);

}  // namespace deckscale
