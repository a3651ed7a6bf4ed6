// Comparing the small-signal transfer function analysis (.tf) of an original deck with that of
// its rescaled version. ngspice 39 reports three numbers (manual 15.3.9): the transfer
// function out/in, the input impedance seen by the input source and the output impedance at
// the output. Impedances grow by Km; the transfer function is out/in, where a voltage stays and
// a current is divided by Km, so V/V and I/I stay, V/I (ohms) grows by Km and I/V (siemens)
// is divided by Km.
#pragma once

#include "deck/analyses.hpp"
#include "sim/simulate.hpp"
#include "verify/compare.hpp"

namespace deckscale {

// The factor that maps the scaled deck's value of the .tf vector `name` back onto the
// original's; 0 for a name that is none of the three.
double tf_back_factor(const std::string& name, const TfSpec& tf, double km);

Comparison compare_tf(const SimPlot& original, const SimPlot& scaled, const TfSpec& tf, double km,
                      const Tolerances& tol);

}  // namespace deckscale
