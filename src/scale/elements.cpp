// Card handlers for R, C, L, K, controlled sources (E F G H B), lines and switches.
#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/numparam_names.hpp"
#include "scale/pass.hpp"
#include "scale/rules.hpp"

namespace deckscale {
namespace {

// Scales each key=value atom by the rule table of `scope`; unknown keys are unscalable.
void scale_keyed(ScalePass& p, const Atom& a, std::string_view scope) {
    std::string key = to_lower(p.card().text(*a.key));
    auto unit = find_rule(scope, key);
    if (!unit) {
        p.unscalable(*a.key, fmt::format("parameter '{}' is not in the rule table for this card, "
                                         "so its unit is unknown", p.text(*a.key)));
        return;
    }
    if (!a.value) p.fail(*a.key, fmt::format("parameter '{}' has no value", p.text(*a.key)));
    if (a.value->kind == TokenKind::squote || a.value->kind == TokenKind::brace) {
        p.scale_expression(a.value->begin, a.value->end, factor_of(*unit, p.factors()), key,
                           unit_name(*unit), exponents(*unit));
        return;
    }
    p.scale_value(*a.value, *unit, key);
}

// `R = (expr)`, `C=(…)`, `L = (…)`: a behavioural value in plain parentheses, blanks around
// '=' or not (ngspice 39 reads `R4 a b R = (time<12ms ? {r} : {2*r})` as a resistance that
// changes with time). Scaled as an expression; returns the index of the closing ')' field,
// or 0 when the key is not followed by '(' or the parentheses do not close.
std::size_t scale_parenthesised(ScalePass& p, const Atom& a, std::string_view scope) {
    const auto& fl = p.card().fields;
    std::size_t open = a.field + 2;
    if (a.value || open >= fl.size() || fl[a.field + 1].kind != TokenKind::equals ||
        fl[open].kind != TokenKind::lparen)
        return 0;
    int depth = 0;
    for (std::size_t i = open; i < fl.size(); ++i) {
        if (fl[i].kind == TokenKind::lparen) ++depth;
        if (fl[i].kind != TokenKind::rparen || --depth != 0) continue;
        std::string key = to_lower(p.text(*a.key));
        auto unit = find_rule(scope, key);
        if (!unit) return 0;
        p.scale_expression(fl[open].begin, fl[i].end, factor_of(*unit, p.factors()), key,
                           unit_name(*unit));
        return i;
    }
    return 0;
}

// Degree of the k-th coefficient (0-based) of an nd-dimensional SPICE POLY: the terms are
// ordered by total degree, and there are C(nd+d, d) terms of degree <= d.
int poly_degree(std::size_t k, int nd) {
    std::size_t count = 1;  // terms of degree <= d
    for (int d = 0;; ++d) {
        if (k < count) return d;
        // C(nd+d+1, d+1) = C(nd+d, d) * (nd+d+1)/(d+1)
        count = count * static_cast<std::size_t>(nd + d + 1) / static_cast<std::size_t>(d + 1);
    }
}

// The two classic suffix traps (ngspice 39 manual 2.1.4.3): 'M' is milli, not mega, and a
// capacitor's 'F' is femto, not farad. Both are read the SPICE way; a note says so.
void warn_suffix_trap(ScalePass& p, const Token& t, char letter) {
    const NumberParse& n = p.number_of(t);
    if (!n.number || n.number->suffix.size() != 1) return;
    char sx = n.number->suffix[0];
    if (letter == 'r' && sx == 'M')
        p.note(t, fmt::format("'{}' is {:g} milliohm in SPICE ('M' is milli; mega is MEG); it is "
                              "scaled as such", p.text(t), n.number->value * 1e3));
    if (letter == 'c' && sx == 'F' && n.number->tail.empty())
        p.note(t, fmt::format("'{}' is {:g} femtofarad in SPICE ('F' is femto); it is scaled as such",
                              p.text(t), n.number->value * 1e15));
}

// The unit of the value of an R, C or L (looked up once per letter).
Unit passive_value_unit(char letter) {
    static const Unit r = *find_rule("r", "value"), c = *find_rule("c", "value"),
                      l = *find_rule("l", "value");
    return letter == 'r' ? r : letter == 'c' ? c : l;
}

}  // namespace

void scale_passive(ScalePass& p, char letter) {
    const Card& c = p.card();
    // The bulk of a large deck, "R1 n1 n2 1.5k": three plain words after the name and a
    // number last. The loop below does the same for it, step by step.
    if (letter != 'k' && c.fields.size() == 4 && c.fields[1].kind == TokenKind::word &&
        c.fields[2].kind == TokenKind::word && c.fields[3].kind == TokenKind::word &&
        p.is_number(c.fields[3])) {
        warn_suffix_trap(p, c.fields[3], letter);
        p.scale_value(c.fields[3], passive_value_unit(letter), "value");
        return;
    }
    std::string scope(1, letter);
    const auto& atoms = p.atoms(1);
    if (letter == 'k') {
        // K name L1 L2 k: the coupling is a ratio; both inductors scale alike.
        for (std::size_t i = 0; i < 2 && i < atoms.size(); ++i) {
            if (atoms[i].key) continue;
            std::string l = to_lower(p.text(*atoms[i].value));
            if (!p.is_inductor(l))
                p.unscalable(*atoms[i].value,
                             fmt::format("'{}' couples '{}', which is not an inductor of this deck",
                                         c.field_text(0), p.text(*atoms[i].value)));
        }
        if (atoms.size() > 3 && !atoms[2].key && p.is_inductor(to_lower(p.text(*atoms[2].value))))
            p.fail(*atoms[2].value,
                   fmt::format("an ngspice 39 K card couples two inductors, and '{}' is a third "
                               "(a form other simulators read): write one K card per pair",
                               p.text(*atoms[2].value)));
        if (atoms.size() > 2 && !atoms[2].key) p.scale_value(*atoms[2].value, Unit::none, "value");
        return;
    }
    // Two nodes, then the value (or a model name), then key=value parameters.
    std::size_t positional = 0;
    bool has_value = false;
    std::size_t inside_until = 0;  // fields of a parenthesised value, already scaled
    for (const auto& a : atoms) {
        if (a.field <= inside_until) continue;
        if (a.key) {
            std::string key = to_lower(p.text(*a.key));
            bool value_key = key == scope || key == "r" || key == "c" || key == "l" ||
                             key == "resistance" || key == "capacitance" || key == "inductance" ||
                             (scope == "c" && key == "cap");
            if (value_key) has_value = true;
            if (value_key && (inside_until = scale_parenthesised(p, a, scope)) != 0) continue;
            scale_keyed(p, a, scope);
            continue;
        }
        ++positional;
        if (positional <= 2) continue;  // nodes
        const Token& t = *a.value;
        const Unit value_unit = passive_value_unit(letter);
        if (!has_value && p.is_value_token(t)) {
            has_value = true;
            if (t.kind == TokenKind::squote || t.kind == TokenKind::brace) {
                check_numparam_names(p, t);
                p.scale_expression(t.begin, t.end, factor_of(value_unit, p.factors()), "value",
                                   unit_name(value_unit), exponents(value_unit));
            } else {
                warn_suffix_trap(p, t, letter);
                p.scale_value(t, value_unit, "value");
            }
        } else if (const std::string* model = p.model_type(to_lower(p.text(t)))) {
            // A model-based element: its model card is scaled (see scale_model).
            const std::string& type = *model;
            // ngspice 39 reads a C or L model name after the value as an unknown parameter and
            // stops (tried: `C1 out 0 1n cmod` and `C1 out 0 c=1n cmod` fail, `C1 out 0 cmod 1n`
            // works; R takes either order).
            if ((letter == 'c' || letter == 'l') && has_value)
                p.fail(t,
                       fmt::format("ngspice 39 reads the model name '{}' after the value of '{}' "
                                   "as an unknown parameter and stops; write the model name "
                                   "before the value",
                                   p.text(t), c.field_text(0)));
            if (letter == 'l' && type != "l")
                p.unscalable(t, fmt::format("inductor model '{}' of type '{}'", p.text(t), type));
        } else if (has_value && p.is_number(t)) {
            // ngspice takes a second bare number as the value ("R1 a b 1 5" = 5 Ohm).
            p.scale_value(t, value_unit, "value");
        } else if (t.kind == TokenKind::word && parse_spice_number(p.text(t)).problem !=
                                                    NumberProblem::not_a_number) {
            p.scale_value(t, value_unit, "value");  // fails with the reason
        } else {
            p.unscalable(t, fmt::format("'{}' is neither a value, a parameter nor a model of this "
                                        "deck", p.text(t)));
        }
    }
}

void scale_controlled(ScalePass& p, char letter) {
    const Card& c = p.card();
    ScaleFactors f = p.factors();
    if (letter == 'b') {
        // B n+ n- V=expr | I=expr [tc1=..]: substitute variables, then scale the output.
        const auto& fl = c.fields;
        std::size_t eq = 0;
        for (std::size_t i = 1; i + 1 < fl.size(); ++i)
            if (fl[i].kind == TokenKind::equals) {
                eq = i;
                break;
            }
        if (eq < 2) {
            p.unscalable(fl[0], "behavioural source without V= or I=");
            return;
        }
        std::string which = to_lower(c.field_text(eq - 1));
        double out = which == "i" ? 1 / f.km : 1;
        if (which != "v" && which != "i") {
            p.unscalable(fl[eq - 1], fmt::format("unknown behavioural source form '{}='", c.field_text(eq - 1)));
            return;
        }
        // The expression runs to the end of the card, or to a trailing tc1=/tc2=/temp=/dtemp=.
        std::size_t last = fl.size();
        int depth = 0;
        for (std::size_t i = eq + 1; i < fl.size(); ++i) {
            if (fl[i].kind == TokenKind::lparen) ++depth;
            if (fl[i].kind == TokenKind::rparen) --depth;
            if (depth == 0 && i + 1 < fl.size() && fl[i].kind == TokenKind::word &&
                fl[i + 1].kind == TokenKind::equals) {
                std::string k = to_lower(c.field_text(i));
                if (k == "tc1" || k == "tc2" || k == "temp" || k == "dtemp") {
                    last = i;
                    break;
                }
            }
        }
        if (last <= eq + 1) p.fail(fl[eq], "behavioural source without an expression");
        p.scale_expression(fl[eq + 1].begin, fl[last - 1].end, out, which, which == "i" ? "A" : "V");
        return;
    }
    const auto& atoms = p.atoms(1);
    // Output factor: E, H drive a voltage; F, G a current. Input: E, G sense a voltage.
    double out_factor = (letter == 'f' || letter == 'g') ? 1 / f.km : 1;
    bool current_in = letter == 'f' || letter == 'h';
    for (std::size_t i = 2; i < atoms.size(); ++i) {
        const Atom& a = atoms[i];
        std::string word = a.value ? to_lower(p.text(*a.value)) : "";
        if (a.key) {
            std::string key = to_lower(p.text(*a.key));
            if (key == "m" && (letter == 'f' || letter == 'g')) {
                if (a.value) p.scale_value(*a.value, Unit::none, "m");
                continue;
            }
            if ((key == "vol" && letter == 'e') || (key == "cur" && letter == 'g') || key == "value") {
                if (!a.value) p.fail(*a.key, "expression missing");
                // value= may be unquoted: take everything to the end of the card.
                const Token& first = *a.value;
                const Token& lastf = c.fields.back();
                p.scale_expression(first.begin, lastf.end, out_factor, key,
                                   letter == 'g' ? "A" : "V");
                return;
            }
            // The rest by the table: the linear gain keyed (ngspice 39 reads "G1 o 0 a 0
            // gain=1m"), the initial controlling voltage of E and G.
            if (find_rule(std::string(1, letter), key)) {
                scale_keyed(p, a, std::string(1, letter));
                continue;
            }
            p.unscalable(*a.key, fmt::format("parameter '{}' is not in the rule table", p.text(*a.key)));
            continue;
        }
        if (word == "poly") {
            if (i + 1 >= atoms.size() || !atoms[i + 1].value) p.fail(*a.value, "POLY without a dimension");
            auto nd_parse = parse_spice_number(p.text(*atoms[i + 1].value));
            if (!nd_parse.number) p.fail(*atoms[i + 1].value, "POLY dimension must be a number");
            // A whole number of controlling inputs; a huge or non-positive one (found by the
            // deck fuzz target) would overflow or never end the degree count.
            double nd_value = nd_parse.number->value;
            if (!(nd_value >= 1 && nd_value <= 1000) || nd_value != std::floor(nd_value))
                p.fail(*atoms[i + 1].value, "POLY dimension must be a whole number from 1 to 1000");
            int nd = static_cast<int>(nd_value);
            std::size_t inputs = current_in ? nd : 2 * nd;
            std::size_t k = 0;
            for (std::size_t j = i + 2 + inputs; j < atoms.size(); ++j, ++k) {
                if (atoms[j].key) {
                    p.unscalable(*atoms[j].key, "parameter after POLY coefficients");
                    continue;
                }
                // Coefficient of degree d maps inputs^d to the output:
                // factor = out_factor / in_factor^d, in_factor = 1/Km for current inputs.
                int d = poly_degree(k, nd);
                double in_factor = current_in ? 1 / f.km : 1;
                double factor = out_factor / std::pow(in_factor, d);
                // Km exponent: output (-1 for a current) minus d times the input's.
                int km_power = (letter == 'f' || letter == 'g' ? -1 : 0) + (current_in ? d : 0);
                p.scale_by(*atoms[j].value, factor, fmt::format("poly coefficient {}", k),
                           fmt::format("degree {}", d), UnitExponents{km_power, 0});
            }
            return;
        }
        if (word == "table" || word == "laplace" || word == "freq") {
            if ((letter == 'e' || letter == 'g') && word == "table") {
                // TABLE {expr} = (x1, y1) (x2, y2) ... (ngspice 39 manual 5.2.3, 5.3.3): the
                // controlling expression gets its variables substituted, so it reads as in the
                // original and the x values stay; the y values are the output, a voltage (E)
                // or a current (G: / Km).
                if (i + 1 < atoms.size() && atoms[i + 1].value &&
                    atoms[i + 1].value->kind == TokenKind::brace) {
                    p.scale_expression(atoms[i + 1].value->begin, atoms[i + 1].value->end, 1,
                                       "table input", "V");
                    if (letter == 'g') {
                        std::size_t k = 0;
                        for (std::size_t j = atoms[i + 1].field + 1; j < c.fields.size(); ++j) {
                            const Token& t = c.fields[j];
                            if (!p.is_value_token(t)) continue;
                            if (k++ % 2 == 1)
                                p.scale_by(t, out_factor, fmt::format("table y{}", k / 2), "A",
                                           UnitExponents{-1, 0});
                        }
                    }
                } else if (letter == 'g') {
                    p.unscalable(*a.value, "TABLE without a {expression} to read");
                }
                return;
            }
            p.unscalable(*a.value, fmt::format("{} form of a controlled source", p.text(*a.value)));
            return;
        }
        // Linear form: E/G n+ n- nc+ nc- gain; F/H n+ n- vname gain.
        std::size_t gain_index = current_in ? 3 : 4;
        if (i == gain_index) {
            std::string scope(1, letter);
            const Token& t = *a.value;
            if (t.kind == TokenKind::squote || t.kind == TokenKind::brace)
                p.scale_by(t, factor_of(*find_rule(scope, "value"), f), "gain",
                           unit_name(*find_rule(scope, "value")),
                           exponents(*find_rule(scope, "value")));
            else
                p.scale_value(t, *find_rule(scope, "value"), "gain");
        } else if (i > gain_index) {
            p.unscalable(*a.value, fmt::format("unexpected field '{}'", p.text(*a.value)));
        }
    }
}

void scale_line_or_switch(ScalePass& p, char letter) {
    const auto& atoms = p.atoms(1);
    std::string scope(1, letter);
    if (letter == 's' || letter == 'w') {
        // Instances carry nodes, a model name and ON/OFF; the model card holds the values.
        for (const auto& a : atoms)
            if (a.key) scale_keyed(p, a, scope);
        return;
    }
    for (std::size_t i = 0; i < atoms.size(); ++i) {
        const Atom& a = atoms[i];
        if (!a.key) continue;
        std::string key = to_lower(p.text(*a.key));
        if (key == "ic") {
            // T and O (LTRA): IC=v1,i1,v2,i2: voltages stay, currents scale.
            if (a.value) p.scale_value(*a.value, *find_rule(scope, "ic#1"), "ic v1");
            for (std::size_t j = 1; j < 4 && i + j < atoms.size() && !atoms[i + j].key; ++j)
                p.scale_value(*atoms[i + j].value, *find_rule(scope, fmt::format("ic#{}", j + 1)),
                              fmt::format("ic #{}", j + 1));
            continue;
        }
        scale_keyed(p, a, scope);
    }
}

}  // namespace deckscale
