// Text after the .end card. The ngspice 39 program reads the cards that follow .end in a
// deck file as part of the circuit (tried with `ngspice -b`: `R9 1 0 5` after `.end` took
// part in the operating point, and a line of prose after it stopped the run with "unknown
// parameter"). This tool keeps that text as it is, so anything there but blank and comment
// lines would stay unscaled: it is refused.
#pragma once

#include "scale/pass.hpp"

namespace deckscale {

// Reports the first line after .end that is neither blank nor a comment as unscalable.
void check_after_end(ScalePass& p);

}  // namespace deckscale
