// Internal to the library surface (not installed): what a Deck holds, and the file system
// that serves decks given as text, and outputs not yet written, from memory and everything
// else from disk.
#pragma once

#include <map>
#include <string>

#include "base/file_system.hpp"
#include "deck/diagnostic.hpp"
#include "deck/load.hpp"
#include "deckscale/deck.hpp"
#include "deckscale/scale.hpp"
#include "deckscale/verify.hpp"
#include "verify/pair.hpp"
#include "write/plan.hpp"

namespace deckscale::api {

// Files held in memory, by absolute, lexically normal path (memory_key).
using MemoryFiles = std::map<std::string, std::string>;

std::string memory_key(const std::string& path);

class OverlayFileSystem : public FileSystem {
  public:
    explicit OverlayFileSystem(MemoryFiles memory) : memory_(std::move(memory)) {}
    std::optional<FileText> read(const std::string& path,
                                 std::string* problem = nullptr) const override;
    std::string identity(const std::string& path) const override;

  private:
    MemoryFiles memory_;
    DiskFileSystem disk_;
};

struct Deck::Impl {
    MemoryFiles memory;  // the files of this deck that are not (or not yet) on disk
    deckscale::Deck deck;
};

// Reads a deck at `path`, the files in `memory` taking precedence over the disk.
Deck load_with(const std::string& path, MemoryFiles memory);

// The text of every file of a plan (included copies first, the main deck last), byte for
// byte what the command line writes for it.
std::vector<OutputText> output_texts(const deckscale::Deck& deck, const OutputPlan& plan);

// A pair's verification as the public surface reports it.
Verification verification_of(const PairVerification& v);

// A DeckError that is about the request, not about a place in a file.
DeckError request_error(std::string message);

}  // namespace deckscale::api
