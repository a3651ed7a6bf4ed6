#include "deck/control_script.hpp"

#include "base/text_util.hpp"

namespace deckscale {
namespace {

bool is_blank(char c) { return c == ' ' || c == '\t'; }

bool ends_word(char c) {
    return is_blank(c) || c == '=' || c == '(' || c == ')' || c == ',' || c == ';' || c == '"';
}

class Splitter {
  public:
    Splitter(const SourceFile& file, std::vector<ControlCommand>& out)
        : text_(file.text()), out_(out) {}

    // One physical line [begin, end) without its line end, then its line end [end, next).
    void line(std::uint32_t begin, std::uint32_t end, std::uint32_t next) {
        std::uint32_t i = begin;
        while (i < end && is_blank(text_[i])) ++i;
        if (i < end && text_[i] == '*') return;  // comment line: a '+' line may still follow
        if (i < end && text_[i] == '+') {
            // Continues the command before it (ngspice joins the lines with a blank).
            if (i > begin) add(TokenKind::whitespace, begin, i);
            add(TokenKind::continuation, i, i + 1);
            ++i;
        } else {
            finish();
            line_begin_ = begin;
            i = begin;
        }
        while (i < end) {
            char c = text_[i];
            std::uint32_t j = i + 1;
            if (is_blank(c)) {
                while (j < end && is_blank(text_[j])) ++j;
                if (!cur_.fields.empty()) add(TokenKind::whitespace, i, j);
            } else if (c == ';') {
                finish();  // the next command starts on the same line
                line_begin_ = begin;
            } else if (c == '$' && (j == end || is_blank(text_[j])) &&
                       (i == begin || is_blank(text_[i - 1]))) {
                j = end;  // "$ " comments to the line end inside .control (manual 2.3.4)
                if (!cur_.fields.empty()) add(TokenKind::comment, i, j);
            } else if (c == '=') {
                add(TokenKind::equals, i, j);
            } else if (c == '(') {
                add(TokenKind::lparen, i, j);
            } else if (c == ')') {
                add(TokenKind::rparen, i, j);
            } else if (c == ',') {
                add(TokenKind::comma, i, j);
            } else if (c == '"') {
                while (j < end && text_[j] != '"') ++j;
                if (j < end) ++j;
                add(TokenKind::dquote, i, j);
            } else {
                while (j < end && !ends_word(text_[j])) ++j;
                add(TokenKind::word, i, j);
            }
            i = j;
        }
        if (next > end && !cur_.fields.empty()) add(TokenKind::line_end, end, next);
    }

    void finish() {
        if (!cur_.fields.empty()) {
            cur_.line_begin = line_begin_;
            out_.push_back(std::move(cur_));
        }
        cur_ = ControlCommand{};
    }

  private:
    void add(TokenKind k, std::uint32_t b, std::uint32_t e) {
        Token t{k, b, e};
        cur_.tokens.push_back(t);
        if (is_field(k)) cur_.fields.push_back(t);
    }

    std::string_view text_;
    std::vector<ControlCommand>& out_;
    ControlCommand cur_;
    std::uint32_t line_begin_ = 0;
};

}  // namespace

const Token* control_token(const Card& card) {
    for (const auto& t : card.tokens)
        if (t.kind == TokenKind::control) return &t;
    return nullptr;
}

std::vector<ControlCommand> control_commands(const SourceFile& file, const Token& block) {
    std::vector<ControlCommand> out;
    std::string_view text = file.text();
    Splitter split(file, out);
    std::uint32_t pos = block.begin;
    bool first = true;  // the .control line itself
    while (pos < block.end) {
        std::uint32_t nl = pos;
        while (nl < block.end && text[nl] != '\n') ++nl;
        std::uint32_t next = nl < block.end ? nl + 1 : block.end;
        std::uint32_t end = nl > pos && text[nl - 1] == '\r' ? nl - 1 : nl;
        std::uint32_t i = pos;
        while (i < end && is_blank(text[i])) ++i;
        if (!first && istarts_with(text.substr(i, end - i), ".endc")) break;
        if (!first) split.line(pos, end, next);
        first = false;
        pos = next;
    }
    split.finish();
    return out;
}

std::size_t first_literal(std::string_view w) {
    auto digit = [](char c) { return c >= '0' && c <= '9'; };
    auto name_char = [&](char c) {
        return digit(c) || c == '_' || c == '#' || c == '.' ||
               (ascii_lower(c) >= 'a' && ascii_lower(c) <= 'z');
    };
    for (std::size_t i = 0; i < w.size(); ++i) {
        bool starts = digit(w[i]) || (w[i] == '.' && i + 1 < w.size() && digit(w[i + 1]));
        if (starts && (i == 0 || !name_char(w[i - 1]))) return i;
    }
    return std::string_view::npos;
}

}  // namespace deckscale
