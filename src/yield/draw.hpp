// Tolerances and the random draws of a yield run. Every draw is a pure function of
// (seed, trial, part name): no generator state is carried from one trial to the next, so a
// trial gives the same values whichever process runs it and however many processes there are.
#pragma once

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>

namespace deckscale {

// How a part's value spreads within its tolerance t.
enum class Spread {
    // Uniform over [-t, +t] (the default): every value the tolerance allows is equally likely.
    // It assumes nothing about the maker's process and has the larger variance (t^2/3), so a
    // yield found with it is the cautious one.
    uniform,
    // Gaussian with the tolerance as 3 sigma (variance t^2/9), not truncated (beyond 3 sigma:
    // 0.27 % of the draws).
    gauss,
};

const char* to_string(Spread s);

// Relative tolerances per element kind ('r', 'c', 'l') and per part (lower-case names).
struct ToleranceSpec {
    std::map<char, double> by_kind{{'r', 0.01}, {'c', 0.05}, {'l', 0.05}};
    std::map<std::string, double> by_part;
    double of(const std::string& part) const;  // the part's own, else its kind's, else 0
};

// Reads "R=1%,C=5%,L3=0.5%,C2=0" into `spec` (entries not named keep their value): a single
// letter R, C or L names a kind, anything longer a part. Returns an error text or "".
std::string parse_tolerances(std::string_view text, ToleranceSpec& spec);

// The relative deviation drawn for one part in one trial, in units of its tolerance:
// uniform in [-1, 1), or Gaussian with sigma 1/3.
double draw(std::uint64_t seed, std::uint64_t trial, std::string_view part, Spread spread);

// 53 random bits as a double in [0, 1), from (seed, trial, stream) alone.
double unit_uniform(std::uint64_t seed, std::uint64_t trial, std::uint64_t stream);

}  // namespace deckscale
