// Parameters a snap may round. A deck often writes its parts as `.param rload=10k` and
// `R1 out 0 {rload}`; rounding then means rounding the parameter. That is safe only when the
// parameter is nothing but those parts' value: a global `.param NAME=NUMBER` (one
// definition, a plain number) whose every use in the deck is the whole value `{NAME}` or
// `'NAME'` of R, C or L elements of one kind. A parameter used anywhere else (in an
// expression such as `{rload/2}`, in another parameter, a model, an analysis, an `.if`, a
// `.control` block, or as parts of two kinds) is left alone, with the first such use named.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <utility>
#include <vector>

#include "deck/load.hpp"

namespace deckscale {

// The whole-value use of a parameter by an R, C or L element.
struct ParamValueUse {
    std::size_t file = 0;
    std::uint32_t begin = 0;  // the value token
    char kind = 'r';          // 'r', 'c' or 'l'
    std::string element;      // as written: "R1"
};

struct SnappableParam {
    std::string name;  // as written in its definition
    std::size_t file = 0;
    std::uint32_t begin = 0, end = 0;  // its number in the .param card
    double value = 0;
    char kind = 'r';
    std::vector<std::string> elements;  // the parts whose value it is, in file order
};

struct ParamSnapPlan {
    std::vector<SnappableParam> params;  // in the order of their definitions
    // For each whole-value use (by (file, value token begin)): the index into `params`, or
    // -1 with the reason in `why`.
    std::map<std::pair<std::size_t, std::uint32_t>, int> use_of;
    std::map<std::pair<std::size_t, std::uint32_t>, std::string> why;
};

// `uses`: every R, C or L element of a snapped kind whose value is `{NAME}` or `'NAME'`.
ParamSnapPlan plan_param_snap(const Deck& deck, const std::vector<ParamValueUse>& uses);

}  // namespace deckscale
