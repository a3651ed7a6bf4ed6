// The rule table of XSPICE code models (A devices and their .model cards): each model's ports
// with their default types, each parameter's factor, the defaults that must be written out and
// the cases that cannot be scaled exactly. A factor may depend on the port types an instance
// gives its connections (%v, %i, %vd, %g, ...): a gain from a voltage input to a current
// output is in siemens. Sources: ngspice 39 manual ch. 12 (Table 12.1 port types, §12.2-§12.4
// models), ngspice-39.3 src/xspice/icm/*/*/ifspec.ifs (ports, parameters, defaults) and the
// shared notes "codemodel-rules.md" §1-§6, where each row is checked with ngspice 39.
//
// Factor expressions are products of terms joined by '*' and '/': "1", "Km", "Kf", a port name
// (the factor of the quantity the block reads on an input port or drives on an output port),
// "port[]" (element k of a vector parameter takes the factor of element k of a vector port)
// and "Kf^rest" (Kf to the power n-1-k for element k of an n-element vector).
#pragma once

#include <optional>
#include <span>
#include <string_view>

namespace deckscale {

struct CodeModelType {
    std::string_view type;   // the .model type, lower case
    std::string_view ports;  // "name:dir:type" in port order; "name[]" marks a vector port
    bool fraction = false;   // the default of the model's `fraction` parameter
};

struct CodeModelParam {
    std::string_view type;
    std::string_view name;
    std::string_view factor;         // factor expression ("1" for dimensionless values)
    std::string_view fallback = {};  // the default, written out scaled when absent ("" = never)
    std::string_view when = {};      // "" always; "nofraction": only while fraction is false;
                                 // "midpoint": default only unless out_low and out_high are given
                                 // "mode2": default only on a core in mode 2
    double floor = 0;      // the model clamps smaller values (0 = no clamp)
    double ceiling = 0;    // the model clamps larger values (0 = no clamp)
    double keep_from = 0;  // values from here up mean "no limit" and stay (0 = none)
};

// An instance whose factor expression is not 1 cannot be scaled exactly, for `why`.
struct CodeModelRefusal {
    std::string_view type;
    std::string_view factor;
    std::string_view why;
};

const CodeModelType* find_code_model(std::string_view type);
const CodeModelParam* find_code_model_param(std::string_view type, std::string_view name);
std::span<const CodeModelType> code_model_types();
std::span<const CodeModelParam> code_model_params();
std::span<const CodeModelRefusal> code_model_refusals();

// The model is event-driven: it has a digital or real port (the d_* gates and flip-flops, the
// bridges, d_osc, d_pwm, the real_* blocks). ngspice evaluates such models only at the
// analog time points (manual ch. 12, "mixed-mode simulation"), so their edges fall on the
// time grid a run happens to take.
bool event_driven_model(std::string_view type);

}  // namespace deckscale
