// Comparing the S-parameter analysis (.sp, ngspice 39 manual 15.3.8) of an original deck with
// that of its rescaled version. With every port's reference impedance z0 times Km, S stays
// as it is at Kf f (shared notes "scaling-rules.md" §2, verified there); the node voltages
// and branch currents of the plot (the last port's excitation) map like an AC sweep's.
// The Z and Y matrices ngspice adds follow from S and the ports' z0, so they are not
// compared again.
#pragma once

#include "sim/simulate.hpp"
#include "verify/compare.hpp"

namespace deckscale {

// True for the names of ngspice's Z and Y matrix vectors ("Z_1_2", "y_2_1").
bool impedance_matrix_vector(const std::string& name);

Comparison compare_sp(const SimPlot& original, const SimPlot& scaled, double km, double kf,
                      const Tolerances& tol);

}  // namespace deckscale
