// Simulator tolerances for comparing the runs of a nonlinear deck. ngspice stops its Newton
// iterations when every node voltage moved less than RELTOL times itself plus VNTOL and every
// branch current less than RELTOL times itself plus ABSTOL (ngspice 39 manual §15.1.1); with
// the defaults (1e-3, 1 uV, 1 pA) two equivalent decks can stop at operating points 1e-4 apart.
// Both runs get RELTOL = 1e-7 and absolute tolerances in the same proportion to their own
// currents and charges: ABSTOL / Km, CHGTOL / (Km Kf), VNTOL unchanged (a voltage). The
// shared notes "scaling-rules.md" §7 measured 1.9e-8 with reltol = 1e-7 against 8e-5 with
// the default.
#pragma once

#include <string>

#include "deck/load.hpp"
#include "scale/units.hpp"

namespace deckscale {

// True when the deck has a D, Q, J, Z or M element (a junction device).
bool has_junction_devices(const Deck& deck);

// The ".options ..." card for a deck scaled by `factors` against the original.
std::string tight_options_card(ScaleFactors factors);

}  // namespace deckscale
