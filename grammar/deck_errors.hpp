// The error-message table of the deck grammar. A rule listed here raises a parse error
// whenever it fails (PEGTL must_if), so only rules that are used after a commitment
// (inside must<> or raise<>) may have a message.
#pragma once

#include "grammar/deck_grammar.hpp"

namespace deckscale::grammar {

template <typename>
inline constexpr const char* error_message = nullptr;

template <>
inline constexpr auto error_message<brace_close> =
    "unbalanced '{': the card ends before the matching '}'";
template <>
inline constexpr auto error_message<squote_close> =
    "unterminated quoted expression: no closing \"'\" before the end of the card";
template <>
inline constexpr auto error_message<dquote_close> =
    "unterminated string: no closing '\"' on this line";
template <>
inline constexpr auto error_message<control_unterminated> =
    "unterminated .control block: no .endc before the end of the file";
template <>
inline constexpr auto error_message<orphan_plus_error> =
    "continuation line '+' has no card before it to continue";

struct error_table {
    template <typename Rule>
    static constexpr const char* message = error_message<Rule>;
};

template <typename Rule>
using error_control = tao::pegtl::must_if<error_table, tao::pegtl::normal, false>::control<Rule>;

}  // namespace deckscale::grammar
