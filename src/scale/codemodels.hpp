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

// The A devices of a deck by model name (lower case), with the port types each one gives
// its connections: a model's factors depend on them.
struct CodeModelUse {
    std::string instance;
    InstancePorts ports;
};
struct CodeModelUses {
    std::map<std::string, std::vector<CodeModelUse>> by_model;
    // Words of the deck's other element cards (every one that may be a node) and the nodes
    // of analog code-model ports: a digital port on one of them gets an automatic bridge.
    std::set<std::string> analog_nodes;
};

// Reads the deck's A devices; null when the deck declares no model of a code-model type.
std::shared_ptr<const CodeModelUses> collect_code_model_uses(const Deck& deck);

// True for an A device and for a .model card of a code-model type: they are scaled only
// once the whole deck is known (a model's factors depend on instances anywhere in it).
bool is_code_model_card(const Card& card);

}  // namespace deckscale
