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

// Refuses the card (ScalePass::fail) when a {...}, '...' or plain value token of it uses such
// a name that the deck does not define as a parameter.
void check_numparam_names(ScalePass& p, const Token& value);

}  // namespace deckscale
