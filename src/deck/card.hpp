// Tokens and cards: spans into a SourceFile. Every byte of a file belongs to exactly one
// token, and every token to exactly one card, so the cards of a file rebuild it exactly.
#pragma once

#include <cstdint>
#include <span>
#include <string>
#include <string_view>

#include "deck/source_file.hpp"

namespace deckscale {

enum class TokenKind : std::uint8_t {
    // trivia
    bom,
    whitespace,
    line_end,
    comment,       // full-line or end-of-line comment, from its marker to the line end
    continuation,  // the '+' of a continuation line, or a trailing '\\'
    title,
    control,    // a whole .control ... .endc block
    after_end,  // everything after the .end card
    // fields
    word,
    brace,    // {expr}
    squote,   // 'expr'
    dquote,   // "string"
    equals,
    lparen,
    rparen,
    comma,
};

inline bool is_field(TokenKind k) { return k >= TokenKind::word; }

struct Token {
    TokenKind kind;
    std::uint32_t begin;
    std::uint32_t end;
    std::uint32_t size() const { return end - begin; }
};

enum class CardKind : std::uint8_t {
    title,
    blank,
    comment,
    element,  // first field does not start with '.'
    dot,      // first field starts with '.'
    control,  // .control ... .endc
    after_end,
};

// A view of one card, valid only while the reader's visitor runs.
struct Card {
    CardKind kind;
    const SourceFile* file;
    std::span<const Token> tokens;  // every token, trivia included
    std::span<const Token> fields;  // the field tokens only, in order

    std::uint32_t begin() const { return tokens.empty() ? 0 : tokens.front().begin; }
    std::uint32_t end() const { return tokens.empty() ? 0 : tokens.back().end; }
    std::string_view text(const Token& t) const { return file->view(t.begin, t.end); }
    std::string_view field_text(std::size_t i) const { return text(fields[i]); }
};

}  // namespace deckscale
