// Which parts a scaling run keeps as written (scale --hold), worked out over the whole deck
// before the pass runs. A held part is an element or X instance of the top level, every
// instance of a held .model, or every X instance of a held .subckt. A .subckt used only by
// held parts stays as written; one used by held and by scaled parts stays as written for the
// held ones and gets a scaled copy under a new name (written after its .ends, in the output
// deck or in the rewritten copy of its include file) that only the scaled X lines point at;
// nested .subckt uses follow. A global .model used by held and scaled instances gets a scaled
// copy the same way when scaling changes its card (shared notes "scaling-rules.md" §5).
// A file included inside a .subckt belongs to its body: held with it, and refused at its
// include card when it cannot stay as written (the .subckt has a scaled copy, or the file is
// included elsewhere too).
#pragma once

#include <cstddef>
#include <cstdint>
#include <map>
#include <set>
#include <string>
#include <utility>
#include <vector>

#include "deck/load.hpp"
#include "scale/held_part.hpp"
#include "scale/units.hpp"

namespace deckscale {

// A .subckt defined at the top level of its file (with whatever is defined inside it).
struct HoldRegion {
    std::string name;  // lower case
    std::size_t file = 0;
    std::uint32_t begin = 0, end = 0;  // the .subckt card's first byte .. after the .ends card
    std::uint32_t copy_at = 0;         // where its scaled copy is inserted (the .ends line end)
    std::string eol;                   // the line end the copy starts with
    bool held = false;                 // rendered as written in place (a held part uses it)
    std::string copy;                  // the scaled copy's name when scaled parts use it too
    std::size_t part = 0;              // index into HoldPlan::parts when held
    std::set<std::string> local_subckts, local_models;  // defined inside it (lower case)
};

struct HoldPlan {
    std::vector<std::string> items;   // as given, for the held line
    std::vector<HoldRegion> regions;  // per file in offset order
    // Element cards held at the top level, by (file, offset of the name): part index.
    std::map<std::pair<std::size_t, std::uint32_t>, std::size_t> held_elements;
    std::map<std::string, std::size_t> held_models;    // lower-case name: part index
    std::set<std::string> held_subckts;                // lower-case names
    std::map<std::string, std::string> subckt_copies;  // lower-case name: copy name
    // Global models used by held and by scaled instances: the name their copy gets if
    // scaling changes the card (decided by the pass), and their part index.
    std::map<std::string, std::pair<std::string, std::size_t>> shared_models;
    std::map<std::string, std::string> model_copies;  // filled by the pass: lower name: copy
    std::vector<HeldPart> parts;
    std::vector<Diagnostic> boundaries;  // warnings where held parts meet scaled ones
    std::uint32_t held_line_at = 0;      // the top file's title line end
    std::string held_line_eol = "\n";
    // Per file: the region it is included inside (its cards belong to it), -1, or
    // shared_include (scale/hold_scan.hpp): included inside a .subckt and elsewhere too.
    std::vector<int> file_region;

    // The region holding `offset` of `file` (every offset of a file included inside a
    // .subckt), or null at the top level.
    const HoldRegion* region_at(std::size_t file, std::uint32_t offset) const;
};

// Reads the items (scale/hold_items.hpp) against the deck. Throws DeckError, naming every
// item that matches nothing (with a hint when it names an element inside a .subckt), or an
// item of bad syntax.
HoldPlan plan_holds(const Deck& deck, const std::vector<std::string>& items, ScaleFactors f);

// The lower-case names of the top-level elements and X instances the items hold (by name,
// by their model or by their .subckt): what `verify` leaves out of its element ratio check.
std::set<std::string> held_top_level_names(const Deck& deck, const std::vector<std::string>& items);

}  // namespace deckscale
