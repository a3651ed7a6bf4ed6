// The change list of a scaling run: one line per rewritten value, and a JSON form.
#pragma once

#include <string>

#include "deck/load.hpp"
#include "scale/rescale.hpp"
#include "write/plan.hpp"

namespace deckscale {

// Lines like "deck.cir:7:10  R1  value  1 -> 50  x50 [Ohm]", then one line per parameter
// saying how it was scaled ("deck.cir:2:8  parameter rbase  scaled at its definition as
// resistance  x2").
std::string change_list_text(const Deck& deck, const ScaleResult& result);

// The whole run as JSON (factors, files written, changes, unscalable items, notes).
std::string change_list_json(const Deck& deck, const ScaleResult& result, ScaleFactors factors,
                             const OutputPlan& plan);

}  // namespace deckscale
