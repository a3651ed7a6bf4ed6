#include "retarget/impedance.hpp"

#include <optional>

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
    // "Z0=50" or "Z0 50" (also "ZO" on a T line), the fields the rule table scales by Km
    // (scale/rules.cpp); a port ("portnum n", n > 0) without a positive z0 before it takes
    // 50 Ohm, as ngspice 39 does (vsrcpar.c).
    bool exists = false;
    for (std::size_t f = 0; f < deck.files.size() && !exists; ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (exists || c.kind != CardKind::element || card_keyword(c) != name) return;
            exists = true;
            if (name[0] != 't' && name[0] != 'v') return;
            auto number_after = [&](std::size_t i) -> std::optional<double> {
                std::size_t j = i + 1;
                if (j < c.fields.size() && c.fields[j].kind == TokenKind::equals) ++j;
                if (j >= c.fields.size()) return std::nullopt;
                auto p = parse_spice_number(c.field_text(j));
                if (p.problem != NumberProblem::none || !p.number) return std::nullopt;
                return p.number->value;
            };
            double z0 = 0;
            for (std::size_t i = 1; i < c.fields.size(); ++i) {
                std::string key = to_lower(c.field_text(i));
                if (key == "z0" || (key == "zo" && name[0] == 't')) {
                    z0 = number_after(i).value_or(0);
                } else if (key == "portnum" && name[0] == 'v') {
                    if (number_after(i).value_or(1) >= 0.5 && !(z0 > 0)) z0 = 50;
                }
            }
            if (z0 > 0) r.ohms = z0;
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
