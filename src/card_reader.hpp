// The lossless card reader: runs the PEGTL deck grammar over one file and hands every
// card, in order, to a visitor. Throws DeckError (with file:line:col) on input the grammar
// refuses: unbalanced braces or quotes, an unterminated .control block, an orphan '+'.
#pragma once

#include <functional>

#include "card.hpp"

namespace deckscale {

enum class FileRole {
    deck,     // first line is the title
    include,  // an included or library file: no title line
};

using CardVisitor = std::function<void(const Card&)>;

void read_cards(const SourceFile& file, FileRole role, const CardVisitor& visit);

}  // namespace deckscale
