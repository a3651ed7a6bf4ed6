// ngspice's absolute tolerances under scaling. The transient solver compares currents with
// ABSTOL (default 1e-12 A) and charges with CHGTOL (default 1e-14 C) (ngspice 39 manual §15.1);
// in a scaled deck currents are 1/Km and charges 1/(Km Kf) of the original's, so the defaults
// no longer match and the time steps differ (tried: an RC driven by a sine, Km = 50, Kf = 1:
// the source current differed by 2 % of its peak in the first microseconds; with both
// tolerances written out scaled, by 6.5e-14). Like a switch model's defaults, they are
// written out scaled after each .tran card when no .options card sets them.
#pragma once

#include "scale/pass.hpp"

namespace deckscale {

// Inserts `.options abstol=… chgtol=…` (those not set by the deck) after the current card.
void write_solver_tolerances(ScalePass& p);

}  // namespace deckscale
