#include "scale/tolerances.hpp"

#include <fmt/format.h>

#include "deck/spice_number.hpp"
#include "scale/rules.hpp"

namespace deckscale {

void write_solver_tolerances(ScalePass& p) {
    struct Default {
        const char* key;
        double value;
    };
    const Default defaults[] = {{"abstol", 1e-12}, {"chgtol", 1e-14}};
    std::string options;
    double first_factor = 1;
    for (const auto& d : defaults) {
        if (p.option_given(d.key)) continue;
        double k = factor_of(*find_rule(".options", d.key), p.factors());
        if (k == 1) continue;
        options += fmt::format(" {}={}", d.key, format_plain(d.value * k, p.digits()));
        if (first_factor == 1) first_factor = k;
    }
    if (options.empty()) return;
    // A card of its own, in the line-end style of the .tran card, before the line end that
    // closes that card (after its continuation lines and trailing comment).
    const Card& c = p.card();
    std::string eol = "\n";
    for (const auto& t : c.tokens)
        if (t.kind == TokenKind::line_end) eol = std::string(c.text(t));
    std::uint32_t at = c.end();
    if (!c.tokens.empty() && c.tokens.back().kind == TokenKind::line_end)
        at = c.tokens.back().begin;
    p.insert(at, eol + ".options" + options, "solver tolerances written out", first_factor);
}

}  // namespace deckscale
