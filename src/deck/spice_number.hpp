// Numbers as ngspice 39 reads them on element and dot cards, and the rewrite of a number
// that keeps its spelling (suffix and its case, unit tail, exponent style).
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "deck/decimal.hpp"

namespace deckscale {

struct SpiceNumber {
    double value = 0;            // with the suffix applied: "4.7u" -> 4.7e-6
    std::string_view mantissa;   // sign, digits and exponent: "4.7", "-1e3", "2.65E3"
    std::string_view suffix;     // as written: "u", "MEG", "Meg", "" when none
    std::string_view tail;       // unit letters after the suffix: "F", "Ohm", ""
    bool has_exponent = false;
    char exponent_letter = 'e';  // as written ('e', 'E', 'd' or 'D')
};

// Why a text is not a number ngspice reads the same way (for diagnostics).
enum class NumberProblem {
    none,
    not_a_number,  // does not start like a number at all: a name, an expression
    trailing_junk, // "1.2.3k", "1_000", "0x10": ngspice would silently read a prefix
    rkm_style,     // "4k7": ngspice 39 reads 4000 in its default mode
    non_ascii,     // "2.2µF": the micro sign is no suffix, ngspice reads 2.2
    out_of_range,  // "1e999", "1e-999": beyond a double; ngspice reads infinity or 0
    signed_d_exponent,  // "1d-14": ngspice 39 reads a D exponent only without a sign
};

struct NumberParse {
    std::optional<SpiceNumber> number;
    NumberProblem problem = NumberProblem::none;
    std::size_t problem_offset = 0;  // where in the text the problem starts
};

NumberParse parse_spice_number(std::string_view text);

// A message for a parse problem, naming the text.
std::string describe(NumberProblem problem, std::string_view text);

// Multiplier of a suffix as written (case-insensitive); 1 for "".
double suffix_multiplier(std::string_view suffix);

// Writes `value` in the spelling style of `original` with `digits` significant digits:
//  - a number written with a scale suffix keeps having one: the suffix is re-chosen so the
//    mantissa lies in [1, 1000) (f ... T, MEG for 1e6, never MIL), in the letter case of the
//    original suffix, except that milli is always a lower-case 'm'; "4.7uF" scaled by 1/100
//    becomes "47nF";
//  - a number written with an exponent keeps exponent form, with the exponent letter's case;
//  - a plain number stays plain where %g would keep it plain (e.g. "1000", "0.5");
//  - a value below femto or from 1e15 on is written in plain scientific notation
//    ("3.18309886e-18"), its unit tail kept only where it cannot read as a suffix;
//  - the unit tail is otherwise kept as written.
std::string respell(const SpiceNumber& original, double value, int digits);
// The same for a value already rounded to `digits` significant digits.
std::string respell(const SpiceNumber& original, const Decimal& d, int digits);

// Shortest plain spelling of a value with `digits` significant digits ("1.591549e-07").
std::string format_plain(double value, int digits);

}  // namespace deckscale
