// Card handlers for XSPICE code models: the A device (its port types and the cases that cannot
// be scaled exactly) and the .model card of a code-model type (values, vectors element by
// element, defaults that carry units, unknown parameter names).
#include "scale/codemodels.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/codemodel_card.hpp"
#include "scale/pass.hpp"

namespace deckscale {
namespace {

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

// An A device as the pre-scan read it.
struct SeenDevice {
    std::pair<std::size_t, std::uint32_t> at;  // (file, card offset)
    std::string model;
    const CodeModelType* type = nullptr;
    std::vector<PortSpec> specs;
    InstancePorts ports;
    std::vector<PortNode> nodes;
};

// Real nets (xtraevt, notes §4): real_gain and real_delay join their input and output nets
// (gain stays 1, so both carry one unit); a net takes the factor of the real_to_v outputs it
// drives. Their real ports are typed "reali" when that factor is 1/Km, "realx" when the net
// drives outputs of both kinds, else "real".
void type_real_nets(std::vector<SeenDevice>& seen, ScaleFactors f) {
    std::map<std::string, std::string> parent;
    std::function<std::string(const std::string&)> root = [&](const std::string& n) {
        auto it = parent.find(n);
        if (it == parent.end() || it->second == n) return n;
        return it->second = root(it->second);
    };
    auto real_nodes = [](const SeenDevice& s) {
        std::vector<std::string> out;
        for (const auto& n : s.nodes)
            if (n.type == "real") out.push_back(n.node);
        return out;
    };
    for (const auto& s : seen)
        if (s.type->type == "real_gain" || s.type->type == "real_delay") {
            auto r = real_nodes(s);
            if (r.size() == 2) parent[root(r[0])] = root(r[1]);
        }
    std::map<std::string, std::set<double>> drives;
    for (const auto& s : seen)
        if (s.type->type == "real_to_v" && s.ports.size() == 2 && !s.ports[1].empty()) {
            auto r = real_nodes(s);
            if (!r.empty()) drives[root(r[0])].insert(port_factor(s.ports[1][0], PortDir::out, f));
        }
    for (auto& s : seen) {
        std::size_t at = 0;
        for (auto& port : s.ports)
            for (auto& type : port) {
                if (type == "null") continue;
                if (type == "real" && at < s.nodes.size()) {
                    const auto& d = drives[root(s.nodes[at].node)];
                    if (d.size() > 1)
                        type = "realx";
                    else if (d.size() == 1 && *d.begin() != 1)
                        type = "reali";
                }
                at += type == "vd" || type == "id" || type == "gd" || type == "hd" ? 2 : 1;
            }
    }
}

}  // namespace

std::shared_ptr<const CodeModelUses> collect_code_model_uses(const Deck& deck, ScaleFactors f) {
    bool any = false;
    for (const auto& [name, type] : deck.symbols.models)
        if (find_code_model(type)) any = true;
    if (!any) return nullptr;
    auto uses = std::make_shared<CodeModelUses>();
    std::vector<SeenDevice> seen;
    for (std::size_t f_index = 0; f_index < deck.files.size(); ++f_index)
        deck.visit_file(f_index, [&](const Card& c) {
            if (c.kind != CardKind::element || c.fields.size() < 2) return;
            char letter = ascii_lower(c.field_text(0)[0]);
            if (letter != 'a' && letter != 'x') {  // subcircuit calls may pass digital nodes on
                for (std::size_t i = 1; i < c.fields.size(); ++i)
                    if (c.fields[i].kind == TokenKind::word) {
                        uses->analog_nodes.insert(to_lower(c.field_text(i)));
                        if (letter != 'v')
                            uses->loop_breaking_nodes.insert(to_lower(c.field_text(i)));
                    }
                return;
            }
            if (letter != 'a') return;
            SeenDevice s;
            s.at = {f_index, c.begin()};
            s.model = to_lower(c.field_text(c.fields.size() - 1));
            auto it = deck.symbols.models.find(s.model);
            if (it == deck.symbols.models.end()) return;
            s.type = find_code_model(it->second);
            if (!s.type) return;
            s.specs = port_specs(*s.type);
            std::string why;
            if (!read_ports(connection_items(c), s.specs, s.ports, why, &s.nodes)) return;
            for (const auto& n : s.nodes)
                if (!is_digital(n.type) && n.type != "vnam") uses->analog_nodes.insert(n.node);
            if (s.type->type == "lcouple" || s.type->type == "core")
                for (std::size_t i = s.type->type == "lcouple" ? 2 : 0; i < s.nodes.size(); ++i)
                    uses->magnetic_nodes.insert(s.nodes[i].node);
            seen.push_back(std::move(s));
        });
    type_real_nets(seen, f);
    std::set<std::string> taken;  // names given to copies
    for (auto& s : seen) {
        CodeModelUses::Model& m = uses->by_model[s.model];
        std::size_t g = 0;
        while (g < m.groups.size() &&
               !same_factors(*s.type, s.specs, m.groups[g].ports, s.ports, f))
            ++g;
        if (g == m.groups.size()) {
            std::string suffix;
            for (int k = 2; !m.groups.empty() && suffix.empty(); ++k) {
                std::string name = fmt::format("{}_{}", s.model, k);
                if (!deck.symbols.models.count(name) && taken.insert(name).second)
                    suffix = fmt::format("_{}", k);
            }
            m.groups.push_back({s.ports, suffix});
        }
        m.group_of[s.at] = g;
        uses->ports_of[s.at] = std::move(s.ports);
    }
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
    if (c.fields.size() < 2) {
        p.unscalable(c.fields[0], "XSPICE A device without connections and model");
        return;
    }
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
    if (const CodeModelUses* all = p.code_model_uses()) {
        auto it = all->ports_of.find({p.file(), c.begin()});
        if (it != all->ports_of.end()) ports = it->second;  // real nets typed
    }
    for (const auto& port : ports)
        if (std::find(port.begin(), port.end(), "realx") != port.end()) {
            p.unscalable(c.fields[0],
                         "a real net here drives real_to_v outputs of different "
                         "quantities (a voltage and a current): its values cannot "
                         "take both factors");
            break;
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
    // An instance whose port types give its model other factors uses a copy of the model.
    if (const CodeModelUses* all = p.code_model_uses()) {
        auto it = all->by_model.find(model);
        if (it != all->by_model.end()) {
            auto g = it->second.group_of.find({p.file(), c.begin()});
            if (g != it->second.group_of.end() && g->second > 0)
                p.insert(c.fields.back().end, it->second.groups[g->second].suffix,
                         "model copy for these port types", 1);
        }
    }
    // Magnetic loops (notes §5, with n = Km): mmf nodes keep their voltage and the flux, the
    // loop's current, scales by 1/(Km Kf); a resistor, capacitor, inductor, current source or
    // controlled source on an mmf node would need factors of its own.
    if (const CodeModelUses* all = p.code_model_uses();
        all && (*type == "lcouple" || *type == "core") &&
        differs(p.factors().km * p.factors().kf, 1)) {
        std::vector<PortNode> nodes;
        InstancePorts read;
        if (read_ports(connection_items(c), specs, read, why, &nodes))
            for (std::size_t i = *type == "lcouple" ? 2 : 0; i < nodes.size(); ++i) {
                const std::string& node = nodes[i].node;
                if (node != "0" && node != "gnd" && all->loop_breaking_nodes.count(node)) {
                    p.unscalable(c.fields[0],
                                 fmt::format("magnetic loop node '{}' also connects an element "
                                             "other than a voltage source: its flux scales by "
                                             "1/(Km*Kf), which that element's rule does not follow",
                                             node));
                    break;
                }
            }
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
    const CodeModelType* t = find_code_model(to_lower(c.field_text(2)));
    if (!t) return false;
    ModelCard m;
    if (!read_model_card(p, *t, m)) return true;
    if (t->type == "d_source" && differs(p.factors().kf, 1)) {
        // Its times are in its input file, with no time-scale parameter: a rewritten copy.
        const GivenParam* file = m.given_of("input_file");
        if (!file || file->elements.size() != 1)
            p.unscalable(file && file->key ? *file->key : c.fields[1],
                         "d_source reads its times from its input_file, which is rewritten "
                         "for the scaled deck: name it on the card");
        else
            p.copy_data_file(file->elements.front(), 1 / p.factors().kf);
    }
    const CodeModelUses::Model* uses = nullptr;
    if (const CodeModelUses* all = p.code_model_uses()) {
        auto it = all->by_model.find(to_lower(c.field_text(1)));
        if (it != all->by_model.end()) uses = &it->second;
    }
    if (!uses || uses->groups.empty()) {
        apply_plan(p, plan_card(p, m, nullptr));
        return true;
    }
    apply_plan(p, plan_card(p, m, &uses->groups.front().ports));
    // Instances whose port types give other factors get a copy of the card each, named
    // <name><suffix> (the instances are renamed to match, see scale_code_model_instance).
    std::string copies;
    for (std::size_t g = 1; g < uses->groups.size(); ++g)
        copies += cloned_card(p, plan_card(p, m, &uses->groups[g].ports),
                              std::string(c.field_text(1)) + uses->groups[g].suffix);
    if (!copies.empty()) {
        if (c.file->text()[c.end() - 1] != '\n') copies.insert(0, "\n");
        // After the card's own defaults, which end where the card does when its '(' is never
        // closed on the last line of a file without a line end.
        p.insert_after(c.end(), copies, "copy for other port types", 1);
    }
    return true;
}

}  // namespace deckscale
