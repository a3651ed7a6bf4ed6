// One part a scaling run kept as written (scale --hold), and why: for the change report.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "deck/diagnostic.hpp"

namespace deckscale {

struct HeldPart {
    std::string kind;          // "element", "instance" (an X line), "model" or "subckt"
    std::string name;          // as written
    std::size_t file = 0;      // index into Deck::files of its card
    std::uint32_t offset = 0;  // its card (the element line, the .model or .subckt card)
    std::string why;           // "asked: --hold XU1", "used by held parts: XU1", ...
    std::string copy;          // the scaled copy the scaled parts use instead ("" if none)
    // What scaling it would have refused (it could not have followed the factors anyway).
    std::vector<Diagnostic> could_not_follow;
};

}  // namespace deckscale
