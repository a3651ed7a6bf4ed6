// The tool's exit codes (documented in README.md).
#pragma once

namespace deckscale {

enum ExitCode : int {
    exit_ok = 0,              // done; for verify: the decks are equivalent
    exit_not_equivalent = 1,  // verify: the decks differ beyond the tolerance; batch: a case
                              // did not meet its expectation
    exit_bad_input = 2,       // usage error or bad deck: nothing written
    exit_sim_failed = 3,      // the simulator failed on a deck
    exit_refused = 4,         // scale: the deck holds items that cannot be scaled exactly
    exit_internal = 5,        // a bug in deckscale (or memory exhausted): nothing was written
};

}  // namespace deckscale
