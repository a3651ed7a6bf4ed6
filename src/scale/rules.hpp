// The rule table: which field of which card carries which unit. The scaling pass only reads
// it. Scopes are element letters ("r"), source functions ("pulse"), model types
// ("model:sw") and dot cards (".tran"); positional fields are named "#1", "#2", ...
// Sources: shared notes "scaling-rules.md" §1-§6 (each row checked with ngspice 39 there).
#pragma once

#include <optional>
#include <span>
#include <string_view>

#include "scale/units.hpp"

namespace deckscale {

struct FieldRule {
    std::string_view scope;
    std::string_view field;
    Unit unit;
};

std::span<const FieldRule> rule_table();

// The unit of `field` (lower-case) in `scope`, or nullopt when the table does not know it.
std::optional<Unit> find_rule(std::string_view scope, std::string_view field);

}  // namespace deckscale
