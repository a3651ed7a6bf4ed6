// Card handlers for XSPICE code models: the A device (its port types and the cases that cannot
// be scaled exactly) and the .model card of a code-model type (values, vectors element by
// element, defaults that carry units, unknown parameter names).
#include "scale/codemodels.hpp"

#include <fmt/format.h>

#include <cmath>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/pass.hpp"

namespace deckscale {
namespace {

// One name=value of a code-model .model card: a scalar or the elements of a [ ] vector.
struct GivenParam {
    const Token* key = nullptr;
    const CodeModelParam* rule = nullptr;
    std::vector<Token> elements;
};

bool differs(double a, double b) {
    return std::fabs(a - b) > 1e-12 * std::max(std::fabs(a), std::fabs(b));
}

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

bool is_digital(std::string_view type) { return type == "d" || type == "real" || type == "int"; }

// The digital nodes an A device connects (models with unread ports are all digital).
std::vector<std::string> digital_nodes(const Card& c, const std::vector<PortSpec>& specs) {
    std::vector<std::string> out;
    auto items = connection_items(c);
    if (specs.empty()) {
        for (auto item : items) {
            if (item == "[" || item == "]" || item.front() == '%' || iequals(item, "null"))
                continue;
            if (item.front() == '~') item.remove_prefix(1);
            if (!item.empty()) out.push_back(to_lower(item));
        }
        return out;
    }
    InstancePorts ports;
    std::string why;
    std::vector<PortNode> nodes;
    if (!read_ports(items, specs, ports, why, &nodes)) return out;
    for (auto& n : nodes)
        if (is_digital(n.type)) {
            if (!n.node.empty() && n.node.front() == '~') n.node.erase(0, 1);
            out.push_back(std::move(n.node));
        }
    return out;
}

}  // namespace

std::shared_ptr<const CodeModelUses> collect_code_model_uses(const Deck& deck) {
    bool any = false;
    for (const auto& [name, type] : deck.symbols.models)
        if (find_code_model(type)) any = true;
    if (!any) return nullptr;
    auto uses = std::make_shared<CodeModelUses>();
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::element || c.fields.size() < 2) return;
            char letter = ascii_lower(c.field_text(0)[0]);
            if (letter != 'a' && letter != 'x') {  // subcircuit calls may pass digital nodes on
                for (std::size_t i = 1; i < c.fields.size(); ++i)
                    if (c.fields[i].kind == TokenKind::word)
                        uses->analog_nodes.insert(to_lower(c.field_text(i)));
                return;
            }
            if (letter != 'a') return;
            std::string model = to_lower(c.field_text(c.fields.size() - 1));
            auto it = deck.symbols.models.find(model);
            if (it == deck.symbols.models.end()) return;
            const CodeModelType* t = find_code_model(it->second);
            if (!t) return;
            CodeModelUse use{std::string(c.field_text(0)), {}};
            std::string why;
            std::vector<PortNode> nodes;
            if (!read_ports(connection_items(c), port_specs(*t), use.ports, why, &nodes)) return;
            for (const auto& n : nodes)
                if (!is_digital(n.type) && n.type != "vnam") uses->analog_nodes.insert(n.node);
            uses->by_model[model].push_back(std::move(use));
        });
    return uses;
}

bool is_code_model_card(const Card& c) {
    if (c.fields.empty()) return false;
    if (c.kind == CardKind::element) return ascii_lower(c.field_text(0)[0]) == 'a';
    if (c.kind != CardKind::dot || c.fields.size() < 3 || !iequals(c.field_text(0), ".model"))
        return false;
    return find_code_model(to_lower(c.field_text(2))) != nullptr;
}

void scale_code_model_instance(ScalePass& p) {
    const Card& c = p.card();
    if (c.fields.size() < 2) return;
    std::string model = to_lower(c.field_text(c.fields.size() - 1));
    const std::string* type = p.model_type(model);
    if (!type) {
        p.unscalable(c.fields[0], fmt::format("XSPICE A device whose model '{}' is not in the deck",
                                              c.field_text(c.fields.size() - 1)));
        return;
    }
    const CodeModelType* t = find_code_model(*type);
    if (!t) {
        p.unscalable(
            c.fields[0],
            fmt::format("XSPICE model type '{}' is not one of ngspice 39's code models: its "
                        "units are not known",
                        *type));
        return;
    }
    auto specs = port_specs(*t);
    InstancePorts ports;
    std::string why;
    if (!specs.empty() && !read_ports(connection_items(c), specs, ports, why)) {
        p.unscalable(c.fields[0], fmt::format("cannot read the connections of this '{}' device: {}",
                                              *type, why));
        return;
    }
    std::size_t n = vector_elements(specs, &ports);
    for (const auto& r : code_model_refusals()) {
        if (r.type != *type) continue;
        for (std::size_t k = 0; k < n; ++k)
            if (differs(eval_factor(r.factor, specs, &ports, p.factors(), k, n), 1)) {
                p.unscalable(c.fields[0], std::string(r.why));
                break;
            }
    }
    // ngspice joins a digital port to analog elements through a bridge of its own, with
    // 1 ns delays the deck does not show (manual §12.6, src/xspice/evt/evtcheck_nodes.c).
    if (const CodeModelUses* all = p.code_model_uses(); all && differs(p.factors().kf, 1))
        for (const auto& node : digital_nodes(c, specs))
            if (all->analog_nodes.count(node)) {
                p.unscalable(c.fields[0],
                             fmt::format("digital node '{}' also connects analog elements: ngspice "
                                         "bridges it with default 1 ns delays that are not in the "
                                         "deck; write the adc_bridge/dac_bridge out",
                                         node));
                break;
            }
    if (*type == "lcouple" && differs(p.factors().km * p.factors().kf, 1))
        p.note(c.fields[0],
               "the magnetic loop is scaled with num_turns x Km: its currents (the "
               "flux) scale by 1/(Km*Kf), and other elements inside that loop are "
               "not adjusted");
}

bool scale_code_model(ScalePass& p) {
    const Card& c = p.card();
    if (c.fields.size() < 3) return false;
    std::string type = to_lower(c.field_text(2));
    const CodeModelType* t = find_code_model(type);
    if (!t) return false;
    std::string model = to_lower(c.field_text(1));
    auto specs = port_specs(*t);
    std::vector<GivenParam> given = read_params(p, type);
    auto given_of = [&](std::string_view name) -> const GivenParam* {
        const GivenParam* last = nullptr;
        for (const auto& g : given)
            if (g.rule->name == name) last = &g;
        return last;
    };
    const std::vector<CodeModelUse>* uses = nullptr;
    if (const CodeModelUses* all = p.code_model_uses()) {
        auto it = all->by_model.find(model);
        if (it != all->by_model.end()) uses = &it->second;
    }
    const InstancePorts* ports = uses && !uses->empty() ? &uses->front().ports : nullptr;
    ScaleFactors f = p.factors();
    // One .model serves all its instances: their port types must give it the same factors.
    if (uses)
        for (const auto& use : *uses)
            for (const auto& r : code_model_params()) {
                if (r.type != type) continue;
                std::size_t n = std::max(elements_of(r, given_of(r.name), specs, ports),
                                         elements_of(r, given_of(r.name), specs, &use.ports));
                for (std::size_t k = 0; k < n; ++k)
                    if (differs(eval_factor(r.factor, specs, ports, f, k, n),
                                eval_factor(r.factor, specs, &use.ports, f, k, n))) {
                        p.unscalable(
                            c.fields[1],
                            fmt::format(
                                "model '{}' serves {} and {}, whose port types give '{}' different "
                                "factors: give each its own .model card",
                                c.field_text(1), uses->front().instance, use.instance, r.name));
                        return true;
                    }
            }
    bool fraction = t->fraction;
    if (const GivenParam* g = given_of("fraction"); g && !g->elements.empty()) {
        auto b = boolean_of(c.text(g->elements.front()));
        if (!b) {
            p.unscalable(g->elements.front(),
                         "fraction is not a true/false literal: whether the "
                         "model's ranges are absolute is not known");
            return true;
        }
        fraction = *b;
    }
    for (const auto& g : given) {
        const CodeModelParam& r = *g.rule;
        if (r.factor == "1" || (r.when == "nofraction" && fraction)) continue;
        std::size_t n = g.elements.size();
        for (std::size_t k = 0; k < n; ++k) {
            const Token& e = g.elements[k];
            double factor = eval_factor(r.factor, specs, ports, f, k, n);
            if (e.kind == TokenKind::word && p.is_number(e)) {
                double v = p.number_of(e).number->value;
                if (r.keep_from && v >= r.keep_from) continue;
                std::string problem = clamp_problem(r, v, v * factor, p.digits());
                if (!problem.empty()) {
                    p.unscalable(e, problem);
                    continue;
                }
            }
            p.scale_by(e, factor, r.name, r.factor);
        }
    }
    // Defaults that carry a unit are written out scaled (codemodel-rules.md pitfall 7).
    std::string added;
    double first_factor = 1;
    for (const auto& r : code_model_params()) {
        if (r.type != type || r.fallback.empty() || given_of(r.name)) continue;
        if (r.when == "nofraction" && fraction) continue;
        if (r.when == "midpoint" && given_of("out_low") && given_of("out_high")) continue;
        if (r.when == "mode2") {
            const GivenParam* mode = given_of("mode");
            if (!mode || mode->elements.empty() || p.text(mode->elements.front()) != "2") continue;
        }
        std::size_t n = elements_of(r, nullptr, specs, ports);
        double value = parse_spice_number(r.fallback).number->value;
        std::vector<std::string> texts;
        bool changed = false;
        for (std::size_t k = 0; k < n; ++k) {
            double factor = eval_factor(r.factor, specs, ports, f, k, n);
            if (differs(factor, 1)) {
                changed = true;
                first_factor = factor;
            }
            std::string problem = clamp_problem(r, value, value * factor, p.digits());
            if (!problem.empty() && differs(factor, 1)) {
                p.unscalable(c.fields[1], "default " + problem);
                changed = false;
                break;
            }
            texts.push_back(format_plain(value * factor, p.digits()));
        }
        if (!changed) continue;
        std::string joined = texts.front();
        for (std::size_t k = 1; k < texts.size(); ++k) joined += " " + texts[k];
        bool vector = r.factor.find("[]") != std::string_view::npos;
        added += vector ? fmt::format(" {}=[{}]", r.name, joined)
                        : fmt::format(" {}={}", r.name, joined);
    }
    if (!added.empty()) {
        const Token* last = &c.fields.back();
        std::uint32_t at = last->kind == TokenKind::rparen ? last->begin : last->end;
        char before = at > 0 ? c.file->text()[at - 1] : '(';
        if (last->kind == TokenKind::rparen && (before == '(' || before == ' ' || before == '\t'))
            added = added.substr(1);
        if (c.fields.size() == 3) added = "(" + added.substr(1) + ")";  // ".model m gain"
        p.insert(at, added, "defaults written out", first_factor);
    }
    return true;
}

}  // namespace deckscale
