// Comparing the noise analysis of an original deck with that of its rescaled version.
// Thermal and shot noise follow a rescaled circuit (shared notes "scaling-rules.md" §8,
// checked there with ngspice 39): a noise voltage density (V/sqrt(Hz)) at Kf f is sqrt(Km)
// times the original's at f, since every resistor's noise voltage PSD 4kTR grows by Km while
// the voltage transfer functions stay; a current density (the input-referred noise of a
// current source input, A/sqrt(Hz)) is the output density divided by a transimpedance that
// grew by Km, so 1/sqrt(Km); noise integrated over the Kf times wider mapped band grows by
// another sqrt(Kf). With ngspice's `sqrnoise` the squares are compared (x Km, x Km Kf ...).
#pragma once

#include <optional>

#include "sim/simulate.hpp"
#include "verify/compare.hpp"

namespace deckscale {

// What a noise quantity of the scaled deck is over the original's: its ngspice kind, in the
// spectrum plot (`integrated` false) or the integrated plot. nullopt for a kind that is no
// noise quantity.
std::optional<double> noise_factor(VectorKind kind, bool integrated, double km, double kf);

// A vector of a noise comparison that is integrated over the band (onoise_total, ...): it
// has no frequency of its own. Its kind is a voltage, a current or the square of either.
bool integrated_noise(const VectorResult& v);

// Compares ngspice's two noise plots of each run: the spectra ("noise1": frequency,
// onoise_spectrum, inoise_spectrum and, with points per summary, each device's part) at
// mapped frequencies, and the integrated noise ("noise2": onoise_total, inoise_total, ...).
// Errors are relative to each spectrum's largest value, or to the integrated value itself.
// `totals_*` may be null when a run made no integrated plot.
Comparison compare_noise(const SimPlot& spectra_original, const SimPlot& spectra_scaled,
                         const SimPlot* totals_original, const SimPlot* totals_scaled, double km,
                         double kf, const Tolerances& tol);

}  // namespace deckscale
