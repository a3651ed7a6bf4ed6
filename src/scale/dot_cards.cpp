// Card handlers for dot cards (analyses, options, initial conditions, measurements), model
// cards and .control blocks (ngspice 39 manual ch. 15; shared notes "scaling-rules.md" §3-§6).
#include <algorithm>
#include <cctype>
#include <cmath>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/control_script.hpp"
#include "deck/spice_number.hpp"
#include "scale/expression.hpp"
#include "scale/flicker.hpp"
#include "scale/numparam_names.hpp"
#include "scale/pass.hpp"
#include "scale/rules.hpp"
#include "scale/semiconductors.hpp"

namespace deckscale {
namespace {

// Words an analysis card takes among its values (ngspice 39 manual §15.3.10 `.tran … <uic>`;
// the `.pss` card ends in `<uic>` too): keywords, never parameter names.
bool analysis_keyword(std::string_view scope, std::string_view word) {
    return (scope == ".tran" || scope == ".pss") && iequals(word, "uic");
}

void scale_positional(ScalePass& p, const std::vector<Atom>& atoms, std::string_view scope,
                      std::size_t skip = 0) {
    std::size_t n = 0;
    for (std::size_t i = skip; i < atoms.size(); ++i) {
        if (atoms[i].key) continue;
        if (analysis_keyword(scope, p.text(*atoms[i].value))) continue;
        ++n;
        auto u = find_rule(scope, fmt::format("#{}", n));
        if (!u) continue;  // words such as 'uic' or output names
        if (!p.is_value_token(*atoms[i].value) && *u == Unit::none) continue;  // 'dec', 'lin'
        p.scale_value(*atoms[i].value, *u, fmt::format("#{}", n));
    }
}

// Sweep after a dec|oct|lin keyword: points, fstart, fstop [, extra].
void scale_sweep(ScalePass& p, const std::vector<Atom>& atoms, std::string_view scope) {
    for (std::size_t i = 0; i < atoms.size(); ++i) {
        if (atoms[i].key) continue;
        std::string w = to_lower(p.text(*atoms[i].value));
        if (w != "dec" && w != "oct" && w != "lin") continue;
        if (scope == ".noise" &&
            scale_sweep_exactly(p, SweepKind::noise, atoms, i, 4, Unit::hertz, {"fstart", "fstop"}))
            return;
        const char* names[] = {"points", "fstart", "fstop", "summary"};
        for (std::size_t k = 0; k < 4 && i + 1 + k < atoms.size(); ++k) {
            const Atom& a = atoms[i + 1 + k];
            if (a.key || !p.is_value_token(*a.value)) break;
            auto u = find_rule(scope, names[k]);
            if (u) p.scale_value(*a.value, *u, names[k]);
        }
        return;
    }
}

Unit dc_sweep_unit(ScalePass& p, const Token& src, bool& known) {
    std::string s = to_lower(p.text(src));
    known = true;
    if (s == "temp") return Unit::none;
    switch (s.empty() ? '\0' : s[0]) {
        case 'v': return Unit::volt;
        case 'i': return Unit::ampere;
        case 'r': return Unit::ohm;
        default: known = false; return Unit::none;
    }
}

// Unit of an output variable named by the word before '(' ("v", "vdb", "i", ...).
std::optional<Unit> output_unit(std::string_view w) {
    std::string s = to_lower(w);
    if (s == "v" || s == "vm" || s == "vr" || s == "vi") return Unit::volt;
    if (s == "i" || s == "im" || s == "ir" || s == "ii") return Unit::ampere;
    if (s == "vdb" || s == "vp" || s == "idb" || s == "ip") return Unit::none;
    return std::nullopt;
}

// AT= on the first or last point of the sweep a measurement reads: ngspice 39 finds a value
// only between two points it stepped through ("find(AT) : out of interval" otherwise, tried).
// The scaled sweep ends on the sum of its rewritten steps or on its rewritten stop, which the
// scaled AT= rounded to `digits` can overshoot by a rounding: `.meas tran v find v(a) at=1m`
// with `.tran 1u 1m` at Kf = 7 gave at=142.857143u past a last point of 142.857142857143u.
// Such a value is written 1e-10 of the sweep's span inside it, with 15 digits. Returns false
// for any other value (scaled as usual).
bool at_sweep_end(ScalePass& p, const Token& value, Unit unit, const std::string& analysis) {
    double factor = factor_of(unit, p.factors());
    if (factor == 1 || value.kind != TokenKind::word) return false;
    auto n = parse_spice_number(p.card().text(value));
    if (!n.number) return false;
    auto bounds = p.sweep_bounds(analysis);
    if (!bounds || bounds->first == bounds->second) return false;
    auto [first, last] = *bounds;
    double v = n.number->value;
    double span = last - first;
    double inward;
    if (std::fabs(v - last) <= 1e-12 * std::fabs(span)) inward = -span;
    else if (std::fabs(v - first) <= 1e-12 * std::fabs(span)) inward = span;
    else return false;
    double scaled = (v + 1e-10 * inward) * factor;
    if (!std::isfinite(scaled) || scaled == 0) return false;  // refused as usual
    p.replace(value, respell(*n.number, scaled, std::max(15, p.digits())), "at", unit);
    return true;
}

// A number in `expr` written with a power of ten or a scale suffix ("1u", "1e6", "2meg"),
// as a unit conversion is ("trise/1u"); a number inside a name ("t2") is none.
bool has_dimensioned_number(std::string_view expr) {
    for (std::size_t from = 0; from < expr.size();) {
        std::size_t at = first_literal(expr.substr(from));
        if (at == std::string_view::npos) return false;
        std::size_t end = from + at;
        while (end < expr.size() && (std::isdigit(static_cast<unsigned char>(expr[end])) ||
                                     expr[end] == '.'))
            ++end;
        if (end < expr.size() && std::isalpha(static_cast<unsigned char>(expr[end]))) return true;
        from = end;
    }
    return false;
}

// PARAM= computes a result from other results (and parameters), which follow the factors
// themselves: 'tfall-trise' and 'vout/vin*100' stay right as written. A number with a unit or
// a power of ten in it ('trise/1u' in microseconds) would not follow: refused.
void meas_param(ScalePass& p, const Token& key, const Token& value) {
    std::string_view expr = p.card().text(value);
    if (has_dimensioned_number(expr)) {
        p.unscalable(value, "a .meas param= expression with a number written with a unit or a "
                            "power of ten (a unit conversion, which does not follow the factors)");
        return;
    }
    p.note(key, "a .meas param= expression is kept as written: it is computed from other "
                "measurements and parameters, which follow the factors");
}

void scale_meas(ScalePass& p) {
    const Card& c = p.card();
    const auto& fl = c.fields;
    if (fl.size() < 2) return;
    std::string analysis = to_lower(c.field_text(1));
    std::string scope = ".meas:" + analysis;
    std::optional<Unit> last_output;  // unit of the most recent v(...)/i(...)
    for (std::size_t i = 2; i < fl.size(); ++i) {
        if (fl[i].kind == TokenKind::word && i + 1 < fl.size() && fl[i + 1].kind == TokenKind::lparen) {
            if (auto u = output_unit(c.field_text(i))) last_output = u;
            continue;
        }
        if (fl[i].kind != TokenKind::equals || i + 1 >= fl.size()) continue;
        const Token& value = fl[i + 1];
        const Token& before = fl[i - 1];
        if (before.kind == TokenKind::rparen) {
            // when v(x)=value: the value has the unit of the output variable.
            if (p.is_value_token(value) && last_output) p.scale_value(value, *last_output, "when");
            continue;
        }
        if (before.kind != TokenKind::word) continue;
        std::string key = to_lower(c.text(before));
        if (key == "param") {
            meas_param(p, before, value);
            continue;
        }
        if (key == "val") {
            if (last_output && p.is_value_token(value)) p.scale_value(value, *last_output, "val");
            else if (p.is_value_token(value))
                p.unscalable(value, "VAL= of a measurement whose quantity is not v() or i()");
            continue;
        }
        auto u = find_rule(scope, key);
        if (!u) u = find_rule(".meas", key);
        bool sweep_key = key == "at" || key == "from" || key == "to" || key == "td";
        if (!u && analysis == "dc" && sweep_key) {
            // On a DC sweep these take the swept quantity's unit (scale/control.cpp).
            u = p.dc_swept_unit(before, key);
            if (!u) continue;
        }
        if (u && key == "at" && at_sweep_end(p, value, *u, analysis)) {
            // written inside the scaled sweep
        } else if (u) {
            if (p.is_value_token(value)) p.scale_value(value, *u, key);
        } else if (key == "at" || key == "from" || key == "to" || key == "td") {
            p.unscalable(before, fmt::format("{}= in a .meas {} (sweep units are not known)", key, analysis));
        }
    }
}

}  // namespace

void scale_dot_card(ScalePass& p, const std::string& kw) {
    const Card& c = p.card();
    const auto& atoms = p.atoms(1);
    note_tolerances(p, kw);
    // A .tran of plain-number times (tstep tstop [tstart [tmax]]) and words such as 'uic'.
    std::size_t times = 0;
    while (kw == ".tran" && times < std::min<std::size_t>(atoms.size(), 4) && !atoms[times].key &&
           p.is_number(*atoms[times].value))
        ++times;
    for (std::size_t i = times; i < atoms.size() && times >= 2; ++i)
        if (atoms[i].key || p.is_value_token(*atoms[i].value)) times = 0;
    if (kw == ".ac" &&
        scale_sweep_exactly(p, SweepKind::ac, atoms, 0, 4, Unit::hertz, {"#3", "#4"})) {
        // fstart and fstop written together
    } else if (kw == ".ac" || kw == ".disto" || kw == ".sp") {
        // Diodes go by their model card in a deck with .disto (ScalePass::diode_by_model).
        if (kw == ".disto" && p.factors().km != 1) p.rescan_when_complete();
        scale_positional(p, atoms, kw);
    } else if (kw == ".tran" && times >= 2 &&
               scale_sweep_exactly(p, SweepKind::tran, atoms, 0, times, Unit::second,
                                   {"#1", "#2", "#3", "#4"})) {
        // the times written together
    } else if (kw == ".tran") {
        scale_positional(p, atoms, ".tran");
    } else if (kw == ".four") {
        if (!atoms.empty() && !atoms[0].key) p.scale_value(*atoms[0].value, Unit::hertz, "freq");
    } else if (kw == ".pss") {
        scale_positional(p, atoms, ".pss");
    } else if (kw == ".noise") {
        scale_sweep(p, atoms, ".noise");
    } else if (kw == ".sens") {
        scale_sweep(p, atoms, ".sens");
    } else if (kw == ".dc") {
        // .dc src start stop step [src2 start2 stop2 step2]. ngspice 39 reads '=' as a blank:
        // `x=2` is two more fields (tried: "named "x" is not in the circuit"), and a second
        // level without its step runs without end (tried): both refused.
        for (const auto& a : atoms)
            if (a.key)
                p.fail(*a.key, fmt::format("a .dc card takes 'source start stop step', once or "
                                           "twice; ngspice 39 reads '{}=' as more fields",
                                           p.text(*a.key)));
        if (atoms.size() % 4 != 0)
            p.fail(*atoms[atoms.size() / 4 * 4].value,
                   "a .dc card takes 'source start stop step', once or twice: this sweep has no "
                   "stop or step (ngspice 39 runs it without end)");
        for (std::size_t i = 0; i + 3 < atoms.size(); i += 4) {
            bool known = false;
            Unit u = dc_sweep_unit(p, *atoms[i].value, known);
            if (!known) {
                p.unscalable(*atoms[i].value, fmt::format("DC sweep of '{}': only V, I, R sources "
                                                          "and TEMP have a known unit", p.text(*atoms[i].value)));
                continue;
            }
            if (scale_sweep_exactly(p, SweepKind::dc, atoms, i + 1, 3, u,
                                    {"sweep 1", "sweep 2", "sweep 3"}))
                continue;
            for (std::size_t k = 1; k <= 3; ++k)
                p.scale_value(*atoms[i + k].value, u, fmt::format("sweep {}", k));
        }
    } else if (kw == ".meas" || kw == ".measure") {
        scale_meas(p);
    } else if (kw == ".options" || kw == ".option" || kw == ".opt") {
        for (const auto& a : atoms) {
            if (!a.key || !a.value) continue;
            std::string key = to_lower(p.text(*a.key));
            auto u = find_rule(".options", key);
            if (u) {
                if (p.is_value_token(*a.value)) p.scale_value(*a.value, *u, key);
            } else if (p.is_number(*a.value)) {
                p.note(*a.key, fmt::format("option '{}' is not in the rule table; its value is "
                                           "left unchanged", p.text(*a.key)));
            }
        }
    } else if (kw == ".ic" || kw == ".nodeset") {
        for (std::size_t i = 0; i + 1 < c.fields.size(); ++i)
            if (c.fields[i].kind == TokenKind::equals && p.is_value_token(c.fields[i + 1])) {
                // v(n)=value: voltages; an i(...) initial condition would be a current.
                bool current = false;
                for (std::size_t j = i; j-- > 1;)
                    if (c.fields[j].kind == TokenKind::word) {
                        current = istarts_with(c.field_text(j), "i") && c.field_text(j).size() == 1;
                        break;
                    }
                p.scale_value(c.fields[i + 1], current ? Unit::ampere : Unit::volt, "value");
            }
    } else if (kw == ".param") {
        for (std::size_t i = 2; i < c.fields.size(); ++i)
            if (c.fields[i - 1].kind == TokenKind::equals) check_numparam_names(p, c.fields[i]);
    } else if (kw == ".optran") {
        // .optran noopiter gminsteps srcsteps tstep tstop supramp (manual 15.3.5): three
        // switches, then three times.
        for (std::size_t i = 4; i < 7 && i < c.fields.size(); ++i)
            if (p.is_value_token(c.fields[i])) p.scale_value(c.fields[i], Unit::second, "optran");
    } else if (kw == ".temp") {
        for (const auto& a : atoms)
            if (!a.key) p.scale_value(*a.value, Unit::none, "value");
    }
    // Everything else (.param .func .subckt .ends .include .lib .global .save .print .op
    // .pz .tf .end ...) carries no unit-bearing literal of its own: parameter uses are
    // scaled where they are used.
}

void scale_model(ScalePass& p) {
    const Card& c = p.card();
    if (c.fields.size() < 3) return;
    std::string type = to_lower(c.field_text(2));
    if (type == "res") type = "r";
    std::string scope = "model:" + type;
    if (is_semiconductor_model_type(type)) {
        scale_semiconductor_model(p, type);
        return;
    }
    bool any_rule = false;
    for (const auto& r : rule_table())
        if (r.scope == scope) {
            any_rule = true;
            break;
        }
    if (!any_rule) {
        p.unscalable(c.fields[2], fmt::format("model type '{}' has no scaling rules (XSPICE and "
                                              "other model-specific types are not known)", c.field_text(2)));
        return;
    }
    std::optional<double> flicker = flicker_rewrite(p);  // R models (scale/flicker)
    const auto& atoms = p.atoms(3);
    std::set<std::string> given;
    for (const auto& a : atoms) {
        if (!a.key) continue;  // flags
        std::string key = to_lower(p.text(*a.key));
        given.insert(key);
        auto u = find_rule(scope, key);
        if (!u) {
            p.unscalable(*a.key, fmt::format("model parameter '{}' of a '{}' model is not in the "
                                             "rule table", p.text(*a.key), type));
            continue;
        }
        if (!a.value) continue;
        if (flicker && key == "kf")
            p.scale_by(*a.value, *flicker, "kf (flicker noise follows)", "-");
        else if (a.value->kind == TokenKind::squote || a.value->kind == TokenKind::brace)
            p.scale_by(*a.value, factor_of(*u, p.factors()), key, unit_name(*u), exponents(*u));
        else
            p.scale_value(*a.value, *u, key);
    }
    // Defaults with units must be written out scaled (ngspice 39 manual 3.3.15-16: switch
    // RON defaults to 1 Ohm and ROFF to 1/GMIN; 6.3: URC FMAX 1G Hz, RPERL 1k Ohm/m,
    // CPERL 1e-15 F/m -- the URC defaults are from memory of that table).
    struct Default {
        const char* scope;
        const char* key;
        double value;
        Unit unit;
    };
    const Default defaults[] = {
        {"model:sw", "ron", 1, Unit::ohm},      {"model:sw", "roff", 1 / p.gmin(), Unit::ohm},
        {"model:csw", "ron", 1, Unit::ohm},     {"model:csw", "roff", 1 / p.gmin(), Unit::ohm},
        {"model:urc", "fmax", 1e9, Unit::hertz}, {"model:urc", "rperl", 1000, Unit::ohm},
        {"model:urc", "cperl", 1e-15, Unit::farad},
    };
    // Insert before a closing ')' if the parameters are in parentheses, else at the end.
    const Token* last = &c.fields.back();
    std::uint32_t at = last->kind == TokenKind::rparen ? last->begin : last->end;
    std::string added;
    double first_factor = 1;
    for (const auto& d : defaults) {
        if (scope != d.scope || given.count(d.key)) continue;
        double k = factor_of(d.unit, p.factors());
        if (k == 1) continue;
        added += fmt::format(" {}={}", d.key, format_plain(d.value * k, p.digits()));
        first_factor = k;
    }
    if (!added.empty()) {
        if (last->kind == TokenKind::rparen) {
            // "sw(vt=1)" -> "sw(vt=1 ron=.. roff=..)": keep the blank unless one is there.
            char before = at > 0 ? c.file->text()[at - 1] : '(';
            if (before == '(' || before == ' ' || before == '\t') added = added.substr(1);
        }
        p.insert(at, added, "defaults written out", first_factor);
    }
}

}  // namespace deckscale
