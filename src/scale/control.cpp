// The .control block handler. Each command is read as a card of its own (deck/control_script)
// and dispatched on its name: analysis, measurement and option commands go through the
// dot-card handlers and the rule table, as ngspice reads them like the dot cards
// (ngspice-39.3 src/frontend/spiceif.c:241); commands with no unit-carrying number pass byte
// for byte; numbers whose unit only their use tells are refused.
#include "scale/control.hpp"

#include <fmt/format.h>

#include <array>

#include "base/text_util.hpp"
#include "deck/control_script.hpp"
#include "deck/spice_number.hpp"
#include "scale/sweep_unit.hpp"

namespace deckscale {
namespace {

// The literal inside field `t` at the offset first_literal found: digits, '.', letters (a
// suffix and unit tail) and an exponent's sign.
Token literal_token(const Card& c, const Token& t, std::size_t at) {
    std::string_view w = c.text(t);
    std::size_t e = at;
    while (e < w.size()) {
        char ch = ascii_lower(w[e]);
        bool sign = (ch == '+' || ch == '-') && e > at && ascii_lower(w[e - 1]) == 'e' &&
                    e >= at + 2 && w[e - 2] >= '0' && w[e - 2] <= '9';
        if (!(sign || ch == '.' || ch == '_' || (ch >= '0' && ch <= '9') ||
              (ch >= 'a' && ch <= 'z')))
            break;
        ++e;
    }
    return Token{TokenKind::word, static_cast<std::uint32_t>(t.begin + at),
                 static_cast<std::uint32_t>(t.begin + e)};
}

}  // namespace

bool is_output_function(std::string_view w) {
    static const std::array<std::string_view, 14> names = {
        "v", "vm", "vr", "vi", "vp", "vdb", "vg", "i", "im", "ir", "ii", "ip", "idb", "ig"};
    std::string s = to_lower(w);
    for (auto n : names)
        if (s == n) return true;
    return false;
}

std::optional<Unit> output_function_unit(std::string_view w) {
    std::string s = to_lower(w);
    if (s == "v" || s == "vm" || s == "vr" || s == "vi") return Unit::volt;
    if (s == "i" || s == "im" || s == "ir" || s == "ii") return Unit::ampere;
    if (s == "vdb" || s == "vp" || s == "idb" || s == "ip") return Unit::none;
    return std::nullopt;
}

std::optional<Token> literal_in(const Card& c, std::size_t from, std::size_t to) {
    const auto& f = c.fields;
    for (std::size_t i = from; i < to && i < f.size(); ++i) {
        if (f[i].kind == TokenKind::word && i + 1 < f.size() &&
            f[i + 1].kind == TokenKind::lparen && is_output_function(c.text(f[i]))) {
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

void refuse_literal(ScalePass& p, const Card& c, std::size_t from, std::string_view why) {
    if (auto t = literal_in(c, from, c.fields.size()))
        p.unscalable(*t,
                     fmt::format("'{}' in '{}': {}", c.text(*t), to_lower(c.field_text(0)), why));
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

// A word that ngspice replaces before the command reads it ($var, $&vec, `cmd`).
const Token* substituted_word(const Card& c) {
    for (const auto& t : c.fields)
        if (t.kind == TokenKind::word && c.text(t).find_first_of("$`") != std::string_view::npos)
            return &t;
    return nullptr;
}

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
                                    "block computed it",
                                    c.text(v)));
        return true;
    }
    return false;
}

// The dot card each analysis or measurement command is read as (ngspice-39.3
// src/frontend/spiceif.c:241 flattens analysis commands into the dot card).
std::string_view dot_twin(std::string_view cmd) {
    struct Twin {
        std::string_view cmd, dot;
    };
    static constexpr Twin twins[] = {
        {"ac", ".ac"},          {"dc", ".dc"},           {"tran", ".tran"},   {"noise", ".noise"},
        {"sp", ".sp"},          {"pss", ".pss"},         {"disto", ".disto"}, {"sens", ".sens"},
        {"four", ".four"},      {"fourier", ".four"},    {"meas", ".meas"},   {"measure", ".meas"},
        {"option", ".options"}, {"options", ".options"}, {"opt", ".options"},
    };
    for (const auto& t : twins)
        if (t.cmd == cmd) return t.dot;
    return {};
}

bool passes(std::string_view cmd) {
    // Commands that carry no unit-bearing number (notes A.2): counts, names, text.
    static constexpr std::string_view names[] = {
        "op",         "tf",        "pz",       "run",     "resume",  "destroy",   "setplot",
        "display",    "echo",      "quit",     "exit",    "save",    "trace",     "iplot",
        "show",       "showmod",   "setscale", "settype", "deftype", "unlet",     "transpose",
        "remzerovec", "rusage",    "status",   "delete",  "listing", "inventory", "setseed",
        "mc_source",  "codemodel", "reset",    "reshape", "repeat",  "step",      "fft",
        "psd",        "linearize", "cutout",   "print",   "write",   "wrs2p",     "wrnodev",
        "eprint",     "end",       "else",     "label",   "goto",    "break",     "continue",
        "unset",      "shell",     "version",  "help",    "cd",      "rehash",    "edit",
        "unalias",    "history",   "strcmp",   "bug",     "where",   "snsave"};
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
                                         "its words: that value's unit is not known here",
                                         c.text(*s), cmd));
            return;
        }
        if (dot == ".meas" && refuse_vector_values(p, c)) return;
        if (cmd == "dc") {
            p.block_dc_seen = true;
            p.block_dc_unit = c.fields.size() > 1 ? swept_unit(c.field_text(1)) : std::nullopt;
        }
        scale_dot_card(p, std::string(dot));
        if (cmd == "tran")
            st.scale = Unit::second;
        else if (cmd == "ac" || cmd == "noise" || cmd == "sp" || cmd == "disto")
            st.scale = Unit::hertz;
        else if (cmd == "dc")
            st.scale = p.block_dc_unit;
        if (cmd == "tran" || cmd == "ac" || cmd == "noise" || cmd == "sp" || cmd == "disto" ||
            cmd == "dc")
            st.scale_known = true;
        return;
    }
    if (cmd == "set" || cmd == "setcs") return scale_set(p, c);
    if (cmd == "let") return scale_let(p, c, st);
    if (cmd == "define") return refuse_literal(p, c, 1, kUseTells);
    if (cmd == "alter") return scale_alter(p, c, st);
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
    if (cmd == "optran") {
        // optran noopiter gminsteps srcsteps tstep tstop supramp (manual 15.3.5): times last.
        for (std::size_t i = 4; i < 7 && i < c.fields.size(); ++i)
            if (is_number_word(c, c.fields[i])) p.scale_value(c.fields[i], Unit::second, "optran");
        return;
    }
    if (cmd == "source" || cmd == "alias" || cmd == "load" || cmd == "snload") {
        p.note(c.fields[0],
               fmt::format("'{}' brings in commands or data from elsewhere; they are not "
                           "rewritten",
                           cmd));
        return;
    }
    if (passes(cmd)) return;
    if (cmd == "if" || cmd == "while" || cmd == "dowhile") return scale_expression(p, c, st);
    if (cmd == "foreach") {
        // foreach var v1 v2 ... (manual 17.6.4): the values take the unit of the one use
        // the block makes of $var, as the value of `alter` (BlockState::foreach_units).
        auto it = c.fields.size() > 1 ? st.foreach_units.find(to_lower(c.field_text(1)))
                                      : st.foreach_units.end();
        if (it == st.foreach_units.end()) return refuse_literal(p, c, 2, kUseTells);
        for (std::size_t i = 2; i < c.fields.size(); ++i) {
            if (is_number_word(c, c.fields[i]))
                p.scale_value(c.fields[i], it->second, "foreach value");
            else
                p.unscalable(c.fields[i], fmt::format("'{}' in 'foreach': not a number",
                                                      c.field_text(i)));
        }
        return;
    }
    if (cmd == "compose") return refuse_literal(p, c, 1, kUseTells);
    // alterparam: a parameter a .control block names is never scaled at its definition
    // (scale/param_plan); every use of it is written {(p)*k}, so its new value stays as
    // written (notes A.2, checked there with ngspice).
    if (cmd == "alterparam") return;
    refuse_literal(p, c, 1, "a number in a command whose arguments deckscale does not know");
}

}  // namespace

std::optional<bool> ScalePass::several_control_blocks() {
    if (observing_ || !deck_) return std::nullopt;
    if (!several_blocks_) {
        std::size_t n = 0;
        for (std::size_t f = 0; f < deck_->files.size() && n < 2; ++f)
            deck_->visit_file(f, [&](const Card& c) { n += c.kind == CardKind::control; });
        several_blocks_ = n > 1;
    }
    return several_blocks_;
}

void scale_control_block(ScalePass& p) {
    const Card& block = p.card();
    const Token* t = control_token(block);
    if (!t) return;
    // A `tran` command or an abstol/chgtol setting anywhere in the block (scale/tran_tolerances).
    note_control_tolerances(p, block.text(*t));
    BlockState st;
    p.block_dc_seen = false;
    p.block_dc_unit.reset();
    std::vector<ControlCommand> commands = control_commands(*block.file, *t);
    std::vector<Card> cards;
    cards.reserve(commands.size());
    for (const auto& cmd : commands) cards.push_back(cmd.as_card(*block.file));
    st.foreach_units = foreach_units(cards);
    std::optional<bool> several = p.several_control_blocks();
    ControlUnits units = control_expression_units(cards, several.value_or(false));
    // While reading, other blocks may follow: numbers kept for variables nothing in this
    // block tells the unit of are decided by the pass over the complete deck.
    if (units.free_variables && !several) p.rescan_when_complete();
    st.expressions = std::move(units.by_command);
    for (std::size_t i = 0; i < commands.size(); ++i) {
        st.index = i;
        p.with_command(cards[i], commands[i].line_begin, [&] { scale_command(p, cards[i], st); });
    }
    p.block_dc_seen = false;
    p.block_dc_unit.reset();
}

}  // namespace deckscale
