#include "deck/card_reader.hpp"

#include <algorithm>
#include <vector>

#include <fmt/format.h>

#include "grammar/deck_errors.hpp"
#include "grammar/deck_grammar.hpp"

namespace deckscale {
namespace {

namespace pg = tao::pegtl;
namespace g = grammar;

// Thrown through the parser to end a partial read before the card that begins here.
struct Stopped {
    std::uint32_t at;
};

// Tokens of the card being read, in a buffer reused from card to card (it only grows).
struct TokenBuffer {
    std::vector<Token> slots = std::vector<Token>(64);
    std::size_t count = 0;

    void add(const Token& t) {
        if (count == slots.size()) slots.resize(slots.size() * 2);
        slots[count++] = t;
    }
    // Room for `more` tokens, so that add_unchecked may follow.
    void ensure(std::size_t more) {
        if (count + more > slots.size()) slots.resize(std::max(slots.size() * 2, count + more));
    }
    void add_unchecked(const Token& t) { slots[count++] = t; }
    std::span<const Token> view() const { return {slots.data(), count}; }
};

struct ReaderState {
    const SourceFile* file;
    const CardVisitor* visit;
    const char* base;
    std::uint32_t stop_at = UINT32_MAX;
    TokenBuffer tokens;
    TokenBuffer fields;

    void push(TokenKind kind, const char* b, const char* e) {
        if (b == e) return;  // an empty title line holds no bytes, so no token
        Token t{kind, static_cast<std::uint32_t>(b - base), static_cast<std::uint32_t>(e - base)};
        tokens.add(t);
        if (is_field(kind)) fields.add(t);
    }
    void emit(CardKind kind) {
        if (tokens.count == 0) return;
        std::uint32_t first = tokens.slots[0].begin;
        if (first >= stop_at) throw Stopped{first};
        Card c{kind, file, tokens.view(), fields.view()};
        try {
            (*visit)(c);
        } catch (const StopReading&) {
            throw Stopped{first};
        }
        tokens.count = 0;
        fields.count = 0;
    }
};

template <typename Rule>
struct action : pg::nothing<Rule> {};

template <TokenKind K>
struct token_action {
    template <typename Input>
    static void apply(const Input& in, ReaderState& st) {
        st.push(K, in.begin(), in.end());
    }
};

template <> struct action<g::bom> : token_action<TokenKind::bom> {};
template <> struct action<g::ws> : token_action<TokenKind::whitespace> {};
template <> struct action<g::eol> : token_action<TokenKind::line_end> {};
template <> struct action<g::comment_text> : token_action<TokenKind::comment> {};
template <> struct action<g::eol_comment> : token_action<TokenKind::comment> {};
template <> struct action<g::plus_marker> : token_action<TokenKind::continuation> {};
template <> struct action<g::backslash_marker> : token_action<TokenKind::continuation> {};
template <> struct action<g::title_text> : token_action<TokenKind::title> {};
template <> struct action<g::title_card_text> : token_action<TokenKind::title> {};
template <> struct action<g::control_body> : token_action<TokenKind::control> {};
template <> struct action<g::word> : token_action<TokenKind::word> {};
template <> struct action<g::brace_expr> : token_action<TokenKind::brace> {};
template <> struct action<g::squote_expr> : token_action<TokenKind::squote> {};
template <> struct action<g::dquote_string> : token_action<TokenKind::dquote> {};
template <> struct action<g::equals> : token_action<TokenKind::equals> {};
template <> struct action<g::lparen> : token_action<TokenKind::lparen> {};
template <> struct action<g::rparen> : token_action<TokenKind::rparen> {};
template <> struct action<g::comma> : token_action<TokenKind::comma> {};

template <CardKind K>
struct card_action {
    template <typename Input>
    static void apply(const Input&, ReaderState& st) {
        st.emit(K);
    }
};

template <> struct action<g::title_line> : card_action<CardKind::title> {};
template <> struct action<g::blank_card> : card_action<CardKind::blank> {};
template <> struct action<g::comment_card> : card_action<CardKind::comment> {};
template <> struct action<g::control_card> : card_action<CardKind::control> {};
template <> struct action<g::title_card> : card_action<CardKind::dot> {};

template <>
struct action<g::card> {
    template <typename Input>
    static void apply(const Input&, ReaderState& st) {
        bool dot = st.fields.count > 0 && st.base[st.fields.slots[0].begin] == '.';
        st.emit(dot ? CardKind::dot : CardKind::element);
    }
};

// A plain element line taken by the fast path: split into the tokens the general rules give.
template <>
struct action<g::simple_card> {
    template <typename Input>
    static void apply(const Input& in, ReaderState& st) {
        using B = g::scan::SimpleBytes;
        const unsigned char* of = g::scan::kSimpleBytes.of;
        auto cls = [of](char c) { return of[static_cast<unsigned char>(c)]; };
        const char* p = in.begin();
        const char* e = in.end();
        // A line of n bytes holds at most n + 1 tokens (the matched line is never empty).
        auto n = static_cast<std::size_t>(e - p);
        st.tokens.ensure(n + 1);
        st.fields.ensure(n + 1);
        auto token = [&](TokenKind kind, const char* b, const char* q) {
            return Token{kind, static_cast<std::uint32_t>(b - st.base),
                         static_cast<std::uint32_t>(q - st.base)};
        };
        while (p < e) {
            const char* q = p;
            if (cls(*p) & B::blank) {
                while (cls(*q) & B::blank) ++q;  // the line end stops it
                st.tokens.add_unchecked(token(TokenKind::whitespace, p, q));
            } else if (cls(*p) & B::word) {
                while (cls(*q) & B::word) ++q;
                Token t = token(TokenKind::word, p, q);
                st.tokens.add_unchecked(t);
                st.fields.add_unchecked(t);
            } else {
                st.tokens.add_unchecked(token(TokenKind::line_end, p, e));
                break;
            }
            p = q;
        }
        st.emit(CardKind::element);
    }
};

template <>
struct action<g::after_end> {
    template <typename Input>
    static void apply(const Input& in, ReaderState& st) {
        st.push(TokenKind::after_end, in.begin(), in.end());
        st.emit(CardKind::after_end);
    }
};

// An unclosed '{' or quote is noticed where its card ends; point at the opening character
// instead (the last unmatched '{', or the last quote, before the failure).
std::uint32_t opening_of_unclosed(std::string_view text, std::uint32_t at, const std::string& msg) {
    char open = 0;
    if (msg == g::error_message<g::brace_close>) open = '{';
    if (msg == g::error_message<g::squote_close>) open = '\'';
    if (msg == g::error_message<g::dquote_close>) open = '"';
    if (!open) return at;
    int depth = 0;
    for (std::uint32_t i = std::min<std::uint32_t>(at, static_cast<std::uint32_t>(text.size())); i-- > 0;) {
        char c = text[i];
        if (open == '{' && c == '}') ++depth;
        if (c == open) {
            if (depth == 0) return i;
            --depth;
        }
    }
    return at;
}

// The grammar reads nested braces by recursion; deeper nesting than this is refused before
// parsing so that no input can overflow the stack (each level costs a few stack frames, more
// under sanitizers). A line end ends the nesting unless a '+' continuation line follows.
constexpr int kMaxBraceDepth = 256;

void check_brace_depth(const SourceFile& file, std::size_t from) {
    std::string_view t = file.text();
    int depth = 0;
    for (std::size_t i = from; i < t.size(); ++i) {
        char c = t[i];
        if (c == '{') {
            if (++depth > kMaxBraceDepth)
                throw DeckError(file.diagnose(
                    Severity::error, static_cast<std::uint32_t>(i), 1,
                    fmt::format("braces nested more than {} deep: deckscale does not read this",
                                kMaxBraceDepth)));
        } else if (c == '}') {
            if (depth > 0) --depth;
        } else if (c == '\n' && depth > 0) {
            std::size_t j = i + 1;
            while (j < t.size() && (t[j] == ' ' || t[j] == '\t')) ++j;
            if (j >= t.size() || t[j] != '+') depth = 0;
        }
    }
}

template <typename Grammar>
std::uint32_t run(const SourceFile& file, const CardVisitor& visit, ReadSpan span) {
    check_brace_depth(file, span.from);
    ReaderState st{&file, &visit, file.text().data(), span.stop_at, {}, {}};
    std::string_view rest = file.text().substr(span.from);
    pg::memory_input<pg::tracking_mode::lazy, pg::eol::lf_crlf> in(rest.data(), rest.size(),
                                                                     file.path());
    try {
        pg::parse<Grammar, action, g::error_control>(in, st);
        // Anything left (only possible for a file that holds nothing but a byte-order mark).
        st.emit(CardKind::blank);
    } catch (const pg::parse_error& e) {
        auto offset = static_cast<std::uint32_t>(span.from + e.positions().front().byte);
        std::string msg(e.message());
        offset = opening_of_unclosed(file.text(), offset, msg);
        throw DeckError(file.diagnose(Severity::error, offset, 1, msg));
    } catch (const Stopped& s) {
        return s.at;
    }
    return static_cast<std::uint32_t>(file.text().size());
}

}  // namespace

void read_cards(const SourceFile& file, FileRole role, const CardVisitor& visit) {
    read_cards(file, role, visit, ReadSpan{});
}

void read_cards_reference(const SourceFile& file, const CardVisitor& visit) {
    run<g::reference_deck_file>(file, visit, ReadSpan{});
}

std::uint32_t read_cards(const SourceFile& file, FileRole role, const CardVisitor& visit,
                         ReadSpan span) {
    if (span.from > 0) return run<g::body>(file, visit, span);  // between cards: no title
    if (role == FileRole::deck) return run<g::deck_file>(file, visit, span);
    return run<g::include_file>(file, visit, span);
}

}  // namespace deckscale
