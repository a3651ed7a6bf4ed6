// Which parameters are scaled once at their definition and which are left to their use sites.
// The scaling pass records every value that names a parameter and what it multiplies it by;
// the plan reads the deck's definitions and every other place a parameter appears
// (scale/param_index), works out each parameter's scaling dimension from all of them
// (scale/param_dims, scale/param_solve), and for each group of linked parameters decides:
//   - every use agrees on one scaling and fixes it: each definition that is a number is
//     rewritten (`.param rbase=10k` -> `20k` for Km = 2), a definition from other parameters
//     follows by itself, and the uses are left as written;
//   - the uses disagree, do not fix it, or pass through something whose scaling is not known
//     (.control, a run-time expression, a random function, a name two scopes define): the
//     uses are wrapped as `{(expr)*k}` and no definition is touched.
// Either way each parameter is scaled exactly once (shared notes "scaling-rules.md" §5,
// `.param` row (c) and the subcircuit-parameter row).
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "deck/load.hpp"
#include "scale/param_index.hpp"
#include "scale/units.hpp"

namespace deckscale {

// A value naming a parameter, as the scaling pass met it.
struct ParamUse {
    std::size_t file = 0;
    std::uint32_t begin = 0, end = 0;
    std::optional<UnitExponents> exponents;  // nothing: a factor the plan cannot follow
    double factor = 1;                       // what the pass multiplies the value by
    std::string element;                     // the card ("R1", ".tran")
    std::string unit;                        // "Ohm", "F", ... as in the change list
    std::string why;                         // without exponents: what the value is
};

enum class ParamOutcome : std::uint8_t {
    definition,  // its definition(s) rewritten; uses left as written
    follows,     // defined by other parameters that are scaled: nothing to rewrite
    unchanged,   // its unit's factor is 1 (a voltage, a ratio, or Km = 1 for a resistance)
    wrapped,     // uses wrapped {(expr)*k}, definitions left as written
    unused,      // no value uses it
};

struct ParamDecision {
    std::string name;    // as written at its first definition
    std::string subckt;  // empty for a global parameter
    ParamSite defined;
    ParamOutcome outcome = ParamOutcome::unused;
    std::string kind;  // definition, follows, unchanged: "resistance", "time", ...
    double factor = 1;
    std::size_t wrapped_uses = 0;  // wrapped: values rewritten
    std::string why;               // wrapped: the reason
};

// A definition's number rewritten.
struct DefinitionEdit {
    std::size_t file = 0;
    std::uint32_t begin = 0, length = 0;
    std::string text;
    std::string param;  // as written, for the change list
    std::string unit;
    double factor = 1;
};

struct ParamPlan {
    std::vector<std::pair<std::size_t, std::uint32_t>> settled;  // uses left as written, sorted
    std::vector<DefinitionEdit> edits;                           // sorted by file and offset
    std::vector<ParamDecision> decisions;                        // by first definition
    bool changes_output = false;  // a definition rewritten or a use no longer wrapped

    bool settled_at(std::size_t file, std::uint32_t begin) const;
};

// Throws nothing for any deck; uses in any order.
ParamPlan plan_params(const Deck& deck, const std::vector<ParamUse>& uses, ScaleFactors factors,
                      int digits);

// "resistance", "capacitance", ... for a scaling dimension, refined by the unit the uses
// name ("V" -> voltage for Km^0 Kf^0).
std::string kind_name(Fraction km, Fraction kf, std::string_view unit);

}  // namespace deckscale
