// Exact rationals, and linear forms over them: the exponents of Km and Kf that parameter
// expressions scale by (scale/param_dims.hpp) and the equations solved for them
// (scale/param_solve.hpp).
#pragma once

#include <cstdint>
#include <map>
#include <stdexcept>

namespace deckscale {

// An exact rational; arithmetic that overflows 64 bits throws ExponentOverflow.
struct Fraction {
    std::int64_t num = 0;
    std::int64_t den = 1;  // > 0, lowest terms
    static Fraction of(std::int64_t n, std::int64_t d = 1);
    bool zero() const { return num == 0; }
    bool operator==(const Fraction&) const = default;
};
struct ExponentOverflow : std::runtime_error {
    ExponentOverflow() : std::runtime_error("exponent arithmetic overflows") {}
};
Fraction operator+(Fraction a, Fraction b);
Fraction operator-(Fraction a, Fraction b);
Fraction operator*(Fraction a, Fraction b);
Fraction operator/(Fraction a, Fraction b);  // b != 0
Fraction operator-(Fraction a);

// sum of coefficient * dimension(parameter), parameters by id (negative ids: numbers whose
// unit is not known, numbered -1, -2, ... within one analysis); zero coefficients left out.
using LinearForm = std::map<int, Fraction>;
void add_scaled(LinearForm& to, const LinearForm& from, Fraction k);

}  // namespace deckscale
