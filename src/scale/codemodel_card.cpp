#include "scale/codemodel_card.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <optional>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/expression.hpp"
#include "scale/pass.hpp"

namespace deckscale {
namespace {

// The name=value pairs after ".model name type", each checked against the table.
std::vector<GivenParam> read_params(ScalePass& p, std::string_view type) {
    const Card& c = p.card();
    const auto& f = c.fields;
    std::vector<GivenParam> out;
    std::size_t i = 3;
    while (i < f.size()) {
        TokenKind k = f[i].kind;
        if (k == TokenKind::lparen || k == TokenKind::rparen || k == TokenKind::comma) {
            ++i;
            continue;
        }
        if (k != TokenKind::word || i + 1 >= f.size() || f[i + 1].kind != TokenKind::equals)
            p.fail(f[i], fmt::format("expected name=value on a '{}' model, found '{}'", type,
                                     c.field_text(i)));
        GivenParam g;
        g.key = &f[i];
        std::string name = to_lower(c.field_text(i));
        g.rule = find_code_model_param(type, name);
        if (!g.rule)
            p.fail(f[i], fmt::format("code model '{}' has no parameter '{}' (ngspice 39 would "
                                     "ignore it without a word)",
                                     type, c.field_text(i)));
        i += 2;
        if (i >= f.size() || f[i].kind == TokenKind::rparen)
            p.fail(*g.key, fmt::format("'{}=' has no value", c.text(*g.key)));
        std::string_view first = c.field_text(i);
        if (f[i].kind != TokenKind::word || first.empty() || first.front() != '[') {
            g.elements.push_back(f[i++]);
            out.push_back(std::move(g));
            continue;
        }
        bool closed = false;
        for (bool head = true; i < f.size() && !closed; ++i, head = false) {
            const Token& t = f[i];
            if (t.kind == TokenKind::comma) continue;
            if (t.kind == TokenKind::brace || t.kind == TokenKind::squote) {
                g.elements.push_back(t);
                continue;
            }
            if (t.kind != TokenKind::word) break;
            std::string_view s = c.text(t);
            std::uint32_t lead = head && s.front() == '[' ? 1 : 0;
            closed = s.size() > lead && s.back() == ']';
            Token e{TokenKind::word, t.begin + lead, t.end - (closed ? 1 : 0)};
            if (e.size() > 0) g.elements.push_back(e);
        }
        if (!closed)
            p.fail(*g.key, fmt::format("the vector of '{}' has no closing ']'", c.text(*g.key)));
        out.push_back(std::move(g));
    }
    return out;
}

std::optional<bool> boolean_of(std::string_view s) {
    std::string w = to_lower(s);
    if (w == "true" || w == "t" || w == "1" || w == "yes") return true;
    if (w == "false" || w == "f" || w == "0" || w == "no") return false;
    return std::nullopt;
}

std::string clamp_problem(const CodeModelParam& r, double value, double scaled, int digits) {
    if (r.floor && (value < r.floor || scaled < r.floor))
        return fmt::format(
            "{}={} would become {}, below the {} model's floor of {} (it clamps "
            "the value there)",
            r.name, format_plain(value, digits), format_plain(scaled, digits), r.type,
            format_plain(r.floor, digits));
    if (r.ceiling && (value > r.ceiling || scaled > r.ceiling))
        return fmt::format(
            "{}={} would become {}, above the {} model's ceiling of {} (it clamps "
            "the value there)",
            r.name, format_plain(value, digits), format_plain(scaled, digits), r.type,
            format_plain(r.ceiling, digits));
    if (r.keep_from && value < r.keep_from && scaled >= r.keep_from)
        return fmt::format("{}={} would become {}, which the {} model reads as 'no limit'", r.name,
                           format_plain(value, digits), format_plain(scaled, digits), r.type);
    return {};
}

// Elements of a parameter: as given, else one per element of the port it is tied to.
std::size_t elements_of(const CodeModelParam& r, const GivenParam* g,
                        const std::vector<PortSpec>& specs, const InstancePorts* ports) {
    if (g) return g->elements.size();
    std::string_view f = r.factor;
    std::size_t at = f.find("[]");
    if (at == std::string_view::npos) return 1;
    std::size_t start = f.find_last_of("*/", at);
    std::string_view port = f.substr(start == std::string_view::npos ? 0 : start + 1,
                                     at - (start == std::string_view::npos ? 0 : start + 1));
    return vector_elements(specs, ports, port);
}

// Where defaults are inserted: before a closing ')' if the parameters are in parentheses, else
// after the last field; `added` loses its first blank after '(' or a blank.
std::uint32_t insertion_point(const Card& c, std::string& added) {
    const Token* last = &c.fields.back();
    std::uint32_t at = last->kind == TokenKind::rparen ? last->begin : last->end;
    char before = at > 0 ? c.file->text()[at - 1] : '(';
    if (last->kind == TokenKind::rparen && (before == '(' || before == ' ' || before == '\t'))
        added = added.substr(1);
    if (c.fields.size() == 3) added = "(" + added.substr(1) + ")";  // ".model m gain"
    return at;
}

// What ScalePass::scale_by writes for a value multiplied by `factor`.
std::string scaled_text(ScalePass& p, const Token& t, double factor) {
    std::string s(p.card().text(t));
    if (t.kind == TokenKind::brace || t.kind == TokenKind::squote)
        return s.front() + ("(" + s.substr(1, s.size() - 2) + ")" + times_factor(factor)) +
               s.back();
    if (p.is_number(t)) {
        const auto& n = *p.number_of(t).number;
        return respell(n, n.value * factor, p.digits());
    }
    return "{(" + s + ")" + times_factor(factor) + "}";
}

}  // namespace

bool differs(double a, double b) {
    return std::fabs(a - b) > 1e-12 * std::max(std::fabs(a), std::fabs(b));
}

const GivenParam* ModelCard::given_of(std::string_view name) const {
    const GivenParam* last = nullptr;
    for (const auto& g : given)
        if (g.rule->name == name) last = &g;
    return last;
}

bool read_model_card(ScalePass& p, const CodeModelType& model, ModelCard& m) {
    m.model = &model;
    m.specs = port_specs(model);
    m.given = read_params(p, model.type);
    m.fraction = model.fraction;
    if (const GivenParam* g = m.given_of("fraction"); g && !g->elements.empty()) {
        auto b = boolean_of(p.card().text(g->elements.front()));
        if (!b) {
            p.unscalable(g->elements.front(),
                         "fraction is not a true/false literal: whether the "
                         "model's ranges are absolute is not known");
            return false;
        }
        m.fraction = *b;
    }
    return true;
}

CardPlan plan_card(ScalePass& p, const ModelCard& m, const InstancePorts* ports) {
    CardPlan plan;
    ScaleFactors f = p.factors();
    for (const auto& g : m.given) {
        const CodeModelParam& r = *g.rule;
        if (r.factor == "1" || (r.when == "nofraction" && m.fraction)) continue;
        std::size_t n = g.elements.size();
        for (std::size_t k = 0; k < n; ++k) {
            const Token& e = g.elements[k];
            double factor = eval_factor(r.factor, m.specs, ports, f, k, n);
            if (e.kind == TokenKind::word && p.is_number(e)) {
                double v = p.number_of(e).number->value;
                if (r.keep_from && v >= r.keep_from) continue;
                std::string problem = clamp_problem(r, v, v * factor, p.digits());
                if (!problem.empty()) {
                    p.unscalable(e, problem);
                    continue;
                }
            }
            plan.values.push_back({e, factor, &r});
        }
    }
    // aswitch refuses a control span below 1e-12 ("delta less than 1e-12",
    // xtradev/aswitch/cfunc.mod): a current control makes the span Km times smaller.
    if (m.model->type == "aswitch") {
        auto value_of = [&](std::string_view name, double fallback) -> std::optional<double> {
            const GivenParam* g = m.given_of(name);
            if (!g) return fallback;
            if (g->elements.empty() || !p.is_number(g->elements.front())) return std::nullopt;
            return p.number_of(g->elements.front()).number->value;
        };
        auto on = value_of("cntl_on", 1), off = value_of("cntl_off", 0);
        double fc = eval_factor("cntl_in", m.specs, ports, f, 0, 1);
        if (on && off && std::fabs(*on - *off) >= 1e-12 && std::fabs(*on - *off) * fc < 1e-12)
            p.unscalable(p.card().fields[1],
                         fmt::format("cntl_on - cntl_off would become {}, below the 1e-12 the "
                                     "aswitch model accepts",
                                     format_plain(std::fabs(*on - *off) * fc, p.digits())));
    }
    // Defaults that carry a unit are written out scaled (codemodel-rules.md pitfall 7).
    for (const auto& r : code_model_params()) {
        if (r.type != m.model->type || r.fallback.empty() || m.given_of(r.name)) continue;
        if (r.when == "nofraction" && m.fraction) continue;
        if (r.when == "midpoint" && m.given_of("out_low") && m.given_of("out_high")) continue;
        if (r.when == "mode2") {
            const GivenParam* mode = m.given_of("mode");
            if (!mode || mode->elements.empty() || p.card().text(mode->elements.front()) != "2")
                continue;
        }
        std::size_t n = elements_of(r, nullptr, m.specs, ports);
        double value = parse_spice_number(r.fallback).number->value;
        std::vector<std::string> texts;
        bool changed = false;
        double first = 1;
        for (std::size_t k = 0; k < n; ++k) {
            double factor = eval_factor(r.factor, m.specs, ports, f, k, n);
            if (differs(factor, 1)) {
                changed = true;
                first = factor;
            }
            std::string problem = clamp_problem(r, value, value * factor, p.digits());
            if (!problem.empty() && differs(factor, 1)) {
                p.unscalable(p.card().fields[1], "default " + problem);
                changed = false;
                break;
            }
            texts.push_back(format_plain(value * factor, p.digits()));
        }
        if (!changed) continue;
        if (plan.added.empty()) plan.first_factor = first;
        std::string joined = texts.front();
        for (std::size_t k = 1; k < texts.size(); ++k) joined += " " + texts[k];
        bool vector = r.factor.find("[]") != std::string_view::npos;
        plan.added += vector ? fmt::format(" {}=[{}]", r.name, joined)
                             : fmt::format(" {}={}", r.name, joined);
    }
    return plan;
}

void apply_plan(ScalePass& p, const CardPlan& plan) {
    for (const auto& v : plan.values) p.scale_by(v.at, v.factor, v.rule->name, v.rule->factor);
    if (plan.added.empty()) return;
    std::string added = plan.added;
    std::uint32_t at = insertion_point(p.card(), added);
    p.insert(at, added, "defaults written out", plan.first_factor);
}

std::string cloned_card(ScalePass& p, const CardPlan& plan, std::string_view name) {
    const Card& c = p.card();
    struct Piece {
        std::uint32_t begin, end;
        std::string text;
    };
    std::vector<Piece> pieces{{c.fields[1].begin, c.fields[1].end, std::string(name)}};
    for (const auto& v : plan.values)
        if (differs(v.factor, 1))
            pieces.push_back({v.at.begin, v.at.end, scaled_text(p, v.at, v.factor)});
    if (!plan.added.empty()) {
        std::string added = plan.added;
        std::uint32_t at = insertion_point(c, added);
        pieces.push_back({at, at, added});
    }
    std::stable_sort(pieces.begin(), pieces.end(),
                     [](const Piece& a, const Piece& b) { return a.begin < b.begin; });
    std::string out;
    std::uint32_t from = c.begin();
    for (const auto& piece : pieces) {
        out.append(c.file->view(from, piece.begin));
        out += piece.text;
        from = piece.end;
    }
    out.append(c.file->view(from, c.end()));
    return out;
}

bool same_factors(const CodeModelType& model, const std::vector<PortSpec>& specs,
                  const InstancePorts& a, const InstancePorts& b, ScaleFactors f) {
    std::size_t n = std::max(vector_elements(specs, &a), vector_elements(specs, &b));
    for (const auto& r : code_model_params()) {
        if (r.type != model.type || r.factor == "1") continue;
        for (std::size_t k = 0; k < n; ++k)
            if (differs(eval_factor(r.factor, specs, &a, f, k, n),
                        eval_factor(r.factor, specs, &b, f, k, n)))
                return false;
    }
    return true;
}

}  // namespace deckscale
