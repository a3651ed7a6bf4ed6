// The change list of a scaling run: one line per rewritten value, and a JSON form.
#pragma once

#include <string>

#include "deck/load.hpp"
#include "scale/rescale.hpp"
#include "write/plan.hpp"

namespace deckscale {

// Lines like "deck.cir:7:10  R1  value  1 -> 50  x50 [Ohm]".
std::string change_list_text(const Deck& deck, const ScaleResult& result);

// The whole run as JSON (factors, files written, changes, unscalable items, notes, and what
// the factors do to noise: scale/noise_effect.hpp).
std::string change_list_json(const Deck& deck, const ScaleResult& result, ScaleFactors factors,
                             const OutputPlan& plan, bool follow_flicker = false);

}  // namespace deckscale
