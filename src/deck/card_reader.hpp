// The lossless card reader: runs the PEGTL deck grammar over one file and hands every
// card, in order, to a visitor. Throws DeckError (with file:line:col) on input the grammar
// refuses: unbalanced braces or quotes, an unterminated .control block, an orphan '+'.
#pragma once

#include <cstdint>
#include <functional>

#include "deck/card.hpp"

namespace deckscale {

enum class FileRole {
    deck,     // first line is the title
    include,  // an included or library file: no title line
};

using CardVisitor = std::function<void(const Card&)>;

void read_cards(const SourceFile& file, FileRole role, const CardVisitor& visit);

// A top-level deck read by the grammar without its fast path for plain element lines
// (tests compare both readers token by token).
void read_cards_reference(const SourceFile& file, const CardVisitor& visit);

// Reading part of a file, for reading a large file in pieces at once. `from` is 0 or a
// card boundary (where an earlier read stopped). The read stops before the first card that
// begins at or after `stop_at`, or before a card whose visitor throws StopReading.
struct ReadSpan {
    std::uint32_t from = 0;
    std::uint32_t stop_at = UINT32_MAX;
};
struct StopReading {};

// Returns where the read stopped: the first byte of the card it did not visit, or the file
// size. Reading from `from` gives exactly the cards a whole-file read gives from there.
std::uint32_t read_cards(const SourceFile& file, FileRole role, const CardVisitor& visit,
                         ReadSpan span);

}  // namespace deckscale
