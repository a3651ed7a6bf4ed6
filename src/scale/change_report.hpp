// The change list of a scaling run: one line per rewritten value, and a JSON form.
#pragma once

#include <string>

#include "deck/load.hpp"
#include "scale/rescale.hpp"
#include "write/plan.hpp"

namespace deckscale {

// Lines like "deck.cir:7:10  R1  value  1 -> 50  x50 [Ohm]", then one line per parameter
// saying how it was scaled ("deck.cir:2:8  parameter rbase  scaled at its definition as
// resistance  x2"), then the held parts (held_list_text).
std::string change_list_text(const Deck& deck, const ScaleResult& result);

// One line per part kept as written (scale --hold), with why, the scaled copy the scaled
// parts use instead, and what it could not have followed anyway:
//   "deck.cir:9:1  XU1  held (instance): asked: --hold XU1".
std::string held_list_text(const Deck& deck, const ScaleResult& result);

// The whole run as JSON (factors, files written, changes, held parts, unscalable items,
// notes, and what the factors do to noise: scale/noise_effect.hpp).
std::string change_list_json(const Deck& deck, const ScaleResult& result, ScaleFactors factors,
                             const OutputPlan& plan, bool follow_flicker = false);

}  // namespace deckscale
