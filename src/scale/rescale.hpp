// The scaling pass: reads a deck and the rule table, produces edits for every file of the
// deck, a change list, and the items it cannot scale exactly. It never writes anything.
#pragma once

#include <string>
#include <vector>

#include "deck/diagnostic.hpp"
#include "deck/load.hpp"
#include "scale/held_part.hpp"
#include "scale/param_plan.hpp"
#include "scale/units.hpp"
#include "write/data_files.hpp"
#include "write/edit.hpp"

namespace deckscale {

struct ScaleSettings {
    ScaleFactors factors;
    int digits = 9;                 // significant digits of rewritten numbers
    bool mark_unscalable = false;   // insert a comment line before each unscalable card
    bool record_changes = true;     // fill ScaleResult::changes (the edits are made either way)
    bool brace_bare_params = false; // write a bare parameter value "p" as "{p}" even when k = 1
    // Rewrite the KF of models with flicker noise so that it follows the scaling like
    // thermal noise (scale/flicker.hpp); otherwise KF is left and the noise line says so.
    bool follow_flicker = false;
    // load_and_scale reads a large file in pieces, this many at once (0 = one per core), none
    // smaller than min_piece_bytes; the result is the same whatever the pieces.
    unsigned threads = 0;
    std::size_t min_piece_bytes = 4 << 20;
    // Parts kept as written (scale/hold_items.hpp: NAME, model:NAME, subckt:NAME, with * and
    // ?). The deck is then read whole before it is scaled, and a comment line after the
    // title records the items and factors for verify.
    std::vector<std::string> hold;
};

struct Change {
    std::size_t file = 0;
    std::uint32_t offset = 0;  // of the old text in its file
    std::string element;       // card name as written: "R1", ".tran", ".model dmod"
    std::string field;         // "value", "ac", "pulse #3", "gmin", ...
    std::string unit;          // "Ohm", "F", ...
    std::string old_text;
    std::string new_text;
    double factor = 1;
};

struct ScaleResult {
    std::vector<EditSet> edits;           // one per Deck::files entry
    std::vector<Change> changes;          // in file order (when recorded)
    std::size_t change_count = 0;         // rewritten values, recorded or not
    std::vector<Diagnostic> unscalable;   // items that cannot be scaled exactly
    std::vector<Diagnostic> notes;        // things the user should know (wrapped expressions...)
    std::vector<HeldPart> held;           // parts kept as written, and why (ScaleSettings::hold)
    std::vector<ParamDecision> params;    // how each .param / params: parameter was scaled
    bool semiconductors_scaled = false;   // a D, Q, J, Z or M device was rewritten
    std::vector<DataFileCopy> data_files;  // rewritten data files the output deck names
};

// Throws DeckError for bad input (malformed numbers and the like).
ScaleResult scale_deck(const Deck& deck, const ScaleSettings& settings);

struct ScaledDeck {
    Deck deck;
    ScaleResult result;
};

// Reads the deck at `path` and scales it in the same reading pass (the same result as
// load_deck followed by scale_deck). Throws DeckError for bad input.
ScaledDeck load_and_scale(const std::string& path, const FileSystem& fs,
                          const ScaleSettings& settings);

}  // namespace deckscale
