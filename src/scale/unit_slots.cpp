#include "scale/unit_slots.hpp"

#include <fmt/format.h>

namespace deckscale {

std::string unit_text(UnitExponents e) {
    if (same_exponents(e, kPureNumber)) return "volts or pure numbers";
    for (Unit u : {Unit::ampere, Unit::ohm, Unit::second, Unit::hertz, Unit::farad, Unit::henry})
        if (same_exponents(exponents(u), e)) return std::string(unit_name(u));
    return fmt::format("Km^{} Kf^{}", e.km, e.kf);
}

}  // namespace deckscale
