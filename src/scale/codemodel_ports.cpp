#include "scale/codemodel_ports.hpp"

#include <fmt/format.h>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

std::size_t nodes_of(std::string_view type) {
    return type == "vd" || type == "id" || type == "gd" || type == "hd" ? 2 : 1;
}

bool known_type(std::string_view t) {
    for (std::string_view k :
         {"v", "vd", "i", "id", "g", "gd", "h", "hd", "d", "vnam", "real", "int"})
        if (t == k) return true;
    return false;
}

bool is_modifier(std::string_view item) { return !item.empty() && item.front() == '%'; }

const PortSpec* find_spec(const std::vector<PortSpec>& specs, std::string_view name,
                          std::size_t& index) {
    for (std::size_t i = 0; i < specs.size(); ++i)
        if (specs[i].name == name) {
            index = i;
            return &specs[i];
        }
    return nullptr;
}

// The factor of element k of a port (k past the end or an open connection: its default type).
double element_factor(const std::vector<PortSpec>& specs, const InstancePorts* ports,
                      std::string_view name, std::size_t k, ScaleFactors f) {
    std::size_t index = 0;
    const PortSpec* s = find_spec(specs, name, index);
    if (!s) return 1;
    std::string_view type = s->type;
    if (ports && index < ports->size() && k < (*ports)[index].size() &&
        (*ports)[index][k] != "null")
        type = (*ports)[index][k];
    return port_factor(type, s->dir, f);
}

}  // namespace

std::vector<PortSpec> port_specs(const CodeModelType& model) {
    std::vector<PortSpec> out;
    std::string_view rest = model.ports;
    while (!rest.empty()) {
        std::size_t blank = rest.find(' ');
        std::string_view item = rest.substr(0, blank);
        rest = blank == std::string_view::npos ? std::string_view{} : rest.substr(blank + 1);
        std::size_t c1 = item.find(':'), c2 = item.rfind(':');
        PortSpec s{item.substr(0, c1), PortDir::in, item.substr(c2 + 1), false};
        std::string_view dir = item.substr(c1 + 1, c2 - c1 - 1);
        s.dir = dir == "out" ? PortDir::out : dir == "inout" ? PortDir::inout : PortDir::in;
        if (s.name.size() > 2 && s.name.substr(s.name.size() - 2) == "[]") {
            s.name.remove_suffix(2);
            s.vector = true;
        }
        out.push_back(s);
    }
    return out;
}

std::vector<std::string_view> connection_items(const Card& card) {
    std::vector<std::string_view> out;
    for (std::size_t i = 1; i + 1 < card.fields.size(); ++i) {
        if (card.fields[i].kind != TokenKind::word) continue;  // ( ) , read as blanks
        std::string_view w = card.field_text(i);
        std::size_t start = 0;
        for (std::size_t j = 0; j <= w.size(); ++j) {
            bool bracket = j < w.size() && (w[j] == '[' || w[j] == ']');
            if (j == w.size() || bracket) {
                if (j > start) out.push_back(w.substr(start, j - start));
                if (bracket) out.push_back(w.substr(j, 1));
                start = j + 1;
            }
        }
    }
    return out;
}

bool read_ports(const std::vector<std::string_view>& items, const std::vector<PortSpec>& specs,
                InstancePorts& out, std::string& why, std::vector<PortNode>* nodes) {
    out.clear();
    auto take = [&](std::size_t at, const std::string& type) {
        if (!nodes) return;
        for (std::size_t j = at; j < at + nodes_of(type); ++j)
            nodes->push_back({to_lower(items[j]), type});
    };
    std::size_t i = 0, n = items.size();
    auto nodes_fit = [&](std::size_t count) {
        for (std::size_t j = i; j < i + count; ++j)
            if (j >= n || items[j] == "[" || items[j] == "]" || is_modifier(items[j])) return false;
        return true;
    };
    for (const auto& spec : specs) {
        std::vector<std::string> types;
        std::string type(spec.type);
        if (i < n && is_modifier(items[i])) type = to_lower(items[i++].substr(1));
        if (!known_type(type)) {
            why = fmt::format("unknown port type '%{}'", type);
            return false;
        }
        if (i >= n) {
            why = fmt::format("port '{}' is not connected", spec.name);
            return false;
        }
        if (iequals(items[i], "null")) {
            types.push_back("null");
            ++i;
        } else if (spec.vector) {
            if (items[i] != "[") {
                why = fmt::format("port '{}' is a vector: expected '['", spec.name);
                return false;
            }
            ++i;
            while (i < n && items[i] != "]") {
                if (is_modifier(items[i])) {
                    type = to_lower(items[i++].substr(1));
                    if (!known_type(type)) {
                        why = fmt::format("unknown port type '%{}'", type);
                        return false;
                    }
                    continue;
                }
                if (iequals(items[i], "null")) {
                    types.push_back("null");
                    ++i;
                    continue;
                }
                if (!nodes_fit(nodes_of(type))) {
                    why = fmt::format("port '{}' needs {} nodes for %{}", spec.name, nodes_of(type),
                                      type);
                    return false;
                }
                types.push_back(type);
                take(i, type);
                i += nodes_of(type);
            }
            if (i >= n) {
                why = fmt::format("port '{}': missing ']'", spec.name);
                return false;
            }
            ++i;
        } else {
            if (!nodes_fit(nodes_of(type))) {
                why = fmt::format("port '{}' needs {} nodes for %{}", spec.name, nodes_of(type),
                                  type);
                return false;
            }
            types.push_back(type);
            take(i, type);
            i += nodes_of(type);
        }
        out.push_back(std::move(types));
    }
    if (i != n) {
        why = fmt::format("more connections than the model's {} ports", specs.size());
        return false;
    }
    return true;
}

double port_factor(std::string_view type, PortDir dir, ScaleFactors f) {
    bool current = false;
    if (dir == PortDir::in)
        current = type == "i" || type == "id" || type == "vnam" || type == "h" || type == "hd";
    else if (dir == PortDir::out)
        current = type == "i" || type == "id" || type == "g" || type == "gd";
    if (type == "reali") current = true;  // a real net that ends in a current (codemodels.cpp)
    return current ? 1 / f.km : 1;
}

double eval_factor(std::string_view expr, const std::vector<PortSpec>& specs,
                   const InstancePorts* ports, ScaleFactors f, std::size_t k, std::size_t n) {
    double value = 1;
    bool divide = false;
    std::size_t at = 0;
    while (at <= expr.size()) {
        std::size_t end = expr.find_first_of("*/", at);
        if (end == std::string_view::npos) end = expr.size();
        std::string_view term = expr.substr(at, end - at);
        double t = 1;
        if (term == "Km") {
            t = f.km;
        } else if (term == "Kf") {
            t = f.kf;
        } else if (term == "Kf^rest") {
            t = int_power(f.kf, static_cast<int>(n - 1 - k));
        } else if (term.size() > 2 && term.substr(term.size() - 2) == "[]") {
            t = element_factor(specs, ports, term.substr(0, term.size() - 2), k, f);
        } else if (term != "1") {
            t = element_factor(specs, ports, term, 0, f);
        }
        value = divide ? value / t : value * t;
        if (end == expr.size()) break;
        divide = expr[end] == '/';
        at = end + 1;
    }
    return value;
}

std::size_t vector_elements(const std::vector<PortSpec>& specs, const InstancePorts* ports,
                            std::string_view port) {
    std::size_t n = 1;
    if (!ports) return n;
    for (std::size_t i = 0; i < specs.size() && i < ports->size(); ++i)
        if (specs[i].vector && (port.empty() || specs[i].name == port))
            n = std::max(n, (*ports)[i].size());
    return n;
}

}  // namespace deckscale
