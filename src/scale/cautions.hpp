// The cautions for anyone who builds hardware from a rescaled, retargeted or rounded deck
// (what the commands print and the library's results carry): ratings, current growth for
// Km < 1, held parts, rescaled semiconductors, and that local codes govern mains and
// high-voltage circuits.
#pragma once

#include <string>

#include "scale/units.hpp"

namespace deckscale {

// Lines starting "deckscale: caution:", each continuation indented; "" for factors of one.
std::string scale_cautions(ScaleFactors f, bool held, bool semiconductors);

// For values rounded or retargeted to nominal parts (snap, retarget): the same form.
std::string nominal_value_cautions();

}  // namespace deckscale
