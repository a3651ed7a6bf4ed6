#include "yield/draw.hpp"

#include <fmt/format.h>

#include <charconv>
#include <cmath>
#include <numbers>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

// The finaliser of SplitMix64 (Steele, Lea, Flood: "Fast splittable pseudorandom number
// generators", OOPSLA 2014): a bijection of 64-bit words whose outputs pass BigCrush as a
// counter-based generator.
std::uint64_t mix(std::uint64_t z) {
    z += 0x9e3779b97f4a7c15ULL;
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

// FNV-1a over the part name: a part keeps its draws when other parts are added or removed.
std::uint64_t name_stream(std::string_view name) {
    std::uint64_t h = 0xcbf29ce484222325ULL;
    for (char c : name) {
        h ^= static_cast<unsigned char>(c);
        h *= 0x100000001b3ULL;
    }
    return h;
}

}  // namespace

const char* to_string(Spread s) { return s == Spread::uniform ? "uniform" : "gauss"; }

double ToleranceSpec::of(const std::string& part) const {
    if (auto it = by_part.find(part); it != by_part.end()) return it->second;
    if (part.empty()) return 0;
    auto it = by_kind.find(part[0]);
    return it == by_kind.end() ? 0 : it->second;
}

std::string parse_tolerances(std::string_view text, ToleranceSpec& spec) {
    std::size_t pos = 0;
    while (pos <= text.size()) {
        std::size_t comma = text.find(',', pos);
        std::string_view item =
            text.substr(pos, comma == std::string_view::npos ? text.npos : comma - pos);
        pos = comma == std::string_view::npos ? text.size() + 1 : comma + 1;
        std::size_t eq = item.find('=');
        if (eq == 0 || eq == std::string_view::npos)
            return fmt::format("'{}' is not NAME=VALUE (e.g. R=1%, C3=0.5%)", item);
        std::string name = to_lower(std::string(item.substr(0, eq)));
        std::string_view value = item.substr(eq + 1);
        bool percent = !value.empty() && value.back() == '%';
        if (percent) value.remove_suffix(1);
        double v = 0;
        auto [end, ec] = std::from_chars(value.data(), value.data() + value.size(), v);
        if (value.empty() || ec != std::errc{} || end != value.data() + value.size() || !(v >= 0))
            return fmt::format("'{}': the tolerance must be a number of 0 or more (1% or 0.01)",
                               item);
        if (percent) v /= 100;
        if (!(v < 1))
            return fmt::format("'{}': a tolerance of 100% or more leaves no part value", item);
        if (name.size() == 1) {
            if (name != "r" && name != "c" && name != "l")
                return fmt::format("'{}': a kind is R, C or L", item);
            spec.by_kind[name[0]] = v;
        } else {
            spec.by_part[name] = v;
        }
    }
    return "";
}

double unit_uniform(std::uint64_t seed, std::uint64_t trial, std::uint64_t stream) {
    std::uint64_t bits = mix(mix(mix(seed) ^ trial) ^ stream);
    return static_cast<double>(bits >> 11) * 0x1.0p-53;
}

double draw(std::uint64_t seed, std::uint64_t trial, std::string_view part, Spread spread) {
    std::uint64_t stream = name_stream(part);
    if (spread == Spread::uniform) return 2 * unit_uniform(seed, trial, stream) - 1;
    // Box-Muller (Box and Muller, Ann. Math. Statist. 29 (1958) 610), one of its two normals.
    double u1 = 1 - unit_uniform(seed, trial, stream);  // (0, 1]: the logarithm stays finite
    double u2 = unit_uniform(seed, trial, mix(stream));
    double normal = std::sqrt(-2 * std::log(u1)) * std::cos(2 * std::numbers::pi * u2);
    return normal / 3;
}

}  // namespace deckscale
