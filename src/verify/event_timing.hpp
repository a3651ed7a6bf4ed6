// The timing resolution of event-driven models. ngspice evaluates XSPICE digital and real
// models (scale/codemodel_rules.hpp, event_driven_model) only at the analog time points: an
// A/D bridge sees a crossing at the first time point after it, and an event scheduled for an
// instant that falls (or rounds) past a time point is taken up at the next one. The scaled
// run's times are the original's divided by Kf and rounded differently (with Kf a power of two,
// exactly alike), and after the first event the two runs' grids no longer line up, so an edge
// of a bridge's output, and the response of whatever it drives, lands a step or two apart in
// the two runs. Tried: a 2 kHz sine into adc_bridge and back through dac_bridge, 0.2 us steps:
// exact with Kf = 2 or 4; the 0.5 V edge 0.2 us late with Kf = 2.5, 0.36 us late with Kf = 3,
// 0.06 us early with Kf = 1000; an RC of 20 us after it then differs by 1 % of its swing.
// Point by point that fails although neither run is wrong; so, in such decks, a point is also
// compared with the two runs allowed up to two time steps apart.
#pragma once

#include <complex>
#include <cstddef>
#include <vector>

namespace deckscale {

// A run's waveform on the original's time axis: values times `factor` (Km for currents of the
// scaled run, else 1). Instants ascending.
struct Trace {
    const std::vector<double>& t;
    const std::vector<std::complex<double>>& y;
    double factor = 1;
};

// The longest step between neighbouring instants of `t` (0 for fewer than two).
double longest_step(const std::vector<double>& t);

// The error at the original's point k (instant t) when the runs may be up to `shift` apart in
// time: the larger of the original's value's distance from the range the scaled waveform
// (straight between its points) takes within t +- shift, and the scaled waveform's value at t
// from the range the original takes there. A time shift within `shift` gives 0; a waveform too
// large or too small still shows at its peaks (each run's extreme lies outside the other's
// range), so only timing within `shift` is forgiven. Within `shift` of either end of the
// runs, where the later run's values past the end are missing, the smaller of the two
// distances counts. Infinite where a trace is empty or has
// fewer values than instants.
double shifted_error(const Trace& original, std::size_t k, const Trace& scaled, double shift);

}  // namespace deckscale
