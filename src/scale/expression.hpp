// Behavioural expressions under scaling: variable substitution. In the scaled circuit at
// time t' = t/Kf and frequency f' = Kf f, an original expression sees time = Kf t',
// hertz = f'/Kf, a branch current i = Km i' and d/dt = Kf d/dt'. So `time` becomes
// (time*Kf), `hertz` (hertz/Kf), `i(x)` (i(x)*Km) and `ddt(u)` (ddt(u')/Kf); constants then
// need no units (shared notes "scaling-rules.md" §0, checked there with ngspice 39).
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "scale/units.hpp"

namespace deckscale {

struct Substitution {
    std::string text;                    // the rewritten expression
    bool changed = false;
    std::vector<std::string> unsupported;  // constructs with no known scaling ("idt(", "@r1[...]")
};

Substitution substitute_variables(std::string_view expr, ScaleFactors f);

// "*1000", "/6283.18530717959": the text that multiplies a parenthesised expression by k.
std::string times_factor(double k);

// A factor as text with 15 significant digits.
std::string factor_text(double k);

}  // namespace deckscale
