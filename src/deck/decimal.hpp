// Writing a double with a given number of significant digits, fast: the rewrite of a large
// deck formats millions of values. Output matches printf's %.*g / %.*e conventions.
#pragma once

#include <string>

namespace deckscale {

// value = (negative ? -1 : 1) * d1.d2d3... * 10^exponent; `digits` has no trailing zeros.
struct Decimal {
    bool negative = false;
    std::string digits = "0";
    int exponent = 0;
};

// Rounds to `precision` significant digits (1..17); up to 12 digits by a fast path whose
// last digit may, very rarely, differ by one from exact rounding at a near-tie.
Decimal to_decimal(double value, int precision);

// Like printf("%.*g"): fixed notation unless the exponent is < -4 or >= precision; trailing
// zeros removed; an exponent is written with its sign and at least two digits ("1.5e-07").
std::string general_text(const Decimal& d, int precision);
// The same, appended to `out`, for the value divided by 10^shift (a mantissa before a suffix).
void append_general_text(std::string& out, const Decimal& d, int precision, int shift = 0);

// Scientific notation with a bare exponent ("1.5e-7", "2E4"): `letter` is 'e' or 'E'.
std::string scientific_text(const Decimal& d, char letter);

}  // namespace deckscale
