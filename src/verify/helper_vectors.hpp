// Vectors that ngspice 39 makes up when it reads behavioural elements (tried with `listing
// expand`): `G1 0 out cur='…'` (VALUE=, TABLE) becomes `g1 0 out g1_int1 0 1` driven by
// `bg1 g1_int1 0 v=…`; `C1 a 0 Q='…'` (or C='…') becomes `gc1 a 0 c1_int1 0 1`, a unit inductor
// `lc1 c1_int1 0 1` and `bc1 0 c1_int1 i=Q`; `L1 a b L='…'` becomes `fl1 l1_int2 0 bl1 -1`,
// `ll1 l1_int2 0 1` and `bl1 b a v=…`. Their values are in the helpers' own normalisation.
#pragma once

#include <string>

#include "sim/simulate.hpp"

namespace deckscale {

// The node `x_int<N>` of a C element and `x_int1` of a G element: its voltage is a current in
// amperes (C: dQ/dt; G: the output current), so it scales like a current. (`G1 … TABLE {e} =
// …` also gets `g1_int2`, the value of e, read through a pwl code model into `g1_int1`.)
bool current_as_voltage(const SimVector& v);

// A helper's state that is neither a node voltage nor a port current of the circuit: the
// node `l…_int<N>` of an inductor (1 H times di/dt) and the branch `lc…#branch` of a
// capacitor's unit inductor (the charge), the latter only when the plot holds its `c…_int1`.
bool translation_state(const SimVector& v, const SimPlot& plot);

}  // namespace deckscale
