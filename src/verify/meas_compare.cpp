#include "verify/meas_compare.hpp"

#include <algorithm>
#include <cmath>
#include <cstdlib>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/control_script.hpp"

namespace deckscale {
namespace {

struct Output {
    int current_power = 0;
    std::string quantity;    // "voltage", "current", "phase", "dB"
    std::string not_judged;  // why a result of it is not judged
};

// The quantity of an output function of a .meas card (ngspice 39 manual §15.6.2).
Output output_of(const std::string& fn) {
    if (fn == "v" || fn == "vm" || fn == "vr" || fn == "vi") return {0, "voltage", ""};
    if (fn == "i" || fn == "im" || fn == "ir" || fn == "ii") return {1, "current", ""};
    if (fn == "vp" || fn == "ip") return {0, "phase", ""};
    if (fn == "vdb") return {0, "dB", ""};
    if (fn == "idb") return {0, "dB", "a current in dB moves by -20 log10(Km) dB"};
    return {0, fn, fmt::format("the unit of {}() is not known here", fn)};
}

const char* axis_quantity(const std::string& analysis) {
    if (analysis == "tran") return "time";
    if (analysis == "dc") return "sweep value";
    return "frequency";
}

MeasureSpec spec_of(const Card& c) {
    const auto& fl = c.fields;
    MeasureSpec m;
    m.analysis = to_lower(c.field_text(1));
    m.name = to_lower(c.field_text(2));
    std::string kind = fl.size() > 3 ? to_lower(c.field_text(3)) : "";
    // The first output function after the kind: FIND v(out) ..., AVG i(v1) ...
    std::optional<Output> out;
    for (std::size_t i = 4; i + 1 < fl.size(); ++i)
        if (fl[i].kind == TokenKind::word && fl[i + 1].kind == TokenKind::lparen) {
            out = output_of(to_lower(c.field_text(i)));
            break;
        }
    const std::string axis = axis_quantity(m.analysis);
    if (kind == "when" || kind == "trig" || kind == "targ" || kind == "min_at" ||
        kind == "max_at") {
        m.axis_power = 1;
        m.quantity = axis;
    } else if (kind == "find" || kind == "avg" || kind == "min" || kind == "max" ||
               kind == "pp" || kind == "rms") {
        if (!out) {
            m.not_judged = "no v() or i() to measure";
        } else {
            m.current_power = out->current_power;
            m.quantity = out->quantity;
            m.not_judged = out->not_judged;
        }
    } else if (kind == "integ" || kind == "integral" || kind == "deriv" || kind == "derivative") {
        bool integral = kind[0] == 'i';
        m.axis_power = integral ? 1 : -1;
        if (!out || (out->quantity != "voltage" && out->quantity != "current")) {
            m.not_judged = fmt::format("the {} of this output has no simple unit",
                                       integral ? "integral" : "derivative");
        } else {
            m.current_power = out->current_power;
            m.quantity = fmt::format("{} {} {}", out->quantity, integral ? "x" : "/", axis);
        }
    } else if (kind == "param" || kind == "expr") {
        m.not_judged = "an expression: its unit depends on the expression";
    } else {
        m.not_judged = fmt::format("a measurement of kind '{}'", kind);
    }
    return m;
}

// "x 1/Kf", "x 1/Km", "x 1/Kf 1/Km"; a DC sweep's axis by its swept item's factor.
std::string factor_text(const MeasureSpec& m, double axis_factor) {
    std::string axis = m.analysis == "tran" ? "1/Kf"
                       : m.analysis == "dc" ? fmt::format("{:.6g}", axis_factor)
                                            : "Kf";
    std::string s;
    auto add = [&](const std::string& f, int power) {
        if (power == 0) return;
        if (!s.empty()) s += " ";
        s += power == 1 ? f : power == -1 ? "/ " + f : fmt::format("{}^{}", f, power);
    };
    add(axis, m.axis_power);
    add("1/Km", m.current_power);
    return s.empty() ? "x 1" : "x " + s;
}

// A control command's text on one line: its comments left out, continuations joined.
std::string command_text(const Card& c) {
    std::string s;
    for (const Token& t : c.tokens) {
        if (t.kind == TokenKind::comment) continue;
        if (t.kind == TokenKind::continuation || t.kind == TokenKind::line_end) {
            s += ' ';
            continue;
        }
        s += c.text(t);
    }
    return std::string(trim(s));
}

// Lines around a failed measurement that say nothing of why.
bool is_measure_header(std::string_view line) {
    return line.starts_with("Measurements for") || line.starts_with("Error: measure ");
}

}  // namespace

std::vector<MeasureSpec> find_measures(const Deck& deck) {
    std::vector<MeasureSpec> out;
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind == CardKind::control) {
                if (const Token* t = control_token(c))
                    for (const auto& cmd : control_commands(*c.file, *t)) {
                        Card cc = cmd.as_card(*c.file);
                        if (cc.fields.size() < 3) continue;
                        std::string word = to_lower(cc.field_text(0));
                        if (word != "meas" && word != "measure") continue;
                        MeasureSpec m = spec_of(cc);
                        m.card = "." + command_text(cc);
                        // A control variable ($thr) has no value outside the block.
                        if (m.card.find('$') != std::string::npos) continue;
                        out.push_back(std::move(m));
                    }
                return;
            }
            if (c.kind != CardKind::dot || c.fields.size() < 3) return;
            std::string kw = card_keyword(c);
            if (kw == ".meas" || kw == ".measure") out.push_back(spec_of(c));
        });
    return out;
}

bool stops_on_measures(const Deck& deck) {
    bool stops = false;
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::dot) return;
            std::string kw = card_keyword(c);
            if (kw != ".options" && kw != ".option" && kw != ".opt") return;
            for (std::size_t i = 1; i < c.fields.size(); ++i)
                if (iequals(c.field_text(i), "autostop")) stops = true;
        });
    return stops;
}

std::optional<double> measure_result(const std::vector<std::string>& log, const std::string& name) {
    std::optional<double> found;
    for (const auto& raw : log) {
        std::string_view line = trim(raw);
        if (!istarts_with(line, name)) continue;
        line.remove_prefix(name.size());
        if (line.empty() || (line.front() != ' ' && line.front() != '=')) continue;
        line = trim(line);
        if (line.empty() || line.front() != '=') continue;
        std::string rest(trim(line.substr(1)));
        char* end = nullptr;
        double v = std::strtod(rest.c_str(), &end);
        if (end == rest.c_str()) {
            found.reset();  // "name = failed"
            continue;
        }
        found = v;
    }
    return found;
}

std::string measure_failure(const std::vector<std::string>& log, const std::string& name) {
    for (std::size_t i = 0; i < log.size(); ++i) {
        std::string lower = to_lower(trim(log[i]));
        if (!lower.starts_with(".meas") || lower.find(" " + name + " ") == std::string::npos ||
            !lower.ends_with("failed!"))
            continue;
        // ".meas tran t1 when v(out)=5 failed!", after the reason ("out of interval").
        for (std::size_t j = i; j-- > 0;) {
            std::string_view before = trim(log[j]);
            if (before.empty() || is_measure_header(before)) continue;
            if (istarts_with(before, ".meas")) break;  // another measurement's
            return std::string(before);
        }
        return "";
    }
    return "";
}

double measure_base_tolerance(const std::string& analysis, const Tolerances& t) {
    return analysis == "tran" ? t.transient : t.relative;
}

Comparison compare_measures(const std::vector<MeasureSpec>& specs, const std::string& analysis,
                            const SimOutcome& original, const SimOutcome& scaled, double km,
                            double axis_factor, double tolerance) {
    Comparison c;
    c.analysis = "meas";
    c.part = analysis;
    c.points = 1;
    const double tol = tolerance + kPrintedDigitsTolerance;
    for (const auto& m : specs) {
        if (m.analysis != analysis) continue;
        auto a = measure_result(original.log, m.name);
        auto b = measure_result(scaled.log, m.name);
        VectorResult r{m.name, VectorKind::other};
        r.quantity = m.not_judged.empty() ? fmt::format("{} ({})", m.quantity, factor_text(m, axis_factor))
                                          : m.quantity;
        r.original_value = a.value_or(NAN);
        r.scaled_value = b.value_or(NAN);
        if (!a && !b) {
            std::string why = measure_failure(original.log, m.name);
            c.notes.push_back(fmt::format("{}: no result in either run{}", m.name,
                                          why.empty() ? "" : " (ngspice: " + why + ")"));
            continue;
        }
        if (!a || !b) {
            const SimOutcome& failed = a ? scaled : original;
            std::string why = measure_failure(failed.log, m.name);
            c.problems.push_back(fmt::format("{}: a result in the {} run only{}", m.name,
                                             a ? "original" : "scaled",
                                             why.empty() ? "" : " (ngspice: " + why + ")"));
            continue;
        }
        if (!m.not_judged.empty()) {
            c.notes.push_back(fmt::format("{} = {:.7g} and {:.7g}{}: not judged, {}", m.name, *a,
                                          *b,
                                          *a != 0 ? fmt::format(" (scaled / original = {:.7g})",
                                                                *b / *a)
                                                  : "",
                                          m.not_judged));
            continue;
        }
        double expect = std::pow(axis_factor, m.axis_power) * std::pow(1 / km, m.current_power);
        double back = *b / expect;
        double scale = std::max(std::fabs(*a), std::fabs(back));
        r.peak = std::fabs(*a);
        r.worst = scale > 1e-300 ? std::fabs(back - *a) / scale : 0;
        if (!std::isfinite(*a) || !std::isfinite(*b)) r.worst = NAN;
        r.passed = r.worst <= tol;
        c.vectors.push_back(r);
    }
    sort_worst_first(c);
    return c;
}

}  // namespace deckscale
