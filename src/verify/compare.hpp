// Comparing the simulation of an original deck with that of its rescaled version. With x'
// from the scaled deck: node voltages V'(Kf f) = V(f), branch currents Km I'(Kf f) = I(f),
// V'(t/Kf) = v(t) (shared notes "scaling-rules.md" §7). Errors are relative to each
// vector's largest magnitude (AC, transient) or to its own value (operating point).
#pragma once

#include <set>
#include <string>
#include <vector>

#include "sim/simulate.hpp"

namespace deckscale {

struct Tolerances {
    double relative = 1e-6;       // AC and operating point
    double transient = 1e-3;      // relative to each waveform's peak
    double db = 0;                // when > 0: |magnitude error| in dB must be within it too
    double degrees = 0;           // when > 0: |phase error| in degrees must be within it too
    // Parts were held (scale --hold): equality is not expected. AC is judged by `db` and
    // `degrees` only (passes without them), the operating point and transient are shown as
    // information, and the largest |dB| and |deg| of every AC vector are found.
    bool held = false;
    // The original deck's GMIN (S; ngspice's default 1e-12), read off its .options. A branch
    // current no larger than kGminLevels x GMIN x the plot's largest node voltage is the
    // current of the shunts ngspice puts across junctions, resolved no better than the matrix
    // allows (a clamp diode's 1e-11 A wandered by 1e-4 with Km = 1.000001): where such a
    // vector fails, it is shown as at the GMIN level and not judged.
    double gmin = 1e-12;
    // The original deck has event-driven code models (scale/codemodel_rules.hpp): transient
    // points are compared with the runs allowed up to two of their longest time steps apart
    // (verify/event_timing.hpp).
    bool event_driven = false;
    // The original deck has XSPICE code models of any kind: a transient failure then says how
    // to tell their time resolution from the rewrite's error.
    bool code_models = false;
    // The original deck has lossless lines (T): a transient failure then says how to tell
    // their breakpoint timing from the rewrite's error (verify/compare_tran.cpp).
    bool delay_lines = false;
    // Branch currents (lower-case vector names, "vflux#branch") of voltage sources on a
    // magnetic loop: a loop's current is its flux, scaled by 1/(Km Kf) (scale/codemodels.hpp),
    // so the scaled run's is mapped back by Km Kf; `kf` is that Kf.
    std::set<std::string> flux_currents;
    double kf = 1;
};

constexpr double kGminLevels = 10;

struct VectorResult {
    std::string name;
    VectorKind kind = VectorKind::other;
    double worst = 0;      // relative error at the worst point
    double at = 0;         // frequency or time of the worst point, in the original's units
    double db_error = 0;   // AC: magnitude error at the worst point, dB
    double deg_error = 0;  // AC: phase error at the worst point, degrees
    double peak = 0;       // the reference magnitude
    bool passed = true;
    // AC with db or degrees tolerances, or held parts: the largest |magnitude error| (dB)
    // and |phase error| (degrees) over the sweep, where, in the original's Hz. Points where
    // the original is more than 60 dB below the vector's peak are left out (a phase there
    // is noise).
    double max_db = 0, max_db_at = 0, max_deg = 0, max_deg_at = 0;
    // A current at the GMIN level (Tolerances::gmin) that would have failed: passed, not judged.
    bool gmin_level = false;
    // A measurement (analysis "meas", verify/meas_compare.hpp): both results as ngspice
    // printed them (NaN where it gave none) and what it measures, with the expected factor.
    double original_value = 0, scaled_value = 0;
    std::string quantity = "";
};

struct Comparison {
    std::string analysis;  // "ac", "op", "tran", "noise", "dc", "tf", "sp", "disto" or "meas"
    std::string part;              // which of an analysis's plots ("2nd harmonic"), or ""
    std::size_t points = 0;
    double first = 0, last = 0;    // sweep or time range of the original
    std::string axis_unit;  // of first, last and each `at`: "Hz", "s", "V", "A", "Ohm", "degC"
    std::vector<VectorResult> vectors;  // judged ones worst first, then any at the GMIN level
    std::vector<std::string> problems;  // anything that makes the comparison fail by itself
    std::vector<std::string> not_compared;  // device-internal vectors (e.g. "t1#i1")
    // Why the decks are not expected to agree here (flicker noise that does not follow the
    // scaling): the comparison is reported but does not decide whether verification passes.
    std::vector<std::string> expected_differences;
    std::vector<std::string> notes;  // vectors left unjudged and why
    bool decides() const { return expected_differences.empty(); }
    bool passed() const;
    const VectorResult* worst() const;  // nullptr when there are no vectors
    // The analysis with its plot, as one-line summaries name it: "ac", "disto (2nd harmonic)".
    std::string label() const { return part.empty() ? analysis : analysis + " (" + part + ")"; }
};

// Checks that the scaled sweep `fs` ran at Kf times each frequency of `fo` (problems go into
// `c`), sets c.points, c.first and c.last, and returns the number of points to compare.
std::size_t check_mapped_sweep(const SimVector& fo, const SimVector& fs, double kf, Comparison& c);

Comparison compare_ac(const SimPlot& original, const SimPlot& scaled, double km, double kf,
                      const Tolerances& tol);

// Sets r.worst to NaN when either vector holds a value that is not finite (NaN or infinity):
// an error computed from such values means nothing, and the loops that look for the worst
// point skip a NaN. sort_worst_first then fails the vector.
void mark_non_finite(VectorResult& r, const SimVector& original, const SimVector& scaled);

// Orders `c.vectors` judged ones worst first, then those at the GMIN level; a vector whose
// error is no number (NaN or infinite values in a run) fails, comes first and is named in
// c.problems. Every comparison ends with it.
void sort_worst_first(Comparison& c);
Comparison compare_op(const SimPlot& original, const SimPlot& scaled, double km,
                      const Tolerances& tol);
// A DC sweep: the scaled run's swept values must be `sweep_factor` times the original's
// (`unit`: the swept quantity's, for the report); each vector is then compared point by point
// as the operating point is, relative to its largest magnitude over the sweep.
Comparison compare_dc(const SimPlot& original, const SimPlot& scaled, double km,
                      double sweep_factor, const std::string& unit, const Tolerances& tol);
Comparison compare_tran(const SimPlot& original, const SimPlot& scaled, double km, double kf,
                        const Tolerances& tol);

}  // namespace deckscale
