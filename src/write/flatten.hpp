// One self-contained deck text: every .include/.lib card replaced by the contents of the
// file (or library section) it names, with each file's edits applied.
#pragma once

#include <string>
#include <vector>

#include "deck/load.hpp"
#include "write/edit.hpp"

namespace deckscale {

// `edits` has one entry per Deck::files entry.
std::string flatten_deck(const Deck& deck, const std::vector<EditSet>& edits);

}  // namespace deckscale
