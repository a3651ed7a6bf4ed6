// Where an R, C or L element card has its two nodes and its value, as ngspice 39 reads the
// line: fields are separated by blanks, ',', '=', '(' and ')' (ngspice 39 manual §2.1.4.1;
// shared deck-syntax notes §1, tried: `R12 (n0 0) 12k` and `R13 n0,0,13k` work), and the value
// is the third positional field or a value key (`r=`, `resistance=`, `c=`, `capacitance=`,
// `l=`, `inductance=`; ngspice 39 manual §3.3.1, §3.3.6, §3.3.10); on an R line a later bare
// number overrides the value (`R1 a b 1,5` is 5 Ohm). Used by the commands that
// read part values (verify's factor inference, snap, yield, stress).
#pragma once

#include <cstddef>
#include <optional>

#include "deck/card.hpp"

namespace deckscale {

struct RclFields {
    char letter = 'r';                 // 'r', 'c' or 'l'
    std::size_t node_a = 0, node_b = 0;  // field indices
    // The value token (a word, `{expr}` or `'expr'`); none when the card has no value field.
    std::optional<std::size_t> value;
    bool keyed = false;  // the value follows a value key
    // The positional field after a positional value: the value when the third field is a
    // model name (`C1 a b cmod 1n`).
    std::optional<std::size_t> after_value;
};

// nullopt: the card is no R, C or L element, or has fewer than two nodes.
std::optional<RclFields> rcl_fields(const Card& card);

}  // namespace deckscale
