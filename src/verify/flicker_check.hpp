// Whether the noise of a deck pair can be expected to agree: thermal and shot noise follow a
// rescaling, flicker noise only where its KF follows (scale/flicker.hpp).
#pragma once

#include <string>
#include <vector>

#include "deck/load.hpp"
#include "scale/units.hpp"

namespace deckscale {

// One sentence per model of the original whose flicker noise does not follow `f` in the
// scaled deck: its KF needs a factor other than 1 and the scaled deck's model of the same
// name does not carry it, or how it scales is not known. Empty when the noise of the pair
// is expected to agree.
std::vector<std::string> flicker_differences(const Deck& original, const Deck& scaled,
                                             ScaleFactors f);

}  // namespace deckscale
