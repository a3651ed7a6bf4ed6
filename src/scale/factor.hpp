// Scale factors as the user writes them: a SPICE number ("1k", "2.2MEG"), "pi", or a
// product/quotient of those ("2*pi*1k", "1/50").
#pragma once

#include <optional>
#include <string_view>

namespace deckscale {

// The value, or nullopt if the text is not such an expression.
std::optional<double> parse_factor(std::string_view text);

}  // namespace deckscale
