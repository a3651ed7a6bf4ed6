#include "scale/cautions.hpp"

#include <fmt/format.h>

#include "scale/expression.hpp"

namespace deckscale {

std::string scale_cautions(ScaleFactors f, bool held, bool semiconductors) {
    std::string s;
    if (f.km == 1 && f.kf == 1) return s;
    s += "deckscale: caution: the values written are ideal. Before building, choose real parts\n"
         "  and check their power, voltage and current ratings at the new impedance level.\n";
    if (f.km < 1)
        s += fmt::format(
            "  Km = {} < 1: every current grows by 1/Km = {} and every resistor's power at the\n"
            "  same voltage by the same factor.\n",
            factor_text(f.km), factor_text(1 / f.km));
    if (semiconductors)
        s += "  Diodes and transistors were scaled too (m or area by 1/Km, their models'\n"
             "  capacitances and transit times by 1/Kf): a real part must match the scaled\n"
             "  device, not the original's part number.\n";
    if (held)
        s += "  Held parts were not rescaled: the circuit around them changed, so their\n"
             "  currents, voltages and dissipation are not the original's. Check each held\n"
             "  part's ratings and stability (an amplifier's phase margin) in the new circuit;\n"
             "  verify reports how far the response moved.\n";
    s += "  For mains-connected or high-voltage circuits, local codes and licensed practice govern.\n";
    return s;
}

std::string nominal_value_cautions() {
    return "deckscale: caution: the values written are nominal. Before building, check the chosen\n"
           "  parts' tolerances, temperature coefficients, voltage and power ratings at the new\n"
           "  impedance level. For mains-connected or high-voltage circuits, local codes and\n"
           "  licensed practice govern.\n";
}

}  // namespace deckscale
