// Comparing the results of a deck's own .meas cards between the original and the scaled run.
// The vectors already agree when the rewrite is right; the measurements check the rewritten
// .meas cards themselves (AT=, FROM=, TO=, TD=, VAL= follow the factors, or a measurement
// reads somewhere else). Each result's quantity follows from its kind (ngspice 39 manual
// §15.4): a crossing (WHEN, TRIG/TARG) or MIN_AT/MAX_AT is a point on the sweep axis (time
// / Kf, frequency x Kf, a swept source or resistor by its own factor); FIND, AVG, MIN, MAX,
// PP and RMS take the unit of their v() or i() (a voltage stays, a current / Km); INTEG is the
// output times the axis. PARAM and EXPR results are expressions: reported, not judged.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "deck/load.hpp"
#include "sim/simulate.hpp"
#include "verify/compare.hpp"

namespace deckscale {

struct MeasureSpec {
    std::string analysis;  // "tran", "ac", "dc", "sp" (lower case)
    std::string name;      // the result's name, lower case as ngspice prints it
    // scaled = original x (axis factor)^axis_power x (1/Km)^current_power, when judged.
    int axis_power = 0;
    int current_power = 0;
    std::string quantity;  // "time", "frequency", "sweep value", "voltage", "current", ...
    std::string not_judged;  // why its result is only shown (an expression, a dB current...)
    // A `meas` command of a .control block (which never runs here) as the .meas card that
    // measures the same after the run ("" for a .meas card, which stays in the deck itself).
    std::string card;
};

// The .meas / .measure cards of the deck's top level and the `meas` commands of its .control
// blocks, in order.
std::vector<MeasureSpec> find_measures(const Deck& deck);

// The deck sets ngspice's `autostop` option: with its .meas cards present a transient run
// stops once every measurement has its result, so they are left out of verification runs.
bool stops_on_measures(const Deck& deck);

// The result ngspice printed for measurement `name` ("name = value ..."); nothing when it
// printed none (the measurement failed) or "name = failed".
std::optional<double> measure_result(const std::vector<std::string>& log, const std::string& name);

// Why ngspice gave no result for `name`: the line it printed before ".meas ... name ...
// failed!", or "".
std::string measure_failure(const std::vector<std::string>& log, const std::string& name);

// ngspice prints most results with 7 significant digits: this is added to the tolerance.
constexpr double kPrintedDigitsTolerance = 1e-6;

// The tolerance given for the measurements of `analysis` ("tran": the transient's, else the
// relative one), before kPrintedDigitsTolerance is added.
double measure_base_tolerance(const std::string& analysis, const Tolerances& t);

// Compares the measurements of one analysis. `axis_factor`: the scaled run's axis over the
// original's (1/Kf for time, Kf for frequency, the swept item's factor on a DC sweep).
// `tolerance`: measure_base_tolerance; kPrintedDigitsTolerance is added.
Comparison compare_measures(const std::vector<MeasureSpec>& specs, const std::string& analysis,
                            const SimOutcome& original, const SimOutcome& scaled, double km,
                            double axis_factor, double tolerance);

}  // namespace deckscale
