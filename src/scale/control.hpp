// Internal to the .control handler (scale/control.cpp, scale/control_commands.cpp): what a
// block has run so far, the word helpers and the handlers of the commands that are not read
// as dot cards. Table of the commands: shared notes "control-and-sweeps.md" A.2, from the
// ngspice 39 manual chapter 17.
#pragma once

#include <cstddef>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "deck/card.hpp"
#include "scale/control_units.hpp"
#include "scale/pass.hpp"
#include "scale/units.hpp"

namespace deckscale {

// What the block has run so far: the unit of the current plot's scale.
struct BlockState {
    std::optional<Unit> scale;  // time, frequency or the DC sweep's quantity
    bool scale_known = false;   // false before any analysis
    // `foreach var v1 v2 ...` loops whose variable the block uses only as the value of
    // `alter` commands of one unit (and in `echo`): that unit, by variable (lower case).
    std::map<std::string, Unit> foreach_units;
    // The numbers of each command's expression (scale/control_units.hpp), by command, and the
    // command being scaled.
    std::vector<std::vector<ExpressionLiteral>> expressions;
    std::size_t index = 0;
};

inline constexpr std::string_view kUseTells =
    "the unit of this number is known only from how its value is used";

// v, vm, vdb, i, ... : the output functions whose arguments are node or source names.
bool is_output_function(std::string_view word);
// The unit of v(..), i(..) and their magnitude/real/imaginary forms; none for dB and phase;
// nullopt for anything else.
std::optional<Unit> output_function_unit(std::string_view word);
// The first numeric literal in fields [from, to) outside the node names of v(..), i(..).
std::optional<Token> literal_in(const Card& c, std::size_t from, std::size_t to);
bool is_number_word(const Card& c, const Token& t);
// Refuses the first literal of fields [from, end) with `why`.
void refuse_literal(ScalePass& p, const Card& c, std::size_t from, std::string_view why);

void scale_set(ScalePass& p, const Card& c);
void scale_let(ScalePass& p, const Card& c, const BlockState& st);
// The numbers of an `if`, `while` or `dowhile` condition, or of a `let` expression.
void scale_expression(ScalePass& p, const Card& c, const BlockState& st);
void scale_alter(ScalePass& p, const Card& c, const BlockState& st);
// What an `alter` command sets (manual 17.5.3: alter dev = v, alter dev par = v,
// alter @dev[par] = v): the field of its value, the parameter and the parameter's unit.
struct AlterTarget {
    bool form_known = true;    // false for a value list or expression
    std::size_t value = 0;     // the field of the value
    std::string param;         // "value", "dc", "ac", ...
    std::optional<Unit> unit;  // nullopt: why says why
    std::string why;
};
AlterTarget alter_target(const Card& c);
// The variable a word names when it is exactly `$var` or `${var}` (lower case), or "".
std::string variable_named(std::string_view word);
// Each foreach loop of the block (its commands as cards) whose variable serves only as the
// value of `alter` commands of one unit, and in `echo`: that unit, by variable.
std::map<std::string, Unit> foreach_units(const std::vector<Card>& commands);
void scale_altermod(ScalePass& p, const Card& c);
void scale_stop(ScalePass& p, const Card& c);
void scale_plot(ScalePass& p, const Card& c, const BlockState& st, std::size_t first);

}  // namespace deckscale
