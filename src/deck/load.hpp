// A deck: the top file and every file it includes (.include / .inc / .lib), each read once,
// with the include graph, checked for the structural errors a reader can see.
#pragma once

#include <cstdint>
#include <functional>
#include <map>
#include <memory>
#include <set>
#include <string>
#include <vector>

#include "base/file_system.hpp"
#include "deck/card.hpp"
#include "deck/card_reader.hpp"
#include "deck/diagnostic.hpp"

namespace deckscale {

struct DeckFile {
    std::unique_ptr<SourceFile> source;
    FileRole role = FileRole::deck;
};

struct IncludeRef {
    std::size_t from_file = 0;     // index into Deck::files of the including file
    Token path_token{};            // the file-name field in the including file
    std::size_t target_file = 0;   // index of the included file
    std::string section;           // .lib section name, empty for .include
};

// Names the deck declares, gathered while it is read (lower-case).
struct DeckSymbols {
    std::set<std::string> params;               // .param, .subckt/X parameters, .func names
    std::map<std::string, std::string> models;  // model name -> type
    std::set<std::string> inductors;            // inductor element names
    std::set<std::string> coupled_inductors;    // inductors named by a K card
    double gmin = 1e-12;                        // .options gmin, else ngspice's default
    bool gmin_set = false;                      // a .options card set gmin
    double reltol = 1e-3;                       // .options reltol, else ngspice's default
    bool reltol_set = false;
};

struct Deck {
    std::vector<DeckFile> files;  // [0] is the top deck
    DeckSymbols symbols;
    std::vector<IncludeRef> includes;
    std::vector<Diagnostic> warnings;  // well-formed constructs the tool does not know
    std::size_t pieces_taken = 0;      // pieces read on helper threads and kept (PieceReading)

    const SourceFile& top() const { return *files.front().source; }

    // Visits every card of one file.
    void visit_file(std::size_t file, const CardVisitor& visit) const;
    // The include whose path token starts at `offset` in `file`, or nullptr.
    const IncludeRef* include_at(std::size_t file, std::uint32_t offset) const;
};

// Called for every card once the reader has checked it, with the deck as read so far (its
// files and the symbols declared up to that card).
using DeckObserver = std::function<void(const Deck& so_far, std::size_t file, const Card& card)>;

// Reading a large file in pieces on several threads. A piece starts at a card boundary
// further into the file; a helper thread reads it with an observer of its own, which sees
// only the symbols declared inside the piece. Once everything before a piece has been read,
// `join` is called (in file order, on the calling thread) with the symbols declared before
// it: it returns false when the piece's observer would have answered differently in a
// whole-file read, and the piece is then read again with the main observer; otherwise it
// takes the piece's results over. A piece also ends early before an include or a .ends of
// a .subckt opened before it; the rest is read with the main observer. The deck and the
// main observer's calls are exactly those of a whole-file read.
class PieceObserver {
public:
    virtual ~PieceObserver() = default;
    virtual void observe(const Deck& piece, std::size_t file, const Card& card) = 0;
};

struct PieceReading {
    unsigned threads = 0;                   // files read in at most this many pieces; 0 = cores
    std::size_t min_piece_bytes = 4 << 20;  // no piece smaller than this
    std::function<std::unique_ptr<PieceObserver>(std::size_t piece_bytes)> start;
    std::function<bool(PieceObserver& piece, const DeckSymbols& before)> join;
};

// Reads the deck at `path` and everything it includes. Throws DeckError for bad input:
// an empty file, NUL bytes, grammar errors, a missing or cyclic include, an unterminated
// .subckt, a card with too few fields.
Deck load_deck(const std::string& path, const FileSystem& fs, const DeckObserver& observer = nullptr);
// The same, reading large files in pieces when `pieces.start` is set.
Deck load_deck(const std::string& path, const FileSystem& fs, const DeckObserver& observer,
               const PieceReading& pieces);

// The lower-cased name of a card's first field ("r1", ".subckt"); empty if none. The aliases
// ngspice reads as others are given as those: ".macro" is ".subckt", ".eom" is ".ends".
std::string card_keyword(const Card& card);

}  // namespace deckscale
