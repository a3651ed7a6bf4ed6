#include "retarget/impedance.hpp"

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "verify/factor_inference.hpp"

namespace deckscale {

NamedImpedance named_impedance(const Deck& deck, const std::string& element) {
    NamedImpedance r;
    std::string name = to_lower(element);
    for (const auto& v : element_values(deck))
        if (v.name == name && v.letter == 'r') {
            r.ohms = v.value;
            if (!(v.value > 0))
                r.problem = fmt::format(
                    "{} has the value {}: an impedance target needs a "
                    "positive resistance",
                    element, v.text);
            return r;
        }
    // A transmission line's characteristic impedance or an RF port's reference impedance:
    // "Z0=50" (also "ZO=" on a T line): the fields the rule table scales by Km (scale/rules.cpp).
    bool exists = false;
    for (std::size_t f = 0; f < deck.files.size() && !exists; ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (exists || c.kind != CardKind::element || card_keyword(c) != name) return;
            exists = true;
            if (name[0] != 't' && name[0] != 'v') return;
            for (std::size_t i = 1; i + 2 < c.fields.size(); ++i) {
                std::string key = to_lower(c.field_text(i));
                if ((key != "z0" && key != "zo") || c.fields[i + 1].kind != TokenKind::equals)
                    continue;
                auto p = parse_spice_number(c.field_text(i + 2));
                if (p.number && p.number->value > 0) r.ohms = p.number->value;
            }
        });
    if (r.ohms > 0) return r;
    if (!exists)
        r.problem = fmt::format(
            "the deck has no part named {}; name a resistor (--impedance "
            "R1=600) or state the mapping (--impedance-map 1:600)",
            element);
    else if (name[0] == 'r')
        r.problem = fmt::format(
            "{}'s value is not a plain number, so it gives no impedance "
            "level; state the mapping instead (--impedance-map OLD:NEW)",
            element);
    else
        r.problem = fmt::format(
            "{} is not a resistor, nor a line or port with a Z0, so it has no impedance level of "
            "its own; name one or state the mapping (--impedance-map OLD:NEW)",
            element);
    return r;
}

}  // namespace deckscale
