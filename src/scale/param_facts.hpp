// Internal to the parameter plan (scale/param_plan.cpp): what the deck says about its
// parameters, gathered in one place (scale/param_gather.cpp) before anything is decided.
#pragma once

#include <set>
#include <string>
#include <vector>

#include "scale/param_index.hpp"
#include "scale/param_plan.hpp"
#include "scale/param_solve.hpp"

namespace deckscale {

// Where an equation comes from.
struct EquationOrigin {
    bool use = true;  // false: a definition's relation
    ParamSite site;
    int anchor = 0;    // a parameter it names
    std::string unit;  // of the use ("Ohm", "V", "-"), empty if not known
};

// A number in a definition that carries the parameter's scaling.
struct EditableNumber {
    int param = 0;
    std::size_t file = 0;
    std::uint32_t begin = 0, length = 0;
    int power = 1;    // the definition scales as this number to this power
    std::string key;  // the parameter as written there
};

struct ParamFacts {
    ParamIndex index;
    // Definitions' relations first, then uses in file order. Ids from params.size() on are
    // numbers written with a unit of their own (scale/param_dims.hpp), one id per number.
    std::vector<ParamEquation> equations;
    std::vector<EquationOrigin> origins;  // one per equation
    std::vector<EditableNumber> editables;
    std::vector<std::string> opaque;      // per parameter: why it cannot be planned, or empty
    std::vector<int> group;               // per parameter: its group of linked parameters
    std::vector<std::set<int>> named;     // per distinct text analysed: the parameters it names
    std::vector<std::size_t> use_params;  // per recorded use: its entry in `named`
    std::vector<bool> use_planned;        // per recorded use: it gave an equation
};

ParamFacts gather_param_facts(const Deck& deck, const std::vector<ParamUse>& uses);

// " (R1, deck.cir:5)"
std::string site_text(const Deck& deck, const ParamSite& site);

}  // namespace deckscale
