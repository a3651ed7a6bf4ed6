// Names that common formulas use but ngspice 39's parameter evaluator does not know. A deck
// that writes `{1/(2*pi*fc*r)}` in a .param or an element value stops ngspice 39 with
// "Undefined parameter [pi]" (tried with `ngspice -b`; the shared deck-syntax notes list it
// from the same trial), unless the deck defines `pi` itself. Run-time expressions (B sources,
// E/G VALUE) know pi and are not checked.
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "scale/pass.hpp"

namespace deckscale {

// The first such name used in `expr` (lower case), or nothing.
std::optional<std::string> unknown_numparam_name(std::string_view expr);

// The diagnostic text for it.
std::string unknown_numparam_name_message(const std::string& name);

// The first number in `expr` that ngspice 39's parameter evaluator (numparam, reading numbers
// with sscanf's %lG and one suffix) stops on: a digit after the letters that follow a number,
// as in RKM values ("1k5", "2n2") or a Fortran exponent ("1d3"). Tried: '.param x=1k5',
// '{1d3}' and "'2n2*2'" each stop ngspice 39 with "Formula() error", after which the library
// cannot recover (shared notes "deck-syntax.md" §2). Hexadecimal ("0x10") reads as a number.
std::optional<std::string> fatal_numparam_number(std::string_view expr);
std::string fatal_numparam_number_message(const std::string& number);

// Refuses the card (ScalePass::fail) when a {...}, '...' or plain .param value token of it
// uses such a name that the deck does not define as a parameter, or such a number.
void check_numparam_names(ScalePass& p, const Token& value);

}  // namespace deckscale
