// Handlers of the .control commands that are not read as dot cards: set, let, alter,
// altermod, stop and the plot family (shared notes "control-and-sweeps.md" A.2-A.4).
#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <array>

#include "base/text_util.hpp"
#include "deck/control_script.hpp"
#include "scale/control.hpp"
#include "scale/rules.hpp"
#include "scale/semiconductors.hpp"

namespace deckscale {

// set name = value ...: options scale as .options (notes A.3); front-end variables holding
// counts pass; any other number is a user variable whose unit its uses tell (notes A.4).
void scale_set(ScalePass& p, const Card& c) {
    static const std::array<std::string_view, 12> counts = {
        "width",   "height",      "numdgt",          "nfreqs",      "polydegree",  "fourgridsize",
        "rndseed", "num_threads", "specwindoworder", "xbrushwidth", "ybrushwidth", "gridsize"};
    const auto& f = c.fields;
    std::string key;
    for (std::size_t i = 1; i < f.size(); ++i) {
        if (f[i].kind == TokenKind::word && i + 1 < f.size() &&
            f[i + 1].kind == TokenKind::equals) {
            key = to_lower(c.text(f[i]));
            ++i;
            continue;
        }
        if (f[i].kind != TokenKind::word || first_literal(c.text(f[i])) == std::string_view::npos)
            continue;
        if (auto u = find_rule(".options", key); u && is_number_word(c, f[i])) {
            p.scale_value(f[i], *u, key);
        } else if (std::find(counts.begin(), counts.end(), key) == counts.end()) {
            p.unscalable(f[i],
                         fmt::format("'{}' is a variable: the unit of its value is known only "
                                     "where ${} is used",
                                     key.empty() ? "?" : key, key));
            return;
        }
    }
}

// let lin-tstart = 1m and the other special vectors of linearize and cutout (manual 17.5.40,
// 17.5.14) are times; the numbers of any other expression take the units of what they meet
// (scale/control_units.hpp).
void scale_let(ScalePass& p, const Card& c, const BlockState& st) {
    const auto& f = c.fields;
    static const std::array<std::string_view, 5> times = {"lin-tstart", "lin-tstop", "lin-tstep",
                                                          "cut-tstart", "cut-tstop"};
    if (f.size() == 4 && f[2].kind == TokenKind::equals && is_number_word(c, f[3]) &&
        std::find(times.begin(), times.end(), to_lower(c.text(f[1]))) != times.end()) {
        p.scale_value(f[3], Unit::second, to_lower(c.text(f[1])));
        return;
    }
    scale_expression(p, c, st);
}

void scale_expression(ScalePass& p, const Card& c, const BlockState& st) {
    std::string cmd = to_lower(c.field_text(0));
    const std::vector<ExpressionLiteral>& literals =
        st.index < st.expressions.size() ? st.expressions[st.index]
                                         : std::vector<ExpressionLiteral>{};
    if (literals.empty()) {
        // Nothing read: any number beyond the assigned name stays refused.
        std::size_t from = cmd == "let" ? 2 : 1;
        return refuse_literal(p, c, from, kUseTells);
    }
    // A command is scaled whole or not at all.
    bool known = true;
    for (const auto& l : literals)
        if (!l.exponents) {
            known = false;
            p.unscalable(l.at, fmt::format("'{}' in '{}': {}", c.text(l.at), cmd, l.why));
        }
    if (!known) return;
    for (const auto& l : literals) {
        if (l.coefficient)
            p.note(l.at, fmt::format("'{}' in '{}' is kept as a pure number: it multiplies or "
                                     "divides a vector; if it stands for a part value (a "
                                     "resistance, a capacitance), rescale it by hand",
                                     c.text(l.at), cmd));
        UnitExponents e = *l.exponents;
        if (e.km == 0 && e.kf == 0) continue;
        std::optional<Unit> unit;
        for (Unit u : {Unit::ampere, Unit::ohm, Unit::second, Unit::hertz, Unit::farad,
                       Unit::henry})
            if (exponents(u).km == e.km && exponents(u).kf == e.kf) unit = u;
        if (unit)
            p.scale_value(l.at, *unit, cmd);
        else
            p.scale_by(l.at, factor_of(e, p.factors()), cmd, "-", e);
    }
}

// alter dev = v | alter dev par = v | alter @dev[par] = v | alter dev v (manual 17.5.3): the
// element rule table gives the unit.
AlterTarget alter_target(const Card& c) {
    AlterTarget t;
    const auto& f = c.fields;
    if (f.size() < 3) {
        t.why = "'alter' without a value";
        return t;
    }
    std::string dev = to_lower(c.text(f[1]));
    t.value = f.size() - 1;
    if (dev.size() > 1 && dev[0] == '@') {
        auto open = dev.find('['), close = dev.find(']');
        if (open != std::string::npos && close != std::string::npos && close > open) {
            t.param = dev.substr(open + 1, close - open - 1);
            dev = dev.substr(1, open - 1);
        }
    } else if (f.size() == 5 && f[3].kind == TokenKind::equals) {
        t.param = to_lower(c.text(f[2]));
    }
    bool simple = (f.size() == 4 && f[2].kind == TokenKind::equals) ||
                  (f.size() == 5 && !t.param.empty()) ||
                  (f.size() == 3 && f[2].kind == TokenKind::word);
    if (!simple || dev.empty()) {
        t.form_known = false;
        t.why = "a value list or expression in 'alter' is not rewritten";
        return t;
    }
    char letter = dev[0];
    if (t.param.empty()) t.param = letter == 'v' || letter == 'i' ? "dc" : "value";
    if (t.param == "resistance" || t.param == "capacitance" || t.param == "inductance")
        t.param = "value";
    t.unit = find_rule(std::string(1, letter), t.param);
    if (!t.unit) {
        t.why = fmt::format("'alter' of '{}' of '{}': that parameter is not in the rule table",
                            t.param, c.text(f[1]));
        return t;
    }
    if (*t.unit == Unit::signal) t.unit = letter == 'v' ? Unit::volt : Unit::ampere;
    return t;
}

void scale_alter(ScalePass& p, const Card& c, const BlockState& st) {
    const auto& f = c.fields;
    if (f.size() < 3) return;
    AlterTarget t = alter_target(c);
    if (!t.form_known) {
        refuse_literal(p, c, 1, t.why);
        return;
    }
    // A let variable as the value whose unit is not known (scale/control_units.hpp).
    if (st.index < st.expressions.size() && !st.expressions[st.index].empty()) {
        for (const auto& l : st.expressions[st.index])
            p.unscalable(l.at, fmt::format("'{}' in 'alter': {}", c.text(l.at), l.why));
        return;
    }
    const Token& v = f[t.value];
    if (first_literal(c.text(v)) == std::string_view::npos &&
        c.text(v).find('$') == std::string_view::npos)
        return;
    if (!t.unit) {
        p.unscalable(f[1], t.why);
        return;
    }
    // The variable of a foreach loop whose values were scaled for this use.
    std::string var = variable_named(c.text(v));
    if (!var.empty() && st.foreach_units.count(var)) return;
    if (!is_number_word(c, v)) {
        p.unscalable(v, fmt::format("'alter' value '{}' is not a number", c.text(v)));
        return;
    }
    p.scale_value(v, *t.unit, t.param);
}

std::string variable_named(std::string_view w) {
    if (w.size() < 2 || w[0] != '$') return "";
    std::string_view name = w.substr(1);
    if (name.size() >= 2 && name.front() == '{' && name.back() == '}')
        name = name.substr(1, name.size() - 2);
    if (name.empty()) return "";
    for (char ch : name)
        if (!(std::isalnum(static_cast<unsigned char>(ch)) || ch == '_')) return "";
    return to_lower(name);
}

std::map<std::string, Unit> foreach_units(const std::vector<Card>& commands) {
    std::map<std::string, Unit> out;
    for (const Card& loop : commands) {
        if (loop.fields.size() < 3 || !iequals(loop.field_text(0), "foreach")) continue;
        std::string var = to_lower(loop.field_text(1));
        std::optional<Unit> unit;
        bool fits = true, used = false;
        for (const Card& c : commands) {
            if (&c == &loop || !fits) continue;
            for (std::size_t i = 0; i < c.fields.size() && fits; ++i) {
                std::string_view w = c.text(c.fields[i]);
                auto at = w.find('$');
                if (at == std::string_view::npos) continue;
                // A use: `$var` or `${var}` anywhere in a word.
                std::string_view rest = w.substr(at + 1);
                if (!rest.empty() && rest.front() == '{') rest.remove_prefix(1);
                bool names_it = rest.size() >= var.size() &&
                                iequals(rest.substr(0, var.size()), var) &&
                                (rest.size() == var.size() ||
                                 !(std::isalnum(static_cast<unsigned char>(rest[var.size()])) ||
                                   rest[var.size()] == '_'));
                if (!names_it) continue;
                std::string cmd = to_lower(c.field_text(0));
                if (cmd == "echo") continue;
                AlterTarget t = cmd == "alter" ? alter_target(c) : AlterTarget{};
                if (!t.unit || t.value != i || variable_named(w) != var ||
                    (unit && *unit != *t.unit)) {
                    fits = false;
                    continue;
                }
                unit = t.unit;
                used = true;
            }
        }
        if (fits && used) out.emplace(var, *unit);
    }
    return out;
}

// altermod mod par = v | altermod @mod[par] = v (manual 17.5.4): the model rule table.
void scale_altermod(ScalePass& p, const Card& c) {
    const auto& f = c.fields;
    if (!literal_in(c, 1, f.size())) return;
    std::string mod = to_lower(c.text(f[1])), par;
    std::size_t value = 0;
    if (mod.size() > 1 && mod[0] == '@' && f.size() == 4 && f[2].kind == TokenKind::equals) {
        auto open = mod.find('['), close = mod.find(']');
        if (open != std::string::npos && close != std::string::npos && close > open)
            par = mod.substr(open + 1, close - open - 1);
        mod = mod.substr(1, open == std::string::npos ? std::string::npos : open - 1);
        value = 3;
    } else if (f.size() == 5 && f[3].kind == TokenKind::equals) {
        par = to_lower(c.text(f[2]));
        value = 4;
    }
    const std::string* type = p.model_type(mod);
    if (type && !par.empty() && is_semiconductor_model_type(*type)) {
        // As the .model card's rewrite scales that parameter (scale/semiconductors.hpp).
        std::string why;
        bool by_model = *type == "d" && p.diode_by_model();
        auto e = semiconductor_model_param(*type, par, p.factors(), by_model, why);
        if (!e || !is_number_word(c, f[value])) {
            refuse_literal(p, c, 1, e ? "the new value is not a plain number" : why);
            return;
        }
        if (e->km != 0 || e->kf != 0)
            p.scale_by(f[value], factor_of(*e, p.factors()), par, "-", *e);
        return;
    }
    std::optional<Unit> u;
    if (type && !par.empty())
        u = find_rule("model:" + (*type == "res" ? std::string("r") : *type), par);
    if (!u || !is_number_word(c, f[value])) {
        std::string why = "the new value is not a plain number";
        if (!type)
            why = fmt::format("no model '{}' is declared in this deck", mod);
        else if (!u)
            why =
                fmt::format("parameter '{}' of a '{}' model is not in the rule table", par, *type);
        refuse_literal(p, c, 1, why);
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
    if (w == "time")
        u = Unit::second;
    else if (w == "frequency")
        u = Unit::hertz;
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
    // Before any analysis of its own the block plots what 'run' made from the analysis cards.
    std::optional<Unit> x_unit = st.scale;
    bool x_known = st.scale_known && st.scale && !has_vs;
    bool x_asked = false;
    for (std::size_t i = first; i < f.size(); ++i) {
        std::string w = f[i].kind == TokenKind::word ? to_lower(c.text(f[i])) : "";
        std::size_t n = 0;
        bool x = true;
        if (w == "xl" || w == "xlimit")
            n = 2;
        else if (w == "xdel" || w == "xdelta")
            n = 1;
        else if (w == "yl" || w == "ylimit")
            n = 2, x = false;
        else if (w == "ydel" || w == "ydelta")
            n = 1, x = false;
        if (n > 0) {
            for (std::size_t k = 1; k <= n && i + k < f.size(); ++k) {
                const Token& v = f[i + k];
                if (!is_number_word(c, v)) continue;
                if (x && !st.scale_known && !has_vs && !x_asked) {
                    x_asked = true;
                    x_unit = p.card_plot_scale();
                    x_known = x_unit.has_value();
                }
                if (x ? x_known : y_known)
                    p.scale_value(v, x ? *x_unit : *y, w);
                else
                    p.unscalable(v, fmt::format("'{}' of '{}': the unit of that axis is not known "
                                                "here",
                                                w, to_lower(c.field_text(0))));
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

}  // namespace deckscale
