// Scaling XSPICE code models: A devices and the .model cards of code-model types, by the
// rule table in scale/codemodel_rules.cpp (shared notes "codemodel-rules.md").
#pragma once

#include <map>
#include <memory>
#include <set>
#include <string>
#include <vector>

#include "deck/card.hpp"
#include "deck/load.hpp"
#include "scale/codemodel_ports.hpp"

namespace deckscale {

class ScalePass;

// The A devices of a deck by model name (lower case), grouped by the factors their port types
// give the model: the first group is served by the model's own card, every other group by a
// copy of it named <name><suffix>.
struct CodeModelUses {
    struct Group {
        InstancePorts ports;  // the port types of its first instance
        std::string suffix;   // "" for the first group, then "_2", "_3", ...
    };
    struct Model {
        std::vector<Group> groups;
        std::map<std::pair<std::size_t, std::uint32_t>, std::size_t> group_of;  // (file, card)
    };
    std::map<std::string, Model> by_model;
    // Port types of each A device by (file, card offset), real ports typed by their net.
    std::map<std::pair<std::size_t, std::uint32_t>, InstancePorts> ports_of;
    // Words of the deck's other element cards (every one that may be a node) and the nodes
    // of analog code-model ports: a digital port on one of them gets an automatic bridge.
    std::set<std::string> analog_nodes;
    // Words of element cards other than V, X and A sources: such an element on a magnetic loop
    // (between lcouple and core) would relate its flux and mmf by a fixed value.
    std::set<std::string> loop_breaking_nodes;
    // The mmf nodes of magnetic loops: lcouple's mmf_out port and core's (notes §5).
    std::set<std::string> magnetic_nodes;
};

// Reads the deck's A devices; null when the deck declares no model of a code-model type.
std::shared_ptr<const CodeModelUses> collect_code_model_uses(const Deck& deck, ScaleFactors f);

// True for an A device and for a .model card of a code-model type: they are scaled only
// once the whole deck is known (a model's factors depend on instances anywhere in it).
bool is_code_model_card(const Card& card);

}  // namespace deckscale
