// The connections of an XSPICE A device: which port type (%v, %i, %vd, %id, %g, %gd, %h, %hd,
// %d, %vnam) each port of its code model has, and the factors that follow from them
// (ngspice 39 manual §12.1, Table 12.1; ngspice-39.3 src/xspice/mif/mif_inp2.c; shared notes
// "codemodel-rules.md" §1 and pitfall 2).
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "deck/card.hpp"
#include "scale/codemodel_rules.hpp"
#include "scale/units.hpp"

namespace deckscale {

enum class PortDir : unsigned char { in, out, inout };

struct PortSpec {
    std::string_view name;
    PortDir dir;
    std::string_view type;  // default type
    bool vector;
};

// The ports of a model as the rule table lists them.
std::vector<PortSpec> port_specs(const CodeModelType& model);

// One entry per port of the model; one type per element of a vector port ("null" when
// that connection is left open).
using InstancePorts = std::vector<std::vector<std::string>>;

// The connection items of an A card (between its name and its model name): words split at
// '[' and ']', with '(', ')' and ',' read as blanks, as ngspice does.
std::vector<std::string_view> connection_items(const Card& card);

// A node an instance connects (lower case) and the type of the port it belongs to.
struct PortNode {
    std::string node;
    std::string type;
};

// Reads the items against the model's ports. Returns false with `why` set when they do not fit.
// With `nodes`, also lists every node connected (a %vnam source name counts as one).
bool read_ports(const std::vector<std::string_view>& items, const std::vector<PortSpec>& specs,
                InstancePorts& out, std::string& why, std::vector<PortNode>* nodes = nullptr);

// The factor of what a port of this type carries: the quantity the block reads on an input,
// the one it drives on an output (Table 12.1: %i reads a current and drives one, %g reads a
// voltage and drives a current, %h the reverse).
double port_factor(std::string_view type, PortDir dir, ScaleFactors f);

// The value of a factor expression (see codemodel_rules.hpp) for element k of an n-element
// value. `ports` may be null: every port then has its default type.
double eval_factor(std::string_view expr, const std::vector<PortSpec>& specs,
                   const InstancePorts* ports, ScaleFactors f, std::size_t k, std::size_t n);

// The number of elements of the instance's largest vector port (1 when it has none).
std::size_t vector_elements(const std::vector<PortSpec>& specs, const InstancePorts* ports,
                            std::string_view port = {});

}  // namespace deckscale
