// Internal to the comparisons (verify/compare.cpp, verify/compare_tran.cpp): what they share.
#pragma once

#include <utility>
#include <vector>

#include "verify/compare.hpp"

namespace deckscale {

// The smallest magnitude an error is measured against, by kind (ngspice's ABSTOL and VNTOL).
double noise_floor(VectorKind kind);
// A node voltage or branch current, not a device's internal state or the swept quantity.
bool compared(const SimVector& v, const SimPlot& p);
// Factor that maps a scaled-deck value back onto the original: 1 for voltages, Km for
// currents, Km Kf for the flux of a magnetic loop.
double back_factor(const SimVector& v, double km, const Tolerances& tol);
// The plot's frequency or time vector, or null.
const SimVector* scale_vector(const SimPlot& p);
// The vectors compared in both plots, in the original's order; the names only one plot has
// and the original's device-internal vectors go into `c`.
std::vector<std::pair<const SimVector*, const SimVector*>> pairs_to_compare(const SimPlot& o,
                                                                            const SimPlot& s,
                                                                            Comparison& c);
// Marks the failed branch currents of `c` that stay at the GMIN level of the original plot
// in both runs as passed and not judged, with a note naming each.
void excuse_gmin_level(const SimPlot& o, const SimPlot& s, double km, const Tolerances& tol,
                       Comparison& c);

}  // namespace deckscale
