#include "yield/parts.hpp"

#include <fmt/format.h>

#include <cmath>
#include <set>

#include "deck/circuit_cards.hpp"
#include "deck/deck_params.hpp"
#include "deck/rcl_fields.hpp"

namespace deckscale {

PartList find_parts(const Deck& deck, const ToleranceSpec& tolerances) {
    PartList out;
    std::set<std::string> seen;
    ParamTable params = top_level_params(deck);
    visit_circuit_elements(deck, [&](std::size_t f, const Card& c, bool in_subckt) {
        auto rcl = rcl_fields(c);
        if (!rcl) return;
        std::string kw = card_keyword(c);
        auto hold = [&](std::string why) {
            const Token& t = c.fields[0];
            out.held.push_back(deck.files[f].source->diagnose(
                Severity::note, t.begin, t.size(), fmt::format("{} keeps its value: {}", kw, why)));
        };
        if (in_subckt) return hold("it is inside a subcircuit");
        if (!rcl->value) return hold("it has no value field");
        // A value written with the deck's top-level parameters is drawn like a number:
        // `alter` sets the part itself, and each part of a shared parameter is a part of
        // its own with its own tolerance.
        auto value = value_with_params(c.field_text(*rcl->value), params);
        if (!value || !std::isfinite(*value))
            return hold("its value does not evaluate with the deck's top-level parameters");
        if (!(*value > 0)) return hold("its value is not a positive number");
        seen.insert(kw);
        out.parts.push_back({kw, *value, tolerances.of(kw)});
    });
    for (const auto& [name, tol] : tolerances.by_part)
        if (!seen.count(name))
            out.errors.push_back(
                fmt::format("--tolerance {}: no R, C or L of that name with a "
                            "value at the deck's top level",
                            name));
    return out;
}

}  // namespace deckscale
