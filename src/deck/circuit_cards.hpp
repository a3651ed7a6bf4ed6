// The element cards that are part of a deck's circuit, in every file it reads: all of the deck
// itself, all of a file it includes with `.include`, and of a library file only the sections
// `.lib FILE NAME` selects (ngspice 39 manual §2.7, §2.8). For the commands that act on parts
// (yield, stress), which must neither miss a part of an included file nor take one from a
// library section the deck does not use.
#pragma once

#include <cstddef>
#include <functional>

#include "deck/load.hpp"

namespace deckscale {

// `in_subckt`: the card is inside a .subckt, or its file is included inside one (a file
// included both inside and outside counts as inside).
using CircuitCardVisitor =
    std::function<void(std::size_t file, const Card& card, bool in_subckt)>;

void visit_circuit_elements(const Deck& deck, const CircuitCardVisitor& visit);

}  // namespace deckscale
