// The parts of the verification report for a scaled deck with held parts (scale --hold):
// equality is not expected, so the report shows how far the response moved (the largest
// |dB| and |deg| of every AC vector over the sweep, and where) and judges it only against
// --tolerance-db / --tolerance-deg; without them it is information and verify exits 0.
#pragma once

#include <string>

#include "verify/report.hpp"

namespace deckscale {

// The AC table: per vector the largest |dB| and |deg| with the scaled deck's frequency.
std::string held_ac_table(const Comparison& c, const VerifyReport& r);

// The closing line (PASS, FAIL or INFO) and the caution above it.
std::string held_verdict(const VerifyReport& r);

// The vector that moved most in dB (or degrees) among the deck's own nodes and branches
// (those inside subcircuit instances, "xu1.c1", only when there are no others); null when
// there are no vectors.
const VectorResult* most_moved(const Comparison& c, bool degrees);

// True when --tolerance-db or --tolerance-deg judges the deviation.
bool held_judged(const VerifyReport& r);

}  // namespace deckscale
