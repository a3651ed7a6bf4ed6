// How a parameter expression scales, read off its text. Scaling multiplies a value of a
// given unit by Km^a * Kf^b (scale/units.hpp); so does it to a parameter scaled at its
// definition, with (a, b) the parameter's "scaling dimension". An expression of parameters
// then scales by the sum of their dimensions weighted by the powers they appear in: a
// product adds, a quotient subtracts, sqrt halves. Numbers written in the expression do not
// scale (dimension 0) -- but only plain numbers (2, 0.5, 3.14159) are surely dimensionless: a
// number written with a suffix or an exponent (1k, 10n, 1e-9) usually carries a unit of its
// own, so each such number also gets an unknown of its own in the forms (a negative id). The
// plan must then find every parameter's dimension without those unknowns being 0, or it does
// not rest the parameter on them (scale/param_plan.hpp). Where the rule breaks -- the two sides of
// a sum, the operands of a comparison or of min/max, the argument of exp/log/sin/floor... -- the
// dimensions must be equal, or zero, so the expression reads side conditions off those places.
// Anything whose scaling is not known (a run-time variable, a random function, an unknown name)
// makes the expression opaque: its parameters are then never scaled at their definition.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <set>
#include <string>
#include <string_view>
#include <vector>

#include "scale/fraction.hpp"

namespace deckscale {

// A number in the expression that could carry the scaling of a product of numbers:
// multiplying it by k^power multiplies the whole expression by k.
struct ScalableNumber {
    std::size_t offset = 0;  // in the expression text
    std::size_t length = 0;
    int power = 1;
    bool suffix = false;  // written with a scale suffix ("1k", "10n")
};

struct DimAnalysis {
    bool opaque = false;
    std::string why;               // when opaque: what has no known scaling
    LinearForm value;              // the expression's dimension
    std::vector<LinearForm> zero;  // side conditions: each must come out 0
    std::set<int> params;          // every parameter the text names, opaque or not
    // For an expression of numbers only that is a product/quotient: the number to rescale
    // (the one with a suffix if exactly one has, else the last one).
    std::optional<ScalableNumber> number;
};

// A user function (.func name(args) body).
struct UserFunction {
    std::vector<std::string> args;  // lower case
    std::string body;               // without its braces or quotes
};

struct DimContext {
    // The parameter a lower-case name stands for where the expression is, if it is one.
    std::function<std::optional<int>(const std::string&)> param;
    // A .func by lower-case name (nullptr: none).
    std::function<const UserFunction*(const std::string&)> function;
};

// `expr` without its {} or quotes.
DimAnalysis analyze_dims(std::string_view expr, const DimContext& context);

}  // namespace deckscale
