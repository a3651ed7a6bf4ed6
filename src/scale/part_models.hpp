// A .subckt that holds semiconductor devices is often the macro-model of a real part (an op
// amp, a regulator, a comparator). Scaling rewrites it with the rest of the deck, which is
// exact for the circuit but no longer describes that part: the user is told, and how to keep
// it as written (--hold subckt:NAME).
#pragma once

#include <set>
#include <string>
#include <vector>

#include "deck/diagnostic.hpp"
#include "deck/load.hpp"

namespace deckscale {

// One note per .subckt defined at the top level of its file that holds D, Q, J, Z or M
// devices (itself or through the .subckts it calls), is called from the top level or from a
// .subckt without such devices, and is not in `held` (lower-case names kept as written). At
// the .subckt's name, in file order. A file included inside a .subckt is part of its body
// (scale/hold_scan), unless it is also included elsewhere: its devices then do not count.
std::vector<Diagnostic> part_model_notes(const Deck& deck, const std::set<std::string>& held);

}  // namespace deckscale
