// The `scale` command: read, scale, write, report.
#pragma once

#include <ostream>

#include "cli/options.hpp"

namespace deckscale {

// Returns the exit code; `out` receives the deck when it goes to standard output.
int run_scale(const ScaleOptions& options, std::ostream& out, std::ostream& err);

}  // namespace deckscale
