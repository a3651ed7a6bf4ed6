// The reader's work on one card that needs no other card: the names a card declares and
// the checks of its shape. Shared by whole-file reading and reading in pieces (deck/load.cpp).
#pragma once

#include <string>
#include <vector>

#include "deck/card.hpp"
#include "deck/load.hpp"

namespace deckscale {

// Adds the names the card declares to `s` (.param, .subckt and X-line keys, .func, .model,
// inductors, coupled inductors, .options gmin).
void gather_symbols(const Card& c, DeckSymbols& s);

// Refuses a card with too few fields for its type, or one that starts with no letter
// (DeckError); an unknown element type or dot card adds a warning. `kw` is card_keyword() of
// a dot card, empty otherwise. In a .lib section (`in_section`), which ngspice reads only when
// a deck selects it, a card starting with no letter is a warning too.
void check_card(const Card& c, const std::string& kw, std::vector<Diagnostic>& warnings,
                bool in_section = false);

// Fields after the first, not counting '=', '(', ')' and ','.
int value_fields(const Card& c);

}  // namespace deckscale
