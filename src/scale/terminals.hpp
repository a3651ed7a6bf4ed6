// Where an element line names its nodes, its model and (an X line) its subcircuit, read by
// the ngspice 39 manual's element syntax (chapters 3-11): what holding parts needs to find
// the instances of a model or a .subckt, and the nodes where held and scaled parts meet.
#pragma once

#include <cstddef>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "deck/card.hpp"

namespace deckscale {

struct ElementLinks {
    // Fields of the terminals through which the element can carry current: every terminal,
    // except the controlling inputs of F, G, H, S and W (they only sense) and except those of
    // V and E (ideal voltage sources: their impedance is 0 at any Km, and E's inputs only
    // sense). Empty for code-model (A) devices, whose ports this does not read.
    std::vector<std::size_t> current_nodes;
    std::optional<std::size_t> model;   // the field that names a .model
    std::optional<std::size_t> subckt;  // an X line: the field that names the .subckt
};

// `is_model` tells whether a lower-case name is a .model of the deck.
ElementLinks element_links(const Card& c, const std::function<bool(const std::string&)>& is_model);

// True for the ground node ("0", "gnd"), lower case.
bool is_ground(const std::string& node);

}  // namespace deckscale
