#include "scale/control_units.hpp"

#include <fmt/format.h>

#include <array>
#include <cctype>
#include <map>
#include <optional>
#include <string_view>
#include <unordered_set>

#include "base/text_util.hpp"
#include "scale/control.hpp"
#include "scale/control_expression.hpp"
#include "scale/unit_slots.hpp"

namespace deckscale {
namespace {

// The variable a let command assigns (lower case, without an index), or "".
std::string let_target(const Card& c, std::size_t& equals) {
    const auto& f = c.fields;
    equals = 0;
    for (std::size_t i = 1; i < f.size(); ++i)
        if (f[i].kind == TokenKind::equals) {
            equals = i;
            break;
        }
    if (equals != 2 || f[1].kind != TokenKind::word) return "";
    std::string name = to_lower(c.field_text(1));
    return name.substr(0, name.find('['));
}

bool special_let(const std::string& name) {
    return name == "lin-tstart" || name == "lin-tstop" || name == "lin-tstep" ||
           name == "cut-tstart" || name == "cut-tstop";
}

// The span of fields [from, end) as one text, or nothing when trivia other than blanks
// (a comment or a continuation mark) lies within or a field is not a plain word or sign.
std::optional<Token> expression_span(const Card& c, std::size_t from) {
    const auto& f = c.fields;
    if (from >= f.size()) return std::nullopt;
    Token span{TokenKind::word, f[from].begin, f.back().end};
    for (const auto& t : c.tokens) {
        if (t.begin < span.begin || t.end > span.end) continue;
        if (t.kind == TokenKind::comment || t.kind == TokenKind::continuation ||
            t.kind == TokenKind::brace || t.kind == TokenKind::squote ||
            t.kind == TokenKind::dquote || t.kind == TokenKind::line_end)
            return std::nullopt;
    }
    return span;
}

// Variables a command other than let/if/while/dowhile/echo/print reads through $name.
void taint_substituted(const Card& c, const std::string& cmd, UnitSlots& slots,
                       const std::map<std::string, int>& vars) {
    if (cmd == "echo" || cmd == "print") return;
    for (const auto& t : c.fields) {
        std::string_view w = c.text(t);
        for (std::size_t at = w.find('$'); at != std::string_view::npos; at = w.find('$', at + 1)) {
            std::size_t b = at + 1;
            if (b < w.size() && (w[b] == '&' || w[b] == '{')) ++b;
            std::size_t e = b;
            while (e < w.size() && (std::isalnum(static_cast<unsigned char>(w[e])) || w[e] == '_'))
                ++e;
            auto it = vars.find(to_lower(w.substr(b, e - b)));
            if (it != vars.end())
                slots.fail(it->second,
                           fmt::format("its variable '{}' is read by '{}' through '$', whose "
                                       "reading of it is not followed",
                                       it->first, cmd));
        }
    }
}

// Commands that read a vector by its name only to show, write or transform it: a let
// variable named there is no use of its unit.
bool shows_only(const std::string& cmd) {
    static constexpr std::array<std::string_view, 20> names = {
        "print", "echo",    "plot",    "asciiplot", "gnuplot", "hardcopy", "wrdata",
        "write", "wrs2p",   "display", "destroy",   "unlet",   "setplot",  "linearize",
        "fft",   "psd",     "settype", "meas",      "measure", "save"};
    for (auto n : names)
        if (n == cmd) return true;
    return false;
}

// A let variable named by another command: `alter dev = var` gives it the unit of what it
// sets (an ngspice alter value may be a vector: manual 17.5.3; returned, so that a variable
// whose unit ends not known refuses the alter); any other command but those that only show a
// vector reads it in a way not followed here.
std::optional<std::pair<Token, int>> read_by_name(const Card& c, const std::string& cmd,
                                                  UnitSlots& slots,
                                                  const std::map<std::string, int>& vars) {
    std::optional<std::pair<Token, int>> altered;
    if (shows_only(cmd)) return altered;
    std::optional<std::size_t> alter_value;
    std::optional<UnitExponents> alter_unit;
    if (cmd == "alter") {
        AlterTarget t = alter_target(c);
        if (t.form_known && t.unit) {
            alter_value = t.value;
            alter_unit = exponents(*t.unit);
        }
    }
    for (std::size_t i = 1; i < c.fields.size(); ++i) {
        if (c.fields[i].kind != TokenKind::word) continue;
        auto it = vars.find(to_lower(c.field_text(i)));
        if (it == vars.end()) continue;
        if (alter_value && i == *alter_value) {
            slots.bind(it->second, *alter_unit);
            altered = {c.fields[i], it->second};
        } else
            slots.fail(it->second, fmt::format("its variable '{}' is read by '{}', whose "
                                               "reading of it is not followed",
                                               it->first, cmd));
    }
    return altered;
}

}  // namespace

ControlUnits control_expression_units(const std::vector<Card>& commands, bool other_blocks) {
    UnitSlots slots;
    std::map<std::string, int> vars;
    for (const auto& c : commands) {
        if (c.fields.empty() || !iequals(c.field_text(0), "let")) continue;
        std::size_t equals = 0;
        std::string name = let_target(c, equals);
        if (!name.empty() && !special_let(name) && !vars.count(name))
            vars[name] = slots.make(true);
    }
    struct Pending {
        std::size_t command;
        Token at;
        int slot;
        bool readable;
        bool name = false;  // a variable's name (an alter value): listed only when not known
    };
    std::vector<Pending> pending;
    std::vector<std::pair<int, bool>> coefficients;
    std::vector<std::pair<int, UnitExponents>> assumed;
    for (std::size_t k = 0; k < commands.size(); ++k) {
        const Card& c = commands[k];
        if (c.fields.empty()) continue;
        std::string cmd = to_lower(c.field_text(0));
        std::size_t from = 0;
        std::string target;
        if (cmd == "let") {
            std::size_t equals = 0;
            target = let_target(c, equals);
            if (special_let(target) || equals == 0) continue;
            from = equals + 1;
        } else if (cmd == "if" || cmd == "while" || cmd == "dowhile") {
            from = 1;
        } else {
            taint_substituted(c, cmd, slots, vars);
            if (auto a = read_by_name(c, cmd, slots, vars))
                pending.push_back({k, a->first, a->second, true, true});
            continue;
        }
        std::optional<Token> span = expression_span(c, from);
        if (!span) {
            // Numbers anywhere in the command stay not known.
            if (auto t = literal_in(c, from, c.fields.size()))
                pending.push_back({k, *t, -1, false});
            continue;
        }
        ExpressionRead read = read_expression(c.text(*span), span->begin, slots, vars);
        bool readable = read.readable;
        const UnitTerm& value = read.value;
        const auto& numbers = read.numbers;
        coefficients.insert(coefficients.end(), read.coefficients.begin(),
                            read.coefficients.end());
        assumed.insert(assumed.end(), read.assumed.begin(), read.assumed.end());
        if (readable && !target.empty()) {
            auto it = vars.find(target);
            int v = it == vars.end() ? -1 : it->second;
            if (v >= 0 && value.kind == UnitTerm::fixed) slots.bind(v, value.e);
            if (v >= 0 && value.kind == UnitTerm::slot) slots.unite(v, value.s);
            if (v >= 0 && value.kind == UnitTerm::opaque)
                slots.fail(v, fmt::format("its variable '{}' takes the value of '{}', whose "
                                          "unit is not known here",
                                          target, value.name));
        }
        if (readable && target.empty() && cmd == "let") readable = false;  // let x[..] forms
        for (const auto& [tok, s] : numbers) pending.push_back({k, tok, s, readable});
        if (!readable && numbers.empty())
            if (auto t = literal_in(c, from, c.fields.size()))
                pending.push_back({k, *t, -1, false});
    }
    slots.resolve_met();
    // A variable read as a quantity of one unit that ended with another (or with none known):
    // what was read from it may be wrong anywhere in the block.
    bool broken = false;
    for (const auto& [s, e] : assumed) {
        auto now = slots.bound(s);
        if (!now || !same_exponents(*now, e)) broken = true;
    }
    std::unordered_set<int> noted;  // roots of the slots kept as coefficients with a note
    for (const auto& [s, note] : coefficients)
        if (note) noted.insert(slots.find(s));
    ControlUnits units;
    auto& out = units.by_command;
    out.resize(commands.size());
    for (const auto& p : pending) {
        ExpressionLiteral l;
        l.at = p.at;
        if (!p.readable) {
            l.why = "the expression is not one whose units deckscale reads";
        } else if (slots.free_variable(p.slot)) {
            units.free_variables = true;
            if (other_blocks)
                l.why = "nothing in its .control block tells the unit of its variable, and "
                        "another .control block of the deck may read it (a variable's unit is "
                        "not followed across blocks)";
            else
                l.exponents = kPureNumber;
        } else {
            slots.resolve(p.slot, l);
            if (l.exponents && broken) {
                l.exponents.reset();
                l.why = "a variable of the block meets quantities of two units";
            }
        }
        if (p.name && l.exponents) continue;
        if (l.exponents && same_exponents(*l.exponents, kPureNumber) && p.slot >= 0)
            l.coefficient = noted.count(slots.find(p.slot)) > 0;
        out[p.command].push_back(std::move(l));
    }
    return units;
}

}  // namespace deckscale
