// The image of a .dc sweep in the scaled deck: each level's item is swept over its values
// times the item's factor (a voltage source 1, a current source 1/Km, a resistor Km, the
// temperature 1; ngspice 39 manual 15.3.2), written so that ngspice 39 steps through the same
// number of points (deck/sweep_rewrite, the model of ngspice's own stepping in dctrcurv.c).
#pragma once

#include <optional>
#include <string>

#include "deck/analyses.hpp"

namespace deckscale {

// What the swept item of `level` is multiplied by in the scaled deck; nullopt for an item that
// is no V, I or R name and not "temp".
std::optional<double> dc_item_factor(const DcLevel& level, double km);

// The unit of the item's values, for reports: "V", "A", "Ohm" or "degC".
std::string dc_item_unit(const DcLevel& level);

// The scaled deck's sweep, or nullopt with `problem` set (an item of no known unit, or a
// level ngspice cannot step exactly after scaling).
std::optional<DcSweep> map_dc(const DcSweep& s, double km, double reltol, std::string& problem);

}  // namespace deckscale
