// Values of `.param` arithmetic as ngspice 39's parameter evaluator reads it (manual §2.9):
// numbers with one SPICE suffix letter or MEG (any letters after it ignored, so `{1mil}` is
// 1e-3 there, unlike on an element line), names of other parameters, + - * / ** ^, unary
// minus and plus, parentheses and the common functions. `pi` is not known to ngspice 39's
// parameter evaluator (tried: `.param p={2*pi}` stops with "Undefined parameter [pi]"), so
// it is not known here either. Anything else gives no value rather than a guess.
#pragma once

#include <functional>
#include <map>
#include <optional>
#include <set>
#include <string>
#include <string_view>

namespace deckscale {

// Looks a parameter up by its lower-case name; no value if it is unknown or cannot be
// evaluated.
using ParamLookup = std::function<std::optional<double>(const std::string& name)>;

// Evaluates an expression (without its `{}` or quotes).
std::optional<double> evaluate_param_expression(std::string_view expr, const ParamLookup& lookup);

// The parameters of a deck by lower-case name, each the text of its expression; evaluated on
// demand in any order (ngspice 39 reads top-level `.param` cards order-independently), a
// later definition replacing an earlier one, a definition that depends on itself giving no
// value.
class ParamTable {
public:
    void define(std::string name, std::string expression);
    std::optional<double> value(const std::string& name) const;
    std::optional<double> evaluate(std::string_view expr) const;

private:
    std::map<std::string, std::string> definitions_;
    mutable std::map<std::string, std::optional<double>> values_;
    mutable std::set<std::string> evaluating_;
};

}  // namespace deckscale
