// The `batch` command: run a regression suite (or survey a folder of decks) on worker
// processes and write JUnit XML, JSON and a text summary; or merge the JSON reports of a
// sharded run into one.
#pragma once

#include <ostream>

#include "cli/options.hpp"

namespace deckscale {

// Returns exit_ok (every case met its expectation; a survey that ran), exit_not_equivalent
// (some did not) or exit_bad_input (bad suite file, folder or reports).
int run_batch(const BatchOptions& options, std::ostream& out, std::ostream& err);

}  // namespace deckscale
