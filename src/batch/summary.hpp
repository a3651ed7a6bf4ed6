// The text summary of a batch report for people: every case that did not meet its
// expectation with its worst vector or first problem, then one totals line. A survey instead
// lists which decks scale and verify, which verify with differences, which are refused
// (grouped by reason, most common first) and which could not be read or simulated.
#pragma once

#include <string>

#include "batch/report.hpp"

namespace deckscale {

std::string summary_text(const BatchReport& r);

}  // namespace deckscale
