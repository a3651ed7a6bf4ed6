#include "scale/expression_lexer.hpp"

#include <cctype>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

bool name_start(char c) {
    return std::isalpha(static_cast<unsigned char>(c)) || c == '_' || c == '$' || c == '@';
}

bool name_char(char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '#' || c == '.';
}

}  // namespace

void ExpressionLexer::next() {
    while (pos_ < text_.size() && std::isspace(static_cast<unsigned char>(text_[pos_])))
        ++pos_;
    cur_ = Lexeme{};
    cur_.begin = base_ + static_cast<std::uint32_t>(pos_);
    if (pos_ >= text_.size()) return;
    std::size_t start = pos_;
    char c = text_[pos_];
    auto digit = [&](std::size_t i) {
        return i < text_.size() && std::isdigit(static_cast<unsigned char>(text_[i]));
    };
    if (digit(pos_) || (c == '.' && digit(pos_ + 1))) {
        // Digits, '.', letters (a suffix and unit tail) and an exponent's sign.
        while (pos_ < text_.size()) {
            char ch = ascii_lower(text_[pos_]);
            bool sign = (ch == '+' || ch == '-') && pos_ >= start + 2 &&
                        ascii_lower(text_[pos_ - 1]) == 'e' && digit(pos_ - 2);
            if (!(sign || ch == '.' || ch == '_' || std::isalnum(static_cast<unsigned char>(ch))))
                break;
            ++pos_;
        }
        cur_.kind = Lexeme::number;
    } else if (name_start(c)) {
        ++pos_;
        if (c == '$' && pos_ < text_.size() && text_[pos_] == '&') ++pos_;  // $&vector
        while (pos_ < text_.size() && name_char(text_[pos_])) ++pos_;
        // @dev[param] and {$var} are one name.
        if (c == '@' && pos_ < text_.size() && text_[pos_] == '[') {
            std::size_t close = text_.find(']', pos_);
            pos_ = close == std::string_view::npos ? text_.size() : close + 1;
        }
        cur_.kind = Lexeme::name;
    } else {
        ++pos_;
        switch (c) {
            case '(': cur_.kind = Lexeme::open; break;
            case ')': cur_.kind = Lexeme::close; break;
            case '[': cur_.kind = Lexeme::lbrack; break;
            case ']': cur_.kind = Lexeme::rbrack; break;
            case ',': cur_.kind = Lexeme::comma; break;
            case '+': case '-': case '*': case '/': case '%': case '^': case '~': case ':':
                cur_.kind = Lexeme::op;
                break;
            case '<': case '>': case '=': case '!': case '&': case '|':
                if (pos_ < text_.size() && (text_[pos_] == '=' || text_[pos_] == '>' ||
                                            text_[pos_] == '&' || text_[pos_] == '|'))
                    ++pos_;
                cur_.kind = Lexeme::op;
                break;
            default: cur_.kind = Lexeme::bad;
        }
    }
    cur_.text = text_.substr(start, pos_ - start);
}

bool ExpressionLexer::at_op(std::initializer_list<std::string_view> ops) const {
    if (cur_.kind != Lexeme::op && cur_.kind != Lexeme::name) return false;
    for (auto o : ops)
        if (iequals(cur_.text, o)) return true;
    return false;
}

}  // namespace deckscale
