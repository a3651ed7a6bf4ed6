// Internal to the scaling pass: the state shared by its card handlers (scale/rescale.cpp,
// scale/elements.cpp, scale/sources.cpp, scale/dot_cards.cpp).
#pragma once

#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "deck/spice_number.hpp"
#include "scale/rescale.hpp"

namespace deckscale {

// One value-bearing item of a card: positional (key == nullptr) or key=value.
struct Atom {
    const Token* key = nullptr;
    const Token* value = nullptr;  // nullptr for "key=" with nothing after it
    std::size_t field = 0;         // index of the first field of the atom in Card::fields
};

// Atoms from fields[first...]; '(', ')' and ',' separate like blanks, as in ngspice.
void atoms_of(const Card& card, std::size_t first, std::vector<Atom>& out);

class ScalePass {
public:
    ScalePass(const ScaleSettings& settings, ScaleResult& result);
    // Scales every card of a fully read deck.
    void run(const Deck& deck);
    // Scales one card while the deck is still being read (see DeckObserver). Symbols the
    // deck declares later are not known yet: every lookup that found nothing is remembered.
    void observe(const Deck& so_far, std::size_t file, const Card& card);
    // True when a lookup made while observing would answer differently with the final
    // symbols (a name declared after its use, a later .options gmin): scale again then.
    bool relied_on_missing(const DeckSymbols& final_symbols) const;
    // For a pass that observed a piece of a file read on its own (see PieceReading): false if
    // one of its lookups would have found something among the symbols declared before the
    // piece. Otherwise takes the piece's results and remembered lookups over and returns true.
    bool take_piece(ScalePass& piece, ScaleResult& piece_result, const DeckSymbols& before);
    // Edits of one file are reserved for this many bytes of it (default: the whole file).
    void expect_bytes(std::size_t bytes) { expected_bytes_ = bytes; }

    // ---- used by the card handlers ----
    const Card& card() const { return *card_; }
    // atoms_of(card(), first) in a buffer reused from card to card (valid until the next call).
    const std::vector<Atom>& atoms(std::size_t first);
    // What the deck declares (lower-case names).
    bool is_param(const std::string& name) const;
    const std::string* model_type(const std::string& name) const;  // nullptr if no such model
    bool is_inductor(const std::string& name) const;
    double gmin() const;
    bool option_given(const std::string& key) const;  // a .options card sets it
    ScaleFactors factors() const { return settings_.factors; }
    int digits() const { return settings_.digits; }

    // Scales one value token by the unit's factor; validates numbers either way.
    void scale_value(const Token& t, Unit unit, std::string_view field);
    // Scales a value by an explicit factor.
    void scale_by(const Token& t, double factor, std::string_view field, std::string_view unit);
    // A behavioural expression spanning [begin, end) of the card: substitute variables and
    // multiply by out_factor. `delimited` is true for {..} / '..' tokens (kept as such).
    void scale_expression(std::uint32_t begin, std::uint32_t end, double out_factor,
                          std::string_view field, std::string_view unit);
    // Inserts text at an offset of the current file.
    void insert(std::uint32_t offset, std::string text, std::string_view field, double factor);
    // Records an item that cannot be scaled exactly.
    void unscalable(const Token& at, std::string why);
    void note(const Token& at, std::string what);
    // Throws DeckError at a token.
    [[noreturn]] void fail(const Token& at, std::string why) const;

    // True when a token can carry a value (number, {expr}, 'expr', parameter name).
    bool is_value_token(const Token& t) const;
    bool is_number(const Token& t) const;
    const NumberParse& number_of(const Token& t) const;
    std::string text(const Token& t) const { return std::string(card_->text(t)); }

private:
    void visit(const Card& card);
    void edit(std::uint32_t offset, std::uint32_t length, std::string text, std::string_view field,
              std::string_view unit, double factor);

    ScaleSettings settings_;
    ScaleResult& result_;
    const DeckSymbols* symbols_ = nullptr;
    // Lookups that found nothing, and the gmin that was used (for relied_on_missing).
    mutable std::set<std::string> missed_params_, missed_models_, missed_inductors_,
        missed_options_;
    mutable std::optional<double> gmin_used_;
    bool observing_ = false;  // inside observe(): the deck is not complete yet
    bool rescan_ = false;     // a decision was left to a scan of the complete deck
    std::size_t file_ = 0;
    std::size_t expected_bytes_ = 0;
    const Card* card_ = nullptr;
    bool card_marked_ = false;
    std::vector<Atom> atoms_;
    mutable NumberParse cached_parse_;
    mutable std::uint32_t cached_begin_ = ~0u;
    mutable std::size_t cached_file_ = ~std::size_t{0};
    mutable const Card* cached_card_ = nullptr;
};

// Card handlers, one per family.
void scale_passive(ScalePass& p, char letter);      // R C L K
void scale_source(ScalePass& p, char letter);       // V I
void scale_controlled(ScalePass& p, char letter);   // E F G H B
void scale_line_or_switch(ScalePass& p, char letter);  // T O U S W
void scale_dot_card(ScalePass& p, const std::string& keyword);
void scale_model(ScalePass& p);
void scale_control_block(ScalePass& p);

}  // namespace deckscale
