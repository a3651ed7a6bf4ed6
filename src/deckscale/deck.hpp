// The library's public surface, part 1: reading a deck, from a file or from text.
//
// Everything under <deckscale/...> is installed and stable; the stage folders behind it are
// not. Functions here never print, exit or terminate: bad input throws DeckError (file, line,
// column and the rendered text with the source line). A deck's files are read once and never
// modified.
#pragma once

#include <cstddef>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "deckscale/diagnostic.hpp"

namespace deckscale::api {

// A deck as read: the top file and every file it includes.
class Deck {
  public:
    struct Impl;  // opaque
    explicit Deck(std::shared_ptr<const Impl> impl) : impl_(std::move(impl)) {}

    const std::string& path() const;                    // the top file, as given
    std::vector<std::string> files() const;             // every file read, top first
    std::string_view text(std::size_t file = 0) const;  // a file's bytes, untouched
    const std::vector<Diagnostic>& warnings() const;    // constructs the tool does not know
    const Impl& impl() const { return *impl_; }

  private:
    std::shared_ptr<const Impl> impl_;
};

// Reads `path` and everything it includes.
Deck read_deck(const std::string& path);

// Reads `text` as the file `name`: relative includes are looked up in name's folder (on disk),
// messages name it, and a simulation of the deck runs there.
Deck read_text(std::string text, const std::string& name = "deck.cir");

// A factor as the command line takes it: a SPICE number ("50", "1k", "2.2MEG"), "pi", or a
// product or quotient of them ("2*pi*10meg", "1/50"). Throws DeckError unless it is finite
// and positive.
double parse_factor(const std::string& text);

// The library's version ("0.1.0").
const char* version();

}  // namespace deckscale::api
