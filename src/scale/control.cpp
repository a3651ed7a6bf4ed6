// The .control block handler. Each command is read as a card of its own (deck/control_script)
// and dispatched on its name; the table of what each command carries is the shared notes'
// "control-and-sweeps.md" A.2, from the ngspice 39 manual chapter 17.
#include "scale/control.hpp"

#include <array>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/control_script.hpp"
#include "deck/spice_number.hpp"
#include "scale/pass.hpp"
#include "scale/rules.hpp"

namespace deckscale {

std::optional<Unit> swept_unit(std::string_view source) {
    std::string s = to_lower(source);
    if (s == "temp") return Unit::none;
    switch (s.empty() ? '\0' : s[0]) {
        case 'v': return Unit::volt;
        case 'i': return Unit::ampere;
        case 'r': return Unit::ohm;
        default: return std::nullopt;
    }
}

namespace {

const Token* control_token(const Card& c) {
    for (const auto& t : c.tokens)
        if (t.kind == TokenKind::control) return &t;
    return nullptr;
}

}  // namespace

DcSweeps dc_sweeps(const Deck& deck) {
    DcSweeps out;
    bool same = true;
    auto take = [&](std::string_view source) {
        auto u = swept_unit(source);
        if (!u || (out.found > 0 && out.unit != u)) same = false;
        if (out.found++ == 0) out.unit = u;
    };
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind == CardKind::dot && c.fields.size() > 1 && card_keyword(c) == ".dc")
                take(c.field_text(1));
            const Token* block = c.kind == CardKind::control ? control_token(c) : nullptr;
            if (!block) return;
            for (const auto& cmd : control_commands(*c.file, *block))
                if (cmd.fields.size() > 1 && iequals(c.text(cmd.fields[0]), "dc"))
                    take(c.text(cmd.fields[1]));
        });
    if (!same) out.unit.reset();
    return out;
}

std::optional<Unit> ScalePass::dc_swept_unit(const Token& at, std::string_view key) {
    if (block_dc_seen) {
        if (!block_dc_unit)
            unscalable(at, fmt::format("{}= of a DC measurement: the sweep before it in this "
                                       ".control block is not of a V, I or R source or TEMP", key));
        return block_dc_unit;
    }
    if (observing_) {
        // A .dc card may follow: decide once the whole deck is read.
        rescan_ = true;
        return std::nullopt;
    }
    DcSweeps s = dc_sweeps(*deck_);
    if (s.unit) return s.unit;
    unscalable(at, s.found == 0
                       ? fmt::format("{}= of a DC measurement in a deck with no DC sweep", key)
                       : fmt::format("{}= of a DC measurement: the deck's DC sweeps are not all of "
                                     "V, I or R sources or TEMP, or differ in unit", key));
    return std::nullopt;
}

void ScalePass::with_command(const Card& command, std::uint32_t line_begin,
                             const std::function<void()>& handler) {
    struct Restore {
        ScalePass& p;
        const Card* block;
        ~Restore() {
            p.mark_at_.reset();
            p.card_ = block;
        }
    } restore{*this, card_};
    card_ = &command;
    mark_at_ = line_begin;
    card_marked_ = marked_line_ == line_begin && marked_file_ == file_;
    handler();
    if (card_marked_) {
        marked_line_ = line_begin;
        marked_file_ = file_;
    }
}

namespace {

// What the block has run so far: the unit of the current plot's scale.
struct BlockState {
    std::optional<Unit> scale;  // time, frequency or the DC sweep's quantity
    bool scale_known = false;   // false before any analysis
};

bool is_output_function(std::string_view w) {
    static const std::array<std::string_view, 14> names = {
        "v", "vm", "vr", "vi", "vp", "vdb", "vg", "i", "im", "ir", "ii", "ip", "idb", "ig"};
    std::string s = to_lower(w);
    for (auto n : names)
        if (s == n) return true;
    return false;
}

// The unit of v(..)/i(..) and relatives; nullopt for dB and phase readings' relatives too.
std::optional<Unit> output_function_unit(std::string_view w) {
    std::string s = to_lower(w);
    if (s == "v" || s == "vm" || s == "vr" || s == "vi") return Unit::volt;
    if (s == "i" || s == "im" || s == "ir" || s == "ii") return Unit::ampere;
    if (s == "vdb" || s == "vp" || s == "idb" || s == "ip") return Unit::none;
    return std::nullopt;
}

// The literal inside field `t` at the offset first_literal found: digits, '.', letters (a
// suffix and unit tail) and an exponent's sign.
Token literal_token(const Card& c, const Token& t, std::size_t at) {
    std::string_view w = c.text(t);
    std::size_t e = at;
    while (e < w.size()) {
        char ch = ascii_lower(w[e]);
        bool sign = (ch == '+' || ch == '-') && e > at && ascii_lower(w[e - 1]) == 'e' && e >= at + 2 &&
                    w[e - 2] >= '0' && w[e - 2] <= '9';
        if (!(sign || ch == '.' || ch == '_' || (ch >= '0' && ch <= '9') || (ch >= 'a' && ch <= 'z')))
            break;
        ++e;
    }
    return Token{TokenKind::word, static_cast<std::uint32_t>(t.begin + at),
                 static_cast<std::uint32_t>(t.begin + e)};
}

// The first numeric literal in fields [from, to) outside the node names of v(..), i(..).
std::optional<Token> literal_in(const Card& c, std::size_t from, std::size_t to) {
    const auto& f = c.fields;
    for (std::size_t i = from; i < to && i < f.size(); ++i) {
        if (f[i].kind == TokenKind::word && i + 1 < f.size() && f[i + 1].kind == TokenKind::lparen &&
            is_output_function(c.text(f[i]))) {
            while (i < f.size() && f[i].kind != TokenKind::rparen) ++i;  // node names
            continue;
        }
        if (f[i].kind != TokenKind::word) continue;
        std::size_t at = first_literal(c.text(f[i]));
        if (at != std::string_view::npos) return literal_token(c, f[i], at);
    }
    return std::nullopt;
}

bool is_number_word(const Card& c, const Token& t) {
    return t.kind == TokenKind::word && parse_spice_number(c.text(t)).number.has_value();
}

const Token* substituted_word(const Card& c) {
    for (const auto& t : c.fields)
        if (t.kind == TokenKind::word && c.text(t).find_first_of("$`") != std::string_view::npos) return &t;
    return nullptr;
}

void refuse_literal(ScalePass& p, const Card& c, std::size_t from, std::string_view why) {
    if (auto t = literal_in(c, from, c.fields.size()))
        p.unscalable(*t, fmt::format("'{}' in '{}': {}", c.text(*t), to_lower(c.field_text(0)), why));
}

constexpr std::string_view kUseTells = "the unit of this number is known only from how its value is used";

// A value after '=' in a measurement that names a vector ("val=vth"): its unit is that of the
// vector, which the block computed.
bool refuse_vector_values(ScalePass& p, const Card& c) {
    const auto& f = c.fields;
    for (std::size_t i = 0; i + 1 < f.size(); ++i) {
        if (f[i].kind != TokenKind::equals || f[i + 1].kind != TokenKind::word) continue;
        const Token& v = f[i + 1];
        if (is_number_word(c, v) || iequals(c.text(v), "last")) continue;
        if (i + 2 < f.size() && f[i + 2].kind == TokenKind::lparen) continue;  // v(x)
        p.unscalable(v, fmt::format("'{}' names a vector: its unit is known only from how the "
                                    "block computed it", c.text(v)));
        return true;
    }
    return false;
}

// set name = value ...: options scale as .options (notes A.3); front-end variables holding
// counts pass; any other number is a user variable whose unit its uses tell (notes A.4).
void scale_set(ScalePass& p, const Card& c) {
    static const std::array<std::string_view, 12> counts = {
        "width",  "height", "numdgt",          "nfreqs",      "polydegree",  "fourgridsize",
        "rndseed", "num_threads", "specwindoworder", "xbrushwidth", "ybrushwidth", "gridsize"};
    const auto& f = c.fields;
    std::string key;
    for (std::size_t i = 1; i < f.size(); ++i) {
        if (f[i].kind == TokenKind::word && i + 1 < f.size() && f[i + 1].kind == TokenKind::equals) {
            key = to_lower(c.text(f[i]));
            ++i;
            continue;
        }
        if (f[i].kind != TokenKind::word || first_literal(c.text(f[i])) == std::string_view::npos) continue;
        if (auto u = find_rule(".options", key); u && is_number_word(c, f[i])) {
            p.scale_value(f[i], *u, key);
        } else if (std::find(counts.begin(), counts.end(), key) == counts.end()) {
            p.unscalable(f[i], fmt::format("'{}' is a variable: the unit of its value is known only "
                                           "where ${} is used", key.empty() ? "?" : key, key));
            return;
        }
    }
}

// let lin-tstart = 1m and the other special vectors of linearize and cutout (manual 17.5.40,
// 17.5.14) are times; any other number in an expression is refused.
void scale_let(ScalePass& p, const Card& c) {
    const auto& f = c.fields;
    static const std::array<std::string_view, 5> times = {"lin-tstart", "lin-tstop", "lin-tstep",
                                                          "cut-tstart", "cut-tstop"};
    if (f.size() == 4 && f[2].kind == TokenKind::equals && is_number_word(c, f[3]) &&
        std::find(times.begin(), times.end(), to_lower(c.text(f[1]))) != times.end()) {
        p.scale_value(f[3], Unit::second, to_lower(c.text(f[1])));
        return;
    }
    refuse_literal(p, c, 1, kUseTells);
}

// alter dev = v | alter dev par = v | alter @dev[par] = v | alter dev v (manual 17.5.3): the
// element rule table gives the unit.
void scale_alter(ScalePass& p, const Card& c) {
    const auto& f = c.fields;
    if (f.size() < 3) return;
    std::string dev = to_lower(c.text(f[1]));
    std::string par;
    std::size_t value = f.size() - 1;
    if (dev.size() > 1 && dev[0] == '@') {
        auto open = dev.find('['), close = dev.find(']');
        if (open != std::string::npos && close != std::string::npos && close > open) {
            par = dev.substr(open + 1, close - open - 1);
            dev = dev.substr(1, open - 1);
        }
    } else if (f.size() == 5 && f[3].kind == TokenKind::equals) {
        par = to_lower(c.text(f[2]));
    }
    bool simple = (f.size() == 4 && f[2].kind == TokenKind::equals) || (f.size() == 5 && !par.empty()) ||
                  (f.size() == 3 && f[2].kind == TokenKind::word);
    if (!simple || dev.empty()) {
        refuse_literal(p, c, 1, "a value list or expression in 'alter' is not rewritten");
        return;
    }
    const Token& v = f[value];
    if (first_literal(c.text(v)) == std::string_view::npos && c.text(v).find('$') == std::string_view::npos)
        return;
    char letter = dev[0];
    if (par.empty()) par = letter == 'v' || letter == 'i' ? "dc" : "value";
    if (par == "resistance" || par == "capacitance" || par == "inductance") par = "value";
    auto u = find_rule(std::string(1, letter), par);
    if (!u) {
        p.unscalable(f[1], fmt::format("'alter' of '{}' of '{}': that parameter is not in the rule "
                                       "table", par, c.text(f[1])));
        return;
    }
    if (*u == Unit::signal) u = letter == 'v' ? Unit::volt : Unit::ampere;
    if (!is_number_word(c, v)) {
        p.unscalable(v, fmt::format("'alter' value '{}' is not a number", c.text(v)));
        return;
    }
    p.scale_value(v, *u, par);
}

// altermod mod par = v | altermod @mod[par] = v (manual 17.5.4): the model rule table.
void scale_altermod(ScalePass& p, const Card& c) {
    const auto& f = c.fields;
    if (!literal_in(c, 1, f.size())) return;
    std::string mod = to_lower(c.text(f[1])), par;
    std::size_t value = 0;
    if (mod.size() > 1 && mod[0] == '@' && f.size() == 4 && f[2].kind == TokenKind::equals) {
        auto open = mod.find('['), close = mod.find(']');
        if (open != std::string::npos && close > open) par = mod.substr(open + 1, close - open - 1);
        mod = mod.substr(1, open == std::string::npos ? std::string::npos : open - 1);
        value = 3;
    } else if (f.size() == 5 && f[3].kind == TokenKind::equals) {
        par = to_lower(c.text(f[2]));
        value = 4;
    }
    const std::string* type = p.model_type(mod);
    std::optional<Unit> u;
    if (type && !par.empty()) u = find_rule("model:" + (*type == "res" ? std::string("r") : *type), par);
    if (!u || !is_number_word(c, f[value])) {
        refuse_literal(p, c, 1, "'altermod' of a model parameter the rule table does not know");
        return;
    }
    p.scale_value(f[value], *u, par);
}

// stop when w op val (manual 17.5.85): val takes the unit of w when w is time, frequency,
// v(..) or i(..).
void scale_stop(ScalePass& p, const Card& c) {
    const auto& f = c.fields;
    std::size_t i = 1;
    while (i < f.size() && !iequals(c.text(f[i]), "when")) ++i;
    if (i == f.size()) return;  // stop after n: a count
    std::optional<Unit> u;
    std::size_t next = i + 2;
    std::string w = i + 1 < f.size() ? to_lower(c.text(f[i + 1])) : "";
    if (w == "time") u = Unit::second;
    else if (w == "frequency") u = Unit::hertz;
    else if (i + 2 < f.size() && f[i + 2].kind == TokenKind::lparen) {
        u = output_function_unit(w);
        while (next < f.size() && f[next].kind != TokenKind::rparen) ++next;
        ++next;
    }
    // one comparison word (or '=') and one number, nothing after it
    if (u && next + 2 == f.size() && is_number_word(c, f[next + 1])) {
        p.scale_value(f[next + 1], *u, "when");
        return;
    }
    refuse_literal(p, c, 1, kUseTells);
}

// plot and its relatives: limits in the unit of the scale (x) or of the plotted vectors (y)
// (manual 17.5.50; ngspice-39.3 src/frontend/plotting/plotit.c:73-115); xindices and
// xcompress are counts; other numbers in the plotted expressions are refused as in 'let'.
void scale_plot(ScalePass& p, const Card& c, const BlockState& st, std::size_t first) {
    const auto& f = c.fields;
    std::optional<Unit> y;
    bool y_known = true, any = false, has_vs = false;
    for (std::size_t i = first; i < f.size(); ++i) {
        if (f[i].kind != TokenKind::word) continue;
        std::string w = to_lower(c.text(f[i]));
        if (w == "vs") has_vs = true;
        if (i + 1 < f.size() && f[i + 1].kind == TokenKind::lparen) {
            auto u = output_function_unit(w);
            if (!u || (any && y != u)) y_known = false;
            if (!any) y = u;
            any = true;
        }
    }
    if (!any) y_known = false;
    bool x_known = st.scale_known && st.scale && !has_vs;
    for (std::size_t i = first; i < f.size(); ++i) {
        std::string w = f[i].kind == TokenKind::word ? to_lower(c.text(f[i])) : "";
        std::size_t n = 0;
        bool x = true;
        if (w == "xl" || w == "xlimit") n = 2;
        else if (w == "xdel" || w == "xdelta") n = 1;
        else if (w == "yl" || w == "ylimit") n = 2, x = false;
        else if (w == "ydel" || w == "ydelta") n = 1, x = false;
        if (n > 0) {
            for (std::size_t k = 1; k <= n && i + k < f.size(); ++k) {
                const Token& v = f[i + k];
                if (!is_number_word(c, v)) continue;
                if (x ? x_known : y_known)
                    p.scale_value(v, x ? *st.scale : *y, w);
                else
                    p.unscalable(v, fmt::format("'{}' of '{}': the unit of that axis is not known "
                                                "here", w, to_lower(c.field_text(0))));
            }
            i += n;
            continue;
        }
        if (w == "xind" || w == "xindices" || w == "xcomp" || w == "xcompress") {
            i += w.starts_with("xind") ? 2 : 1;
            continue;
        }
        if (auto t = literal_in(c, i, i + 1)) {
            p.unscalable(*t, fmt::format("'{}' in '{}': {}", c.text(*t), to_lower(c.field_text(0)),
                                         kUseTells));
            return;
        }
        if (i + 1 < f.size() && f[i + 1].kind == TokenKind::lparen && is_output_function(w))
            while (i < f.size() && f[i].kind != TokenKind::rparen) ++i;  // node names
    }
}

// The dot card each analysis or measurement command is read as (ngspice-39.3
// src/frontend/spiceif.c:241 flattens analysis commands into the dot card).
std::string_view dot_twin(std::string_view cmd) {
    struct Twin {
        std::string_view cmd, dot;
    };
    static constexpr Twin twins[] = {
        {"ac", ".ac"},       {"dc", ".dc"},           {"tran", ".tran"},      {"noise", ".noise"},
        {"sp", ".sp"},       {"pss", ".pss"},         {"disto", ".disto"},    {"sens", ".sens"},
        {"four", ".four"},   {"fourier", ".four"},    {"meas", ".meas"},      {"measure", ".meas"},
        {"option", ".options"}, {"options", ".options"}, {"opt", ".options"},
    };
    for (const auto& t : twins)
        if (t.cmd == cmd) return t.dot;
    return {};
}

bool passes(std::string_view cmd) {
    // Commands that carry no unit-bearing number (notes A.2): counts, names, text.
    static constexpr std::string_view names[] = {
        "op", "tf", "pz", "run", "resume", "destroy", "setplot", "display", "echo", "quit", "exit",
        "save", "trace", "iplot", "show", "showmod", "setscale", "settype", "deftype", "unlet",
        "transpose", "remzerovec", "rusage", "status", "delete", "listing", "inventory", "setseed",
        "mc_source", "codemodel", "reset", "reshape", "repeat", "step", "fft", "psd", "linearize",
        "cutout", "print", "write", "wrs2p", "wrnodev", "eprint", "end", "else", "label", "goto",
        "break", "continue", "unset", "shell", "version", "help", "cd", "rehash", "edit", "unalias",
        "history", "strcmp", "bug", "where", "snsave", "wrdata_header", "option_off", "optran_off"};
    for (auto n : names)
        if (n == cmd) return true;
    return false;
}

void scale_command(ScalePass& p, const Card& c, BlockState& st) {
    std::string cmd = to_lower(c.field_text(0));
    std::string_view dot = dot_twin(cmd);
    if (!dot.empty()) {
        if (const Token* s = substituted_word(c)) {
            p.unscalable(*s, fmt::format("'{}' is replaced by a variable's value before '{}' reads "
                                         "its words: that value's unit is not known here", c.text(*s), cmd));
            return;
        }
        if (dot == ".meas" && refuse_vector_values(p, c)) return;
        if (cmd == "dc") {
            p.block_dc_seen = true;
            p.block_dc_unit = c.fields.size() > 1 ? swept_unit(c.field_text(1)) : std::nullopt;
        }
        scale_dot_card(p, std::string(dot));
        if (cmd == "tran") st.scale = Unit::second;
        else if (cmd == "ac" || cmd == "noise" || cmd == "sp" || cmd == "disto") st.scale = Unit::hertz;
        else if (cmd == "dc") st.scale = p.block_dc_unit;
        if (cmd == "tran" || cmd == "ac" || cmd == "noise" || cmd == "sp" || cmd == "disto" || cmd == "dc")
            st.scale_known = true;
        return;
    }
    if (cmd == "set" || cmd == "setcs") return scale_set(p, c);
    if (cmd == "let" || cmd == "define") return scale_let(p, c);
    if (cmd == "alter") return scale_alter(p, c);
    if (cmd == "altermod") return scale_altermod(p, c);
    if (cmd == "stop") return scale_stop(p, c);
    if (cmd == "plot" || cmd == "asciiplot") return scale_plot(p, c, st, 1);
    if (cmd == "gnuplot" || cmd == "hardcopy" || cmd == "wrdata") return scale_plot(p, c, st, 2);
    if (cmd == "spec") {
        // spec fstart fstop fstep vec... (manual 17.5.82): frequencies.
        for (std::size_t i = 1; i < 4 && i < c.fields.size(); ++i)
            if (is_number_word(c, c.fields[i])) p.scale_value(c.fields[i], Unit::hertz, "spec");
        return;
    }
    if (cmd == "source" || cmd == "alias" || cmd == "load" || cmd == "snload") {
        p.note(c.fields[0], fmt::format("'{}' brings in commands or data from elsewhere; they are not "
                                        "rewritten", cmd));
        return;
    }
    if (passes(cmd)) return;
    if (cmd == "if" || cmd == "while" || cmd == "dowhile")
        return refuse_literal(p, c, 1, kUseTells);
    if (cmd == "foreach") return refuse_literal(p, c, 2, kUseTells);
    if (cmd == "compose") return refuse_literal(p, c, 1, kUseTells);
    // alterparam: every use of a parameter is written {(p)*k}, so its new value stays as
    // written (notes A.2, checked there with ngspice).
    if (cmd == "alterparam") return;
    refuse_literal(p, c, 1, "a number in a command whose arguments deckscale does not know");
}

}  // namespace

void scale_control_block(ScalePass& p) {
    const Card& block = p.card();
    const Token* t = control_token(block);
    if (!t) return;
    BlockState st;
    p.block_dc_seen = false;
    p.block_dc_unit.reset();
    for (const auto& cmd : control_commands(*block.file, *t)) {
        Card c = cmd.as_card(*block.file);
        p.with_command(c, cmd.line_begin, [&] { scale_command(p, c, st); });
    }
    p.block_dc_seen = false;
    p.block_dc_unit.reset();
}

}  // namespace deckscale
