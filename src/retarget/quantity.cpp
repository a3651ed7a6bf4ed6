#include "retarget/quantity.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <numbers>

#include "base/text_util.hpp"
#include "scale/factor.hpp"

namespace deckscale {
namespace {

// Strips `unit` from the end of `text` (any case); true when it was there.
bool strip_unit(std::string_view& text, std::string_view unit) {
    if (text.size() <= unit.size()) return false;
    std::string tail = to_lower(std::string(text.substr(text.size() - unit.size())));
    if (tail != unit) return false;
    text.remove_suffix(unit.size());
    return true;
}

std::optional<double> positive(std::string_view text, double scale) {
    auto v = parse_factor(text);
    if (!v || !(*v > 0) || !std::isfinite(*v)) return std::nullopt;
    return *v * scale;
}

}  // namespace

std::optional<double> parse_frequency(std::string_view text) {
    if (strip_unit(text, "rad/s")) return positive(text, 1 / (2 * std::numbers::pi));
    strip_unit(text, "hz");
    return positive(text, 1);
}

std::optional<double> parse_impedance(std::string_view text) {
    if (!strip_unit(text, "ohms")) strip_unit(text, "ohm");
    return positive(text, 1);
}

std::string frequency_text(double hz) {
    static const char* prefixes[] = {"p", "n", "u", "m", "", "k", "M", "G", "T"};
    int exp3 = hz > 0 ? static_cast<int>(std::floor(std::log10(hz) / 3)) : 0;
    exp3 = std::clamp(exp3, -4, 4);
    return fmt::format("{:.6g} {}Hz", hz / std::pow(1000.0, exp3), prefixes[exp3 + 4]);
}

}  // namespace deckscale
