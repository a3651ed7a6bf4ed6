// One .control expression read for the units of its numbers (scale/control_units.hpp): a
// small parser (|| && ! comparisons + - * / % ^ unary signs, indices, calls, v(..) and i(..))
// over the expression's text, nesting capped, that unites the slots (scale/unit_slots.hpp)
// of its numbers and variables by what each meets.
#pragma once

#include <cstdint>
#include <map>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "deck/card.hpp"
#include "scale/unit_slots.hpp"

namespace deckscale {

// What a subexpression is: a quantity of known unit, a slot (numbers and variables whose
// unit is to be found), a number times or over a quantity of known unit (`scaled`: its unit
// is k * unit(slot) + e, k = +1 or -1, so what it meets tells the number's unit: the 1m in
// exp(-time/1m) is a time), or opaque (a unit not known here).
struct UnitTerm {
    enum Kind { fixed, slot, scaled, opaque } kind = opaque;
    int k = 1;  // scaled: the sign of the number's unit in the term's
    UnitExponents e{0, 0};
    int s = -1;
    bool constant = false;  // made of numbers and pi only
    bool pi = false;        // holds the constant pi
    std::string name;       // for opaque terms: what is not known
    int var = -1;  // a fixed term read from a variable, or a scaled term of one: its slot
};

struct ExpressionRead {
    bool readable = false;  // false: not an expression this reader knows
    UnitTerm value;         // what the whole expression is
    std::vector<std::pair<Token, int>> numbers;  // each number's bytes and its slot
    // Slots taken as coefficients (pure), and whether they get the part-value note.
    std::vector<std::pair<int, bool>> coefficients;
    // Variables read as quantities of the unit bound to them when they were read.
    std::vector<std::pair<int, UnitExponents>> assumed;
};

// `text` is the expression's bytes, starting at file offset `base`; `variables` are the
// block's let variables by lower-case name, with their slots.
ExpressionRead read_expression(std::string_view text, std::uint32_t base, UnitSlots& slots,
                               const std::map<std::string, int>& variables);

}  // namespace deckscale
