#include "retarget/impedance.hpp"

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "verify/factor_inference.hpp"

namespace deckscale {

NamedImpedance named_impedance(const Deck& deck, const std::string& element) {
    NamedImpedance r;
    std::string name = to_lower(element);
    for (const auto& v : element_values(deck))
        if (v.name == name && v.letter == 'r') {
            r.ohms = v.value;
            if (!(v.value > 0))
                r.problem = fmt::format("{} has the value {}: an impedance target needs a "
                                        "positive resistance", element, v.text);
            return r;
        }
    bool exists = false;
    for (std::size_t f = 0; f < deck.files.size() && !exists; ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind == CardKind::element && card_keyword(c) == name) exists = true;
        });
    if (!exists)
        r.problem = fmt::format("the deck has no part named {}; name a resistor (--impedance "
                                "R1=600) or state the mapping (--impedance-map 1:600)", element);
    else if (name[0] == 'r')
        r.problem = fmt::format("{}'s value is not a plain number, so it gives no impedance "
                                "level; state the mapping instead (--impedance-map OLD:NEW)",
                                element);
    else
        r.problem = fmt::format("{} is not a resistor, so it has no impedance level of its own; "
                                "name a resistor or state the mapping (--impedance-map OLD:NEW)",
                                element);
    return r;
}

}  // namespace deckscale
