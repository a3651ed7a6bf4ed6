#include "deck/rcl_fields.hpp"

#include <string>

#include "base/text_util.hpp"
#include "deck/load.hpp"
#include "deck/spice_number.hpp"

namespace deckscale {
namespace {

bool number(std::string_view text) {
    NumberParse p = parse_spice_number(text);
    return p.number && p.problem == NumberProblem::none;
}

}  // namespace

std::optional<RclFields> rcl_fields(const Card& c) {
    if (c.kind != CardKind::element || c.fields.empty()) return std::nullopt;
    std::string name = card_keyword(c);
    if (name.empty() || (name[0] != 'r' && name[0] != 'c' && name[0] != 'l')) return std::nullopt;
    RclFields out;
    out.letter = name[0];
    const char* long_key = out.letter == 'r'   ? "resistance"
                           : out.letter == 'c' ? "capacitance"
                                               : "inductance";
    int positional = 0;
    const auto& fl = c.fields;
    for (std::size_t i = 1; i < fl.size(); ++i) {
        bool expression = fl[i].kind == TokenKind::brace || fl[i].kind == TokenKind::squote;
        if (fl[i].kind != TokenKind::word && !expression) continue;  // , ( ) = and strings
        bool keyed = i + 1 < fl.size() && fl[i + 1].kind == TokenKind::equals;
        if (keyed) {
            std::string key = to_lower(c.field_text(i));
            bool value_key = (key.size() == 1 && key[0] == out.letter) || key == long_key ||
                             (out.letter == 'c' && key == "cap");  // ngspice 39's alias
            // A value key wins over a positional field (`C1 a b cmod c=1n`).
            if (value_key && positional >= 2 && i + 2 < fl.size() && !out.keyed) {
                out.value = i + 2;
                out.keyed = true;
                out.after_value.reset();
            }
            i += 2;
            continue;
        }
        ++positional;
        if (positional == 1) out.node_a = i;
        if (positional == 2) out.node_b = i;
        if (positional == 3 && !out.value) out.value = i;
        if (positional == 4 && out.value && !out.keyed) out.after_value = i;
        // On an R line a later bare number overrides the value: `R1 a b 1,5` is 5 Ohm
        // (shared deck-syntax notes §1, tried with ngspice 39).
        if (positional >= 4 && out.letter == 'r' && out.value && !out.keyed &&
            number(c.field_text(*out.value)) && number(c.field_text(i))) {
            out.value = i;
            out.after_value.reset();
        }
    }
    if (positional < 2) return std::nullopt;
    return out;
}

}  // namespace deckscale
