// Trapezoidal ringing in a transient waveform. ngspice integrates with the trapezoidal rule
// by default, and a current that is C dv/dt of a capacitor driven straight from a source (a
// MOSFET gate on an ideal pulse) then alternates around its value from one time point to the
// next (tried: a BSIM3 inverter's input current swung by +-0.7 % at every step of a 50 ps edge).
// The two runs of a verification step apart, so their alternations do not line up: compared
// point by point such a current fails although neither run is wrong. Where a waveform rings,
// the [1 2 1] / 4 average of three neighbouring points removes the alternation (on even steps
// exactly) and keeps the waveform, which the comparison then also tries; and since the average
// leaves a rest where steps or swing are uneven, a value within the band the other run swings
// in there counts as agreeing: where a run rings, it is known no better than its swing.
#pragma once

#include <complex>
#include <cstddef>
#include <utility>
#include <vector>

namespace deckscale {

// The slopes of y over the four steps from point i-1 to point i+3 swing up and down: their
// successive changes are non-zero and alternate in sign (on a flat stretch the values
// themselves alternate; on a ramp the steps are alternately steep and shallow). The five
// instants of `t` must be apart: ngspice writes a jump at a breakpoint as two points at one
// instant, or a tiny step apart. False where i - 1 or i + 3 is outside y.
bool rings_at(const std::vector<std::complex<double>>& y,
              const std::vector<std::complex<double>>& t, std::size_t i);

// (y[i-1] + 2 y[i] + y[i+1]) / 4 (real parts); next to a jump or an end, the mean of y[i] and
// its one neighbour apart in time; y[i] alone if it has none.
double ringing_average(const std::vector<std::complex<double>>& y,
                       const std::vector<std::complex<double>>& t, std::size_t i);

// The lowest and highest of y[j-1] .. y[j+2] (real parts) not beyond a jump from y[j] and
// y[j+1]: the band a ringing waveform swings in around the interval [j, j+1].
std::pair<double, double> ringing_band(const std::vector<std::complex<double>>& y,
                                       const std::vector<std::complex<double>>& t, std::size_t j);

}  // namespace deckscale
