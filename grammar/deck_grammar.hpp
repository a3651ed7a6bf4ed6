// PEGTL grammar of an ngspice 39 deck, lexical level. Rules only: no actions live here.
//
// The grammar covers every byte of a file: each byte is matched by exactly one token rule
// (the ones listed in deck_tokens below), so concatenating the tokens gives back the file.
// Lexical rules follow the ngspice 39 manual, sections 2.1 and 2.3 (titles, comments,
// continuation lines, field separators); see also shared notes "deck-syntax.md" §1.
#pragma once

#include <cstring>

#include <tao/pegtl.hpp>
#include <tao/pegtl/contrib/analyze_traits.hpp>

namespace deckscale::grammar {

namespace pg = tao::pegtl;

// Three hot lexical runs are written as primitive rules (a byte loop instead of one rule
// match per character); each behaves exactly like the PEG shown beside it.
namespace scan {

// Bytes that end a word: blanks, line ends, separators, quotes, braces, ';' (and '/',
// which ends a word only when another '/' follows: see word_byte).
struct WordStops {
    bool stop[256] = {};
    constexpr WordStops() {
        for (unsigned char c :
             {' ', '\t', '\f', '\v', '\r', '\n', ',', '=', '(', ')', '{', '\'', '"', ';'})
            stop[c] = true;
    }
};
inline constexpr WordStops kWordStops{};
inline bool word_stop(char c) { return kWordStops.stop[static_cast<unsigned char>(c)]; }

// One or more bytes that `Byte::accept(p, end)` takes, as one primitive rule.
template <typename Byte>
struct byte_run {
    using rule_t = byte_run;
    using subs_t = pg::type_list<>;
    template <typename ParseInput>
    static bool match(ParseInput& in) {
        const char* p = in.current();
        const char* e = in.end();
        const char* s = p;
        while (p < e && Byte::accept(p, e)) ++p;
        if (p == s) return false;
        in.bump_in_this_line(static_cast<std::size_t>(p - s));
        return true;
    }
};

// plus< seq< not_at< two<'/'> >, not_one< word_stop bytes > > >
struct word_byte {
    static bool accept(const char* p, const char* e) {
        return !word_stop(*p) && !(*p == '/' && p + 1 < e && p[1] == '/');
    }
};
using word_run = byte_run<word_byte>;

// plus< sor< one<' ', '\t', '\f', '\v'>, seq< one<'\r'>, not_at< one<'\n'> > > > >
struct blank_byte {
    static bool accept(const char* p, const char* e) {
        return *p == ' ' || *p == '\t' || *p == '\f' || *p == '\v' ||
               (*p == '\r' && !(p + 1 < e && p[1] == '\n'));
    }
};
using blank_run = byte_run<blank_byte>;

// star< not_at< eol >, any >  (eol = opt<'\r'> '\n')
struct line_run {
    using rule_t = line_run;
    using subs_t = pg::type_list<>;
    template <typename ParseInput>
    static bool match(ParseInput& in) {
        const char* s = in.current();
        const char* e = in.end();
        const char* nl = static_cast<const char*>(std::memchr(s, '\n', static_cast<std::size_t>(e - s)));
        const char* p = nl ? nl : e;
        if (nl && p > s && p[-1] == '\r') --p;
        in.bump_in_this_line(static_cast<std::size_t>(p - s));
        return true;
    }
};

// Byte classes of the fast path (simple_line): printable ASCII except separators, quotes,
// braces and comment or continuation marks is a word byte; ' ' and '\t' are blanks. A '/' is
// a word byte too (hierarchical names such as x1/x2/n5) unless another '/' follows it.
struct SimpleBytes {
    // `plain`: a word byte other than '/', or a blank (checked four at a time).
    enum : unsigned char { word = 1, blank = 2, letter = 4, slash = 8, plain = 16 };
    unsigned char of[256] = {};
    constexpr SimpleBytes() {
        for (int c = '!'; c < 0x7f; ++c) of[c] = word;
        for (unsigned char c : {';', '$', '\\', '{', '}', '\'', '"', '=', '(', ')', ','}) of[c] = 0;
        of[static_cast<unsigned char>('/')] = word | slash;
        for (int c = 'a'; c <= 'z'; ++c) of[c] |= letter;
        for (int c = 'A'; c <= 'Z'; ++c) of[c] |= letter;
        of[static_cast<unsigned char>(' ')] = of[static_cast<unsigned char>('\t')] = blank;
        for (auto& c : of)
            if ((c & (word | blank)) && !(c & slash)) c |= plain;
    }
    bool is(char c, unsigned char cls) const {
        return (of[static_cast<unsigned char>(c)] & cls) != 0;
    }
};
inline constexpr SimpleBytes kSimpleBytes{};

// The fast path for the bulk of a large deck, plain element lines such as "R12 n3 n4 1.5k":
// a line that starts with a letter (after blanks, if indented), holds only words of plain
// bytes separated by blanks, ends in LF or CRLF, and is followed by a line that starts, after
// blanks, with a letter or '.' (so no continuation or comment line can join it). For such a
// line the general rules below give exactly: word and blank tokens, the line end, one element
// card. It is matched in one step; every other line goes to the general rules. Tests read
// decks both ways and compare every token (see reference_deck_file).
struct simple_line {
    using rule_t = simple_line;
    using subs_t = pg::type_list<>;
    template <typename ParseInput>
    static bool match(ParseInput& in) {
        const auto& b = kSimpleBytes;
        const char* s = in.current();
        const char* e = in.end();
        const char* p = s;
        while (p < e && b.is(*p, SimpleBytes::blank)) ++p;  // an indented card
        if (p == e || !b.is(*p, SimpleBytes::letter)) return false;
        const unsigned char* of = b.of;
        auto cls = [of](const char* q) { return of[static_cast<unsigned char>(*q)]; };
        while (e - p >= 4 && (cls(p) & cls(p + 1) & cls(p + 2) & cls(p + 3) & SimpleBytes::plain))
            p += 4;
        for (; p < e; ++p) {
            unsigned char cls = b.of[static_cast<unsigned char>(*p)];
            if (!(cls & (SimpleBytes::word | SimpleBytes::blank))) break;
            if ((cls & SimpleBytes::slash) && p + 1 < e && p[1] == '/') return false;  // a comment
        }
        if (p < e && *p == '\r' && p + 1 < e && p[1] == '\n') ++p;
        if (p >= e || *p != '\n') return false;
        const char* next = p + 1;  // the next line must start a card: blanks, then a letter or '.'
        while (next < e && b.is(*next, SimpleBytes::blank)) ++next;
        if (next >= e || !(b.is(*next, SimpleBytes::letter) || *next == '.')) return false;
        in.bump(static_cast<std::size_t>(p + 1 - s));
        return true;
    }
};

}  // namespace scan

// ---- characters and line ends --------------------------------------------------------
struct eol : pg::seq<pg::opt<pg::one<'\r'>>, pg::one<'\n'>> {};  // LF or CRLF
struct eolf : pg::sor<eol, pg::eof> {};
// A carriage return that does not end a line counts as a blank.
struct ws : scan::blank_run {};
struct rest_of_line : scan::line_run {};

// Tries Rule without actions first, so that a partial match (a blank run before a failing
// rule) never leaves tokens behind; used for every alternative that can fail after
// matching a token.
template <typename Rule>
struct guarded : pg::seq<pg::at<Rule>, Rule> {};

// Field separators (manual 2.1.4.1: blanks, ',', '=', '(', ')').
struct separator_char : pg::one<' ', '\t', '\f', '\v', '\r', '\n', ',', '=', '(', ')'> {};

// ---- comments --------------------------------------------------------------------------
// A full-line comment starts with '*' (manual 2.3.3); ngspice also ignores lines starting
// with "//", '$' or ';' (the last two with a warning).
struct comment_text
    : pg::seq<pg::sor<pg::one<'*'>, pg::two<'/'>, pg::one<'$'>, pg::one<';'>>, rest_of_line> {};
struct comment_line : pg::seq<pg::opt<ws>, comment_text, eolf> {};
struct blank_line : pg::seq<pg::opt<ws>, eol> {};
struct blank_last_line : pg::seq<ws, pg::eof> {};  // trailing blanks without a final newline

// End-of-line comment: ';' or "//" anywhere, '$' at the start of a field (i.e. after a
// blank, tab or comma) (manual 2.3.4).
struct eol_comment_start : pg::sor<pg::one<';'>, pg::two<'/'>, pg::one<'$'>> {};
struct eol_comment : pg::seq<eol_comment_start, rest_of_line> {};

// ---- continuation ----------------------------------------------------------------------
// A following line that starts with '+' continues the card; comment and blank lines may
// stand between (manual 2.3.5). A line ending in two backslashes continues too.
struct plus_marker : pg::one<'+'> {};
struct continuation_gap
    : pg::seq<pg::opt<ws>, pg::opt<eol_comment>, eol,
              pg::star<pg::sor<guarded<blank_line>, guarded<comment_line>>>, pg::opt<ws>,
              plus_marker> {};
struct backslash_marker : pg::two<'\\'> {};
struct backslash_gap : pg::seq<backslash_marker, pg::opt<ws>, eol> {};
// Checked first without actions, so that tokens are recorded only for a real continuation.
struct continuation : pg::sor<pg::seq<pg::at<continuation_gap>, continuation_gap>,
                              pg::seq<pg::at<backslash_gap>, backslash_gap>> {};

// ---- fields ------------------------------------------------------------------------------
// Inside {...} and '...' a value may run over continuation lines.
struct brace_close : pg::one<'}'> {};
struct brace_body;
struct brace_nested : pg::seq<pg::one<'{'>, brace_body, brace_close> {};
struct brace_body
    : pg::star<pg::sor<continuation, brace_nested, pg::seq<pg::not_at<pg::sor<eol, pg::one<'}'>>>,
                                                           pg::not_one<'{'>>>> {};
// The inner rules carry no tokens of their own: the whole {...} is one token.
struct brace_expr : pg::seq<pg::one<'{'>, pg::disable<pg::must<brace_body, brace_close>>> {};

struct squote_close : pg::one<'\''> {};
struct squote_expr
    : pg::seq<pg::one<'\''>,
              pg::disable<pg::must<
                  pg::star<pg::sor<continuation, pg::seq<pg::not_at<eol>, pg::not_one<'\''>>>>,
                  squote_close>>> {};

struct dquote_close : pg::one<'"'> {};
struct dquote_string
    : pg::seq<pg::one<'"'>, pg::must<pg::star<pg::not_at<eol>, pg::not_one<'"'>>, dquote_close>> {};

struct equals : pg::one<'='> {};
struct lparen : pg::one<'('> {};
struct rparen : pg::one<')'> {};
struct comma : pg::one<','> {};

// A word: any run of characters that are not separators, quotes, braces or comment starts.
struct word_char
    : pg::seq<pg::not_at<pg::two<'/'>>,
              pg::not_one<' ', '\t', '\f', '\v', '\r', '\n', ',', '=', '(', ')', '{', '\'', '"', ';'>> {};
struct word : scan::word_run {};

// word first: it is by far the most common field, and no other alternative can start
// where a word starts.
struct field : pg::sor<word, equals, lparen, rparen, comma, brace_expr, squote_expr, dquote_string> {};

// A field that is none of the above: a stray '}' is taken by word; only an opening quote
// or brace without its partner fails, and those raise their own messages.
// A continuation can only start at a line end, a comment or a trailing "\\": fields are
// tried first, and a field never starts with "\\" followed by the line end.
struct card_item
    : pg::sor<ws, pg::seq<pg::not_at<eol_comment_start>, pg::not_at<backslash_gap>, field>,
              continuation> {};

// ---- cards -----------------------------------------------------------------------------
template <char... Cs>
struct keyword : pg::seq<pg::istring<Cs...>, pg::not_at<word_char>> {};

struct end_keyword : keyword<'.', 'e', 'n', 'd'> {};
struct control_keyword : keyword<'.', 'c', 'o', 'n', 't', 'r', 'o', 'l'> {};
struct endc_keyword : keyword<'.', 'e', 'n', 'd', 'c'> {};

struct card_first : pg::seq<pg::not_at<eol_comment_start>, pg::not_at<plus_marker>, field> {};
struct card : pg::seq<pg::opt<ws>, card_first, pg::star<card_item>, pg::opt<eol_comment>, eolf> {};

// .control ... .endc is kept as one opaque token (its commands are never interpreted).
struct endc_line : pg::seq<pg::opt<ws>, endc_keyword, rest_of_line> {};
struct control_text
    : pg::seq<pg::opt<ws>, control_keyword, rest_of_line, eol,
              pg::star<pg::not_at<endc_line>, rest_of_line, eol>, endc_line> {};
struct control_unterminated : pg::failure {};  // only ever raised, see deck_errors.hpp
struct control_body
    : pg::disable<pg::sor<control_text, pg::raise<control_unterminated>>> {};  // one token
struct control_block : pg::seq<pg::at<pg::opt<ws>, control_keyword>, control_body, eolf> {};

// A '+' line with no card before it.
struct orphan_plus : pg::seq<pg::opt<ws>, plus_marker> {};
struct orphan_plus_error : orphan_plus {};  // only ever raised, see deck_errors.hpp
struct orphan_continuation
    : pg::seq<pg::at<orphan_plus>, pg::opt<ws>, pg::raise<orphan_plus_error>> {};  // at the '+'

// '.title text': the rest of the line is free text (manual 2.3.1), quotes and braces
// included, and cannot be continued (manual 2.3.5).
struct title_keyword : keyword<'.', 't', 'i', 't', 'l', 'e'> {};
struct title_card_text : pg::plus<pg::not_at<eol>, pg::any> {};
struct title_card : guarded<pg::seq<pg::opt<ws>, pg::at<title_keyword>, word,
                                    pg::opt<title_card_text>, eolf>> {};

// Top-level lines. Each alternative is tried without actions first, so that a partial
// match never leaves tokens behind; a card cannot fail once its first field matched.
struct blank_card : pg::sor<guarded<blank_line>, guarded<blank_last_line>> {};
struct comment_card : guarded<comment_line> {};
struct control_card : control_block {};
struct line_item_general
    : pg::sor<blank_card, comment_card, control_card, orphan_continuation, title_card, card> {};
struct simple_card : scan::simple_line {};
struct line_item : pg::sor<simple_card, line_item_general> {};

// Everything after the .end card is kept verbatim (manual 2.3.2).
struct after_end : pg::plus<pg::any> {};
struct end_card : pg::seq<pg::at<pg::opt<ws>, end_keyword>, card, pg::opt<after_end>> {};

template <typename Item>
struct body_of : pg::seq<pg::star<pg::not_at<pg::opt<ws>, end_keyword>, pg::not_at<pg::eof>, Item>,
                         pg::opt<end_card>, pg::eof> {};
struct body : body_of<line_item> {};

struct bom : pg::string<'\xEF', '\xBB', '\xBF'> {};
struct title_text : rest_of_line {};
// The first line of a deck is its title, whatever it contains (manual 2.3.1).
struct title_line : pg::seq<title_text, eolf> {};

// A top-level deck: title line first.
struct deck_file : pg::seq<pg::opt<bom>, title_line, body> {};
// An included file (.include / .lib): no title line.
struct include_file : pg::seq<pg::opt<bom>, body> {};
// The grammar without its fast path (simple_card), for the tests that prove it changes nothing.
struct reference_deck_file : pg::seq<pg::opt<bom>, title_line, body_of<line_item_general>> {};

}  // namespace deckscale::grammar

namespace tao::pegtl {
template <typename Name, typename Byte>
struct analyze_traits<Name, deckscale::grammar::scan::byte_run<Byte>> : analyze_any_traits<> {};
template <typename Name>
struct analyze_traits<Name, deckscale::grammar::scan::line_run> : analyze_opt_traits<> {};
template <typename Name>
struct analyze_traits<Name, deckscale::grammar::scan::simple_line> : analyze_any_traits<> {};
}  // namespace tao::pegtl
