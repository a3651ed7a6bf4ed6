// Internal to holding parts (scale/hold_plan.cpp, scale/hold_boundary.cpp): what one read of
// the deck tells about its elements, .subckt definitions and .model cards.
#pragma once

#include <cstddef>
#include <cstdint>
#include <map>
#include <set>
#include <string>
#include <vector>

#include "deck/load.hpp"

namespace deckscale {

struct ScannedElement {
    std::string name;  // as written
    std::size_t file = 0;
    std::uint32_t offset = 0;        // of the name field
    std::vector<std::string> nodes;  // terminals that carry current (lower case)
    std::string model;               // lower case; "" when none
    std::string subckt;              // an X line's .subckt (lower case)
    int region = -1;                 // the top-level .subckt it is inside; -1: top level
    bool nested = false;             // inside a .subckt defined within that one
};

// A .subckt defined at the top level of its file, with everything defined inside it.
struct ScannedRegion {
    std::string name, written;  // lower case, as written
    std::size_t file = 0;
    std::uint32_t begin = 0;        // the .subckt card's first byte
    std::uint32_t name_offset = 0;  // its name field
    std::uint32_t end = 0;          // after the .ends card
    std::uint32_t copy_at = 0;      // the .ends card's line end (or `end` without one)
    std::string eol = "\n";         // that line end
    std::set<std::string> local_subckts, local_models;  // defined inside (lower case)
};

struct ScannedDefinition {  // any .subckt or .model, for names and messages
    std::string written;
    std::size_t file = 0;
    std::uint32_t offset = 0;  // of the name field
    int region = -1;           // the region it is inside; -1: top level
};

struct HoldScan {
    std::vector<ScannedElement> elements;
    std::vector<ScannedRegion> regions;  // in file order, per file in offset order
    std::map<std::string, std::vector<ScannedDefinition>> subckts, models;  // by lower name
    std::uint32_t title_end = 0;  // where the held line goes: the title's line end
    std::string title_eol = "\n";
    // Per file: the region its cards belong to because the file is included inside that
    // .subckt (ngspice reads an include in place); -1 at the top level; `shared_include`
    // when it is included both inside a .subckt and elsewhere (or inside two), and is then
    // scanned as top level. An included file's .subckts are local to that region.
    std::vector<int> file_region;
};

inline constexpr int shared_include = -2;

HoldScan scan_for_holds(const Deck& deck);

// Where `file` is included inside a .subckt (the first such include), for messages.
const IncludeRef* include_inside_region(const Deck& deck, const HoldScan& scan, std::size_t file);

// Warnings at held parts that meet scaled parts through a node that carries current (scale/
// hold_boundary.cpp). `held[i]` tells whether elements[i] is held; `scaled_regions[r]`
// whether region r is rendered scaled (in place or as a copy).
std::vector<Diagnostic> boundary_warnings(const Deck& deck, const HoldScan& scan,
                                          const std::vector<bool>& held,
                                          const std::vector<bool>& scaled_regions, double km);

}  // namespace deckscale
