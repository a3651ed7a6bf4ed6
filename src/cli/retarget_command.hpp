// The `retarget` command: factors from design targets (retarget/), the deck scaled and
// written, the target measured again on the output, the pair verified; a text report.
#pragma once

#include <optional>
#include <ostream>
#include <string>

#include "cli/options.hpp"
#include "retarget/retarget.hpp"

namespace deckscale {

// The request the options describe, or nullopt with `error` set (a usage error).
std::optional<RetargetRequest> retarget_request(const RetargetOptions& options, std::string& error);

// Returns exit_ok (target reached within 0.1 % and the pair equivalent), exit_not_equivalent,
// exit_bad_input, exit_sim_failed or exit_refused.
int run_retarget(const RetargetOptions& options, std::ostream& out, std::ostream& err);

}  // namespace deckscale
