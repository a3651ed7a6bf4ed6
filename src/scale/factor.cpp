#include "scale/factor.hpp"

#include <cmath>
#include <numbers>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"

namespace deckscale {

std::optional<double> parse_factor(std::string_view text) {
    double result = 1;
    char op = '*';
    std::size_t pos = 0;
    if (text.empty()) return std::nullopt;
    while (pos <= text.size()) {
        std::size_t next = text.find_first_of("*/", pos);
        std::string_view term = text.substr(pos, next == std::string_view::npos ? text.npos : next - pos);
        while (!term.empty() && term.front() == ' ') term.remove_prefix(1);
        while (!term.empty() && term.back() == ' ') term.remove_suffix(1);
        double v;
        if (iequals(term, "pi")) {
            v = std::numbers::pi;
        } else {
            auto p = parse_spice_number(term);
            if (!p.number || !p.number->tail.empty()) return std::nullopt;
            v = p.number->value;
        }
        result = op == '*' ? result * v : result / v;
        if (next == std::string_view::npos) break;
        op = text[next];
        pos = next + 1;
    }
    if (!std::isfinite(result)) return std::nullopt;
    return result;
}

}  // namespace deckscale
