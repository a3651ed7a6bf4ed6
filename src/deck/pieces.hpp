// Reading one large file in pieces on helper threads (see PieceReading in deck/load.hpp): where
// pieces start, and what a helper thread does with one.
#pragma once

#include <atomic>
#include <cstdint>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "deck/card_reader.hpp"
#include "deck/load.hpp"

namespace deckscale {

// A .subckt card not yet closed by its .ends.
struct OpenSubckt {
    std::uint32_t offset, length;
    std::string name;
};

// The record of a .subckt card (its first field, and its name when it has one).
inline OpenSubckt open_subckt(const Card& c) {
    return {c.fields[0].begin, c.fields[0].size(),
            c.fields.size() > 1 ? std::string(c.field_text(1)) : ""};
}

struct Piece {
    std::uint32_t from = 0;                 // a line start where a card is expected
    std::uint32_t stop_at = UINT32_MAX;     // where the next piece starts
    std::uint32_t stopped = 0;              // where its read stopped (see read_cards)
    bool usable = false;                    // read to `stopped` without an error
    Deck local;                             // symbols and warnings of the piece only
    std::vector<OpenSubckt> opened;         // .subckt cards it left open
    std::unique_ptr<PieceObserver> observer;
};

// Up to `pieces - 1` offsets that split `text` into about equal parts, each at the start of
// a line that starts with a letter, after blanks if indented (a card, not a continuation,
// comment or blank line).
std::vector<std::uint32_t> piece_starts(std::string_view text, unsigned pieces);

// Reads one piece; run on a helper thread. Stops early before an include (.include, .inc,
// .lib) or a .ends of a .subckt opened before the piece, or when `cancel` is set. Any error
// leaves the piece unusable: the main thread reads it again and reports the error in order.
void read_piece(Piece& piece, const SourceFile& file, std::size_t index, FileRole role,
                const std::atomic<bool>& cancel);

// Adds the symbols a later piece declared to those declared before it.
void add_symbols(DeckSymbols& to, DeckSymbols&& later);

}  // namespace deckscale
