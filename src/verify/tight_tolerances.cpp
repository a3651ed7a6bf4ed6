#include "verify/tight_tolerances.hpp"

#include <fmt/format.h>

#include "base/text_util.hpp"

namespace deckscale {

namespace {

constexpr double kReltol = 1e-7;
constexpr double kAbstol = 1e-15;  // A, for the original deck
constexpr double kVntol = 1e-9;    // V
constexpr double kChgtol = 1e-17;  // C, for the original deck

}  // namespace

bool has_junction_devices(const Deck& deck) {
    bool found = false;
    for (std::size_t f = 0; f < deck.files.size() && !found; ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (found || c.kind != CardKind::element || c.fields.empty()) return;
            char letter = ascii_lower(c.field_text(0)[0]);
            found =
                letter == 'd' || letter == 'q' || letter == 'j' || letter == 'z' || letter == 'm';
        });
    return found;
}

std::string tight_options_card(ScaleFactors f) {
    return fmt::format(".options reltol={:.12g} abstol={:.12g} vntol={:.12g} chgtol={:.12g}",
                       kReltol, kAbstol * factor_of(Unit::ampere, f), kVntol,
                       kChgtol * factor_of(Unit::farad, f));
}

}  // namespace deckscale
