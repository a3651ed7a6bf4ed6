// The lexemes of a .control expression (scale/control_expression.hpp): numbers as ngspice's
// front end reads them (digits, '.', a suffix and unit letters, an exponent's sign), names
// ($var, $&vec, @dev[param], x#branch), signs and brackets; spans into the file.
#pragma once

#include <cstddef>
#include <cstdint>
#include <initializer_list>
#include <string_view>

namespace deckscale {

struct Lexeme {
    enum Kind { number, name, op, open, close, lbrack, rbrack, comma, end, bad } kind = end;
    std::string_view text;
    std::uint32_t begin = 0;  // file offset
};

class ExpressionLexer {
public:
    // `text` starts at file offset `base`.
    ExpressionLexer(std::string_view text, std::uint32_t base) : text_(text), base_(base) {
        next();
    }
    const Lexeme& current() const { return cur_; }
    void next();
    // The current lexeme is one of these operators or word operators (any case).
    bool at_op(std::initializer_list<std::string_view> ops) const;

private:
    std::string_view text_;
    std::uint32_t base_;
    std::size_t pos_ = 0;
    Lexeme cur_;
};

}  // namespace deckscale
