// The impedance a target names: a resistor's value (`--impedance R1=600`), a T line's or
// an RF port's Z0 (`--impedance T1=75`). A part that does
// not exist, or whose value is no impedance (a capacitor, a source), is a clear error.
#pragma once

#include <string>

#include "deck/load.hpp"

namespace deckscale {

struct NamedImpedance {
    double ohms = 0;
    std::string problem;  // empty when `ohms` holds the value
};

NamedImpedance named_impedance(const Deck& deck, const std::string& element);

}  // namespace deckscale
