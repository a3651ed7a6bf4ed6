// What `scale --hold` names, as the user writes it: `NAME`, `model:NAME` or `subckt:NAME`,
// where NAME may use the wildcards `*` (any run of characters) and `?` (one character),
// compared without regard to case as ngspice compares names. And the comment line a scaling
// run with held parts writes after the title, from which `verify` learns what was held.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "deck/load.hpp"
#include "scale/units.hpp"

namespace deckscale {

enum class HoldKind {
    any,     // a top-level element or X instance if one matches, else a .subckt, else a .model
    model,   // model:NAME: every instance of the .model
    subckt,  // subckt:NAME: every X instance of the .subckt
};

struct HoldItem {
    std::string text;  // as written ("model:QN*")
    HoldKind kind = HoldKind::any;
    std::string pattern;  // lower case, without the prefix
};

// Splits comma-separated lists and reads each item. Returns the error text of the first bad
// item (an empty one, an unknown prefix) in `error`, and nothing.
std::optional<std::vector<HoldItem>> read_hold_items(const std::vector<std::string>& texts,
                                                     std::string& error);

// True when `name` (lower case) matches `pattern` (lower case, with * and ?).
bool name_matches(std::string_view pattern, std::string_view name);

// The comment line written after the title of a deck scaled with held parts (without its
// line end): "* deckscale held: km=1 kf=0.1 items=XU1,model:qn".
std::string held_line(const std::vector<std::string>& items, ScaleFactors factors);

struct HeldLine {
    std::vector<std::string> items;
    ScaleFactors factors;
};

// The first such line among the comments right after the title of the deck's top file.
std::optional<HeldLine> find_held_line(const Deck& deck);

}  // namespace deckscale
