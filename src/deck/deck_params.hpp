// The deck-wide parameters of a deck and the values of words that may use them: what a card
// outside any subcircuit (an element value, an analysis card) means by `{fc/10}` or `rbase`.
#pragma once

#include <optional>
#include <set>
#include <string>
#include <string_view>

#include "deck/load.hpp"
#include "deck/param_eval.hpp"

namespace deckscale {

// Top-level `.param name=value` definitions of every file (those inside a .subckt are the
// subcircuit's own and are left out).
ParamTable top_level_params(const Deck& deck);

// A literal number, a `{…}`/`'…'` expression or a bare parameter name, evaluated with
// `params`. Names in `local` (parameters that vary per subcircuit instance) give no value.
std::optional<double> value_with_params(std::string_view text, const ParamTable& params,
                                        const std::set<std::string>& local = {});

// A word of an analysis card: a number, or a `{…}`/`'…'` expression evaluated with `params`
// (none: numbers only). A bare name is no value: ngspice 39 reads it as 0 in a dot card.
// `text` (if given) is what verify writes for it: the word itself for a number, the value in
// full precision for an expression (ngspice then reads the double the deck meant).
std::optional<double> analysis_value(std::string_view word, const ParamTable* params,
                                     std::string* text = nullptr);

}  // namespace deckscale
