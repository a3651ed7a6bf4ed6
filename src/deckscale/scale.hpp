// The library's public surface, part 2: scaling a deck and writing the result.
//
// scale() returns the new text of every file a run writes, byte for byte what
// `deckscale scale` writes for the same deck, factors and options; it writes nothing.
// write() puts those files in place, atomically and all or none, never over a file the deck
// was read from.
#pragma once

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "deckscale/deck.hpp"
#include "deckscale/diagnostic.hpp"

namespace deckscale::api {

struct ScaleOptions {
    double km = 1, kf = 1;          // finite and positive (parse_factor reads "2*pi*10meg")
    int digits = 9;                 // significant digits of rewritten values, 3 ... 17
    bool leave_unscalable = false;  // write anyway, each such item left as it was and marked
    bool flatten = false;           // one self-contained deck, includes inlined
    // Where the main deck is meant to go: changed included files get copies beside it and the
    // include lines are repointed (as with -o). Empty: as for standard output, where an
    // include that needs rescaling is an error.
    std::string output;
    unsigned threads = 0;  // scale_file: large decks read on at most this many (0: cores)
};

// One rewritten value.
struct ValueChange {
    std::string file;
    std::uint32_t line = 0, column = 0;
    std::string element;  // "R1", ".tran", ".model dmod"
    std::string field;    // "value", "ac", "pulse #3", ...
    std::string unit;     // "Ohm", "F", ...
    std::string old_text, new_text;
    double factor = 1;
};

// One file of the output.
struct OutputText {
    std::string path;    // where it goes ("" for the main deck without ScaleOptions::output)
    std::string source;  // the file of the deck it was made from
    std::string text;
};

struct Scaled {
    ScaleOptions options;
    // Included copies first, the main deck last. Empty when refused.
    std::vector<OutputText> files;
    std::vector<ValueChange> changes;
    std::vector<Diagnostic> refusals;  // items that cannot be scaled exactly
    std::vector<Diagnostic> notes;     // things to know (wrapped expressions, ...)
    std::vector<Diagnostic> warnings;  // the deck's own
    std::string changes_text;          // as `--changes` lists them
    std::string changes_json;          // as `--changes-json` writes them
    // For whoever builds from the output: ratings, current growth, rescaled semiconductors
    // (lines starting "deckscale: caution:", as `scale` prints them; "" for factors of one).
    std::string cautions;
    std::optional<Deck> original;      // the deck it was made from

    bool refused() const { return files.empty() && !refusals.empty(); }
    const std::string& text() const { return files.back().text; }  // the main deck
};

// Scales a deck read before.
Scaled scale(const Deck& deck, const ScaleOptions& options);

// Reads and scales `path` in one pass (large files in pieces on several threads); the same
// result as scale(read_deck(path), options).
Scaled scale_file(const std::string& path, const ScaleOptions& options);

// The output as a deck in memory (named by its output path, or "<stem>-scaled<ext>" beside
// the original when there is none), for verify() before anything is written. Throws
// DeckError when refused.
Deck scaled_deck(const Scaled& scaled);

// Writes every output file atomically: all are written whole before any replaces what was
// there. Throws DeckError when the run was refused, has no output path, a target is one of
// the files the deck was read from, or a file cannot be written.
void write(const Scaled& scaled);

}  // namespace deckscale::api
