// The quantities of retarget's options as the user writes them: a factor expression
// ("3.4k", "2*pi*1k", scale/factor) with an optional unit, "Hz", "rad/s" (divided by 2 pi:
// a normalized prototype sits at 1 rad/s = 1/(2 pi) Hz) or "Ohm"; and frequencies as text.
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace deckscale {

// A frequency in Hz; nullopt unless a positive number.
std::optional<double> parse_frequency(std::string_view text);
// An impedance in Ohm; nullopt unless a positive number.
std::optional<double> parse_impedance(std::string_view text);

// "3.4 kHz", "159.155 mHz": 6 significant digits with an SI prefix.
std::string frequency_text(double hz);

}  // namespace deckscale
