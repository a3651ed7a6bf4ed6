// Internal to the scaling pass: the state shared by its card handlers (scaler.cpp,
// scale_elements.cpp, scale_sources.cpp, scale_dot_cards.cpp).
#pragma once

#include <map>
#include <set>
#include <string>
#include <vector>

#include "scaler.hpp"
#include "spice_number.hpp"

namespace deckscale {

// One value-bearing item of a card: positional (key == nullptr) or key=value.
struct Atom {
    const Token* key = nullptr;
    const Token* value = nullptr;  // nullptr for "key=" with nothing after it
    std::size_t field = 0;         // index of the first field of the atom in Card::fields
};

// Atoms from fields[first...]; '(', ')' and ',' separate like blanks, as in ngspice.
std::vector<Atom> atoms_of(const Card& card, std::size_t first);
void atoms_of(const Card& card, std::size_t first, std::vector<Atom>& out);

// What the pass knows about the whole deck before it edits anything: what the reader
// gathered while loading it.
using DeckFacts = DeckSymbols;

class ScalePass {
public:
    ScalePass(const Deck& deck, const ScaleSettings& settings, ScaleResult& result);
    void run();

    // ---- used by the card handlers ----
    const Card& card() const { return *card_; }
    // atoms_of(card(), first) in a buffer reused from card to card (valid until the next call).
    const std::vector<Atom>& atoms(std::size_t first);
    const DeckFacts& facts() const { return facts_; }
    ScaleFactors factors() const { return settings_.factors; }

    // Scales one value token by the unit's factor; validates numbers either way.
    void scale_value(const Token& t, Unit unit, std::string_view field);
    // Scales a value by an explicit factor.
    void scale_by(const Token& t, double factor, std::string_view field, std::string_view unit);
    // A behavioural expression spanning [begin, end) of the card: substitute variables and
    // multiply by out_factor. `delimited` is true for {..} / '..' tokens (kept as such).
    void scale_expression(std::uint32_t begin, std::uint32_t end, double out_factor,
                          std::string_view field);
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

    const Deck& deck_;
    ScaleSettings settings_;
    ScaleResult& result_;
    const DeckFacts& facts_;
    std::size_t file_ = 0;
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
