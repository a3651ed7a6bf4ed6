// The units of the numbers in a .control block's expressions: the right side of `let`, and
// the conditions of `if`, `while` and `dowhile` (ngspice 39 manual 17.2 and 17.6). A number's
// unit is taken from what it meets:
// - added to, subtracted from or compared with a quantity of known unit, it has that unit:
//   `time gt 1.1m` makes 1.1m a time (divided by Kf), `i(v1) < 1m` a current (divided by Km),
//   `v(out) > 0.5` a voltage (kept);
// - multiplying or dividing a quantity, it takes its unit from what the product meets:
//   `exp(-time/1m)` makes 1m a time, `i(v1)*2k > v(out)` 2k an ohm (in `sin(2*pi*1k*time)`
//   which of 2 and 1k carries the frequency is not known: refused); where nothing tells, it
//   is a pure number (a coefficient) and kept: `2*pi*frequency`, `v(out)/2`. Where such a
//   coefficient stands beside a vector other than the constant pi, a note says so, since
//   `v(out)/1k` could mean a resistance;
// - an index `x[3]`, an exponent `x^2`, the argument of log, exp, sin, ... is a pure number.
// A variable (`let name = ...`) carries one unit through the whole block: the unit of its
// value, as what it meets elsewhere tells. Numbers whose variables never meet a quantity of
// the circuit (loop counters: `let i = 0`, `while i < 3`, `let i = i + 1`) work the same in
// both decks and are kept. A number is not known, and refused, where it meets a vector whose
// unit is not known here (a bare node name, `@r1[i]`, a `set` variable), where one variable
// meets two units, where a product of numbers would have to carry a unit (which of them?), and
// where a variable's value is read by another command through `$var`, or by name (its use
// there is not followed), except `alter dev = var`, which gives the variable the unit of what
// it sets (manual 17.5.3: the value may be a vector), and commands that only show or write a
// vector (print, plot, wrdata, meas, ...).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "deck/card.hpp"
#include "scale/units.hpp"

namespace deckscale {

struct ExpressionLiteral {
    Token at;  // the number's bytes
    // How it scales (by Km^km Kf^kf); nullopt: not known, `why` says why.
    std::optional<UnitExponents> exponents;
    std::string why;
    // Kept as a pure number because it multiplies or divides a vector other than pi.
    bool coefficient = false;
};

struct ControlUnits {
    // For each command of a block (in block order): the numbers of its expression, in text
    // order, for let, if, while and dowhile; for `alter dev = var`, the variable's name when
    // its unit is not known (that alter is then refused); empty for every other command, and
    // for `let` of the special vectors of linearize and cutout (lin-tstart, ...), which
    // scale_let handles.
    std::vector<std::vector<ExpressionLiteral>> by_command;
    // Numbers of variables whose unit nothing in the block tells were kept: right only if no
    // other .control block of the deck reads those variables (vectors outlive their block).
    bool free_variables = false;
};

// `other_blocks`: the deck has another .control block; the numbers of variables whose unit
// nothing in this block tells are then not known (a variable's unit is not followed across
// blocks).
ControlUnits control_expression_units(const std::vector<Card>& commands, bool other_blocks);

}  // namespace deckscale
