// What a DC analysis sweeps: from=, to=, at= and td= of a measurement on a DC sweep take the
// unit of the swept quantity.
#pragma once

#include <optional>
#include <string_view>

#include "deck/load.hpp"
#include "scale/units.hpp"

namespace deckscale {

// The unit of the quantity a DC sweep steps, from the name of the swept item: a voltage
// source V, a current source A, a resistor Ohm, "temp" none (ngspice 39 manual 15.3.2).
// nullopt for anything else.
std::optional<Unit> swept_unit(std::string_view source);

// The units swept by the first source of every .dc card and every 'dc' command of the deck.
// `found` counts the sweeps; several sweeps of the same unit give that unit.
struct DcSweeps {
    std::size_t found = 0;
    std::optional<Unit> unit;  // set when every sweep has one and the same unit
};
DcSweeps dc_sweeps(const Deck& deck);

// The x-axis unit of the plots the deck's analysis cards make (.tran s; .ac .noise .sp .disto
// Hz; .dc the swept quantity's): what a plot limit after 'run' refers to. Set when every such
// card agrees; `found` counts them.
DcSweeps card_plot_scales(const Deck& deck);

}  // namespace deckscale
