// Comparing the distortion analysis (.disto) of an original deck with that of its rescaled
// version. ngspice 39 makes one plot per product (manual 15.3.3): without f2overf1 the 2nd and
// 3rd harmonics of the DISTOF1 inputs, with it the intermodulation products f1+f2, f1-f2 and
// 2f1-f2 of DISTOF1 at f1 and DISTOF2 at f2overf1 x f1. Each is a complex sweep over f1 and is
// compared as AC is: V'(Kf f1) = V(f1), Km I'(Kf f1) = I(f1).
#pragma once

#include <string>
#include <vector>

#include "sim/simulate.hpp"
#include "verify/compare.hpp"

namespace deckscale {

// The product a distortion plot holds, from ngspice's plot name ("DISTORTION - 2nd
// harmonic" -> "2nd harmonic"); the name itself when it has no such prefix.
std::string disto_part(const std::string& plot_name);

// One comparison per distortion plot of the original, paired with the scaled run's plot of
// the same type name ("disto1", ...). `problem` is set (and nothing returned) when the runs
// made different sets of distortion plots.
std::vector<Comparison> compare_disto(const std::vector<SimPlot>& original,
                                      const std::vector<SimPlot>& scaled, double km, double kf,
                                      const Tolerances& tol, std::string& problem);

}  // namespace deckscale
