// The cautions for anyone who builds hardware from a rescaled deck (what `scale` prints and
// the library's scale result carries): ratings, current growth for Km < 1, held parts,
// rescaled semiconductors, and that local codes govern mains and high-voltage circuits.
#pragma once

#include <string>

#include "scale/units.hpp"

namespace deckscale {

// Lines starting "deckscale: caution:", each continuation indented; "" for factors of one.
std::string scale_cautions(ScaleFactors f, bool held, bool semiconductors);

}  // namespace deckscale
