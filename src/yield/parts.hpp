// The parts a yield run varies: the R, C and L elements of a deck's top level whose value is
// a plain number. Every other R, C or L is held at its value and said so (never skipped
// silently): one inside a .subckt, one valued by an expression or a parameter, one in an
// included file.
#pragma once

#include <string>
#include <vector>

#include "deck/diagnostic.hpp"
#include "deck/load.hpp"
#include "yield/draw.hpp"

namespace deckscale {

struct Part {
    std::string name;      // lower case, as ngspice's alter names it
    double nominal = 0;    // the value as written
    double tolerance = 0;  // relative; 0: the part keeps its value (no alter)
};

struct PartList {
    std::vector<Part> parts;          // deck order
    std::vector<Diagnostic> held;     // notes: R, C and L parts kept at their written value
    std::vector<std::string> errors;  // a --tolerance entry that names no variable part
};

PartList find_parts(const Deck& deck, const ToleranceSpec& tolerances);

}  // namespace deckscale
