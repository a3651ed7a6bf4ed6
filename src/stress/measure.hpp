// Stress of each part of a rescaled deck against its original: from the operating point and
// the AC response at the driving source's stated amplitude, per R, C and L the DC and peak
// current, the voltage across it and a resistor's power, and the change from the original.
// Never prints.
//
// Each deck runs once in an isolated simulator process with `.op` and its own `.ac` (the
// scaled deck's sweep is already mapped). AC results are phasors whose magnitude is the peak
// of the sinusoid at the source's AC value (ngspice 39 manual §4.1 for that value; phasor
// analysis is common practice), so a resistor's average power at a frequency is
// |V|^2 / (2 R); its DC power is V^2 / R. A capacitor's AC current is
// |V| 2 pi f C, an inductor's is its branch current. A deck with a .tran also runs it: peaks
// over time, a resistor's power averaged over the run, a capacitor's current C dv/dt from
// the time points.
#pragma once

#include <chrono>
#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "base/file_system.hpp"
#include "sim/simulate.hpp"

namespace deckscale {

struct PartLoad {
    double dc_voltage = 0, dc_current = 0, dc_power = 0;  // power: resistors only
    double ac_voltage = 0, ac_current = 0, ac_power = 0;  // largest over the sweep
    // From the deck's .tran, when it has one: the largest |v| and |i| over the run, and a
    // resistor's power averaged over it (trapezoidal rule).
    double tran_voltage = 0, tran_current = 0, tran_power = 0;
    // The largest of |DC| + AC amplitude and the transient's peak.
    double peak_current() const;
    double peak_voltage() const;
    // The largest average power: DC and AC superposed, or over the transient.
    double power() const;
};

// Ratings: per kind ('r', 'c', 'l') or per part (lower-case name); 0 = none given.
struct Ratings {
    std::map<std::string, double> power, voltage, current;  // keys: "r" (a kind) or "r3"
};

// Reads "R=0.25W,C=50V,L=1A,R3=1W" into `ratings` (the unit letter says which rating). Returns
// an error text or "".
std::string parse_ratings(const std::string& text, Ratings& ratings);

struct PartStressRow {
    std::string part;                  // lower case
    double value = 0;                  // the scaled deck's value
    std::optional<PartLoad> original;  // absent: no part of that name in the original
    PartLoad scaled;
    double power_ratio = 0, current_ratio = 0;  // scaled / original; 0 when not comparable
    std::vector<std::string> flags;             // why the part needs a look, one phrase each
};

struct StressRequest {
    std::string original, scaled;
    double ratio_limit = 2;  // flag growth of power or peak current beyond this factor
    Ratings ratings;
    std::chrono::milliseconds timeout{60000};
    std::uint64_t memory_mb = 8192;
};

struct StressResult {
    enum class Outcome { done, bad_input, sim_failed } outcome = Outcome::done;
    std::vector<std::string> problems;
    std::vector<PartStressRow> rows;  // the scaled deck's R, C and L in deck order
    std::vector<std::string> held;    // parts not measured (inside subcircuits, no value)
    bool ac = false;                  // the AC columns were simulated
    bool tran = false;                // the transient columns were simulated
};

// Throws DeckError for a deck that cannot be read.
StressResult run_stress(const StressRequest& request, const FileSystem& fs);

}  // namespace deckscale
