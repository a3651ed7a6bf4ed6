// The verification report: text for people (summary first, worst offenders, one clear
// PASS/FAIL line) and JSON for machines.
#pragma once

#include <string>
#include <vector>

#include "verify/compare.hpp"
#include "verify/factor_inference.hpp"

namespace deckscale {

struct VerifyReport {
    std::string original, scaled;
    double km = 1, kf = 1;
    bool factors_inferred = false;
    bool factors_from_held_line = false;  // read from the scaled deck's held-parts line
    int resistor_pairs = 0, reactive_pairs = 0;
    std::vector<RatioMismatch> mismatches;
    std::vector<Comparison> comparisons;
    Tolerances tolerances;
    std::vector<std::string> notes;
    // What the scaled deck's held-parts line names (scale --hold): the comparison then shows
    // how far the response moved instead of expecting equality (Tolerances::held).
    std::vector<std::string> held;
    bool passed() const;
};

std::string report_text(const VerifyReport& r);
std::string report_json(const VerifyReport& r);

}  // namespace deckscale
