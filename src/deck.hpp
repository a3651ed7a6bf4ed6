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

#include "card.hpp"
#include "card_reader.hpp"
#include "diagnostic.hpp"
#include "file_system.hpp"

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
};

struct Deck {
    std::vector<DeckFile> files;  // [0] is the top deck
    DeckSymbols symbols;
    std::vector<IncludeRef> includes;
    std::vector<Diagnostic> warnings;  // well-formed constructs the tool does not know

    const SourceFile& top() const { return *files.front().source; }

    // Visits every card of one file.
    void visit_file(std::size_t file, const CardVisitor& visit) const;
    // The include whose path token starts at `offset` in `file`, or nullptr.
    const IncludeRef* include_at(std::size_t file, std::uint32_t offset) const;
};

// Called for every card once the reader has checked it, with the deck as read so far (its
// files and the symbols declared up to that card).
using DeckObserver = std::function<void(const Deck& so_far, std::size_t file, const Card& card)>;

// Reads the deck at `path` and everything it includes. Throws DeckError for bad input:
// an empty file, NUL bytes, grammar errors, a missing or cyclic include, an unterminated
// .subckt, a card with too few fields.
Deck load_deck(const std::string& path, const FileSystem& fs, const DeckObserver& observer = nullptr);

// The lower-cased name of a card's first field ("r1", ".subckt"); empty if none.
std::string card_keyword(const Card& card);

}  // namespace deckscale
