// The parts a yield run varies: the R, C and L elements of a deck's top level whose value is
// a number or evaluates with the deck's top-level parameters (`{rbase}`, `{2*rbase}`); each
// part is drawn on its own, also where parts share a parameter, as physical parts do. Every
// other R, C or L is held at its value and said so (never skipped silently): one inside a
// .subckt, one in an included file, one whose value does not evaluate (a behavioural one).
#pragma once

#include <string>
#include <vector>

#include "deck/diagnostic.hpp"
#include "deck/load.hpp"
#include "yield/draw.hpp"

namespace deckscale {

struct Part {
    std::string name;      // lower case, as ngspice's alter names it
    double nominal = 0;    // the value as written (evaluated)
    double tolerance = 0;  // relative; 0: the part keeps its value (no alter)
};

struct PartList {
    std::vector<Part> parts;          // deck order
    std::vector<Diagnostic> held;     // notes: R, C and L parts kept at their written value
    std::vector<std::string> errors;  // a --tolerance entry that names no variable part
};

PartList find_parts(const Deck& deck, const ToleranceSpec& tolerances);

}  // namespace deckscale
