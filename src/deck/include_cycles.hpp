// The include graph of a deck as ngspice reads it: a node is a (file, .lib section) pair, so a
// library that pulls another section of its own file is no cycle; only the same pair twice on
// one chain is (ngspice 39 manual §2.8: `.lib file section` reads just that section).
#pragma once

#include <cstddef>
#include <string>
#include <vector>

namespace deckscale {

struct IncludeEdge {
    std::size_t from_file = 0;
    std::string from_section;  // the .lib section the include card sits in ("" outside any)
    std::size_t to_file = 0;
    std::string to_section;  // the section it asks for ("" for .include)
};

// The edges on the chain from (file 0, "") to the first edge that closes a cycle, in order,
// the closing edge last (depth first, edges tried in the order given); empty when the graph
// has no cycle reachable from the top deck.
std::vector<std::size_t> first_include_cycle(const std::vector<IncludeEdge>& edges);

}  // namespace deckscale
