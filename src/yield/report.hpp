// A yield run as text for a terminal and as JSON.
#pragma once

#include <string>

#include "yield/run.hpp"

namespace deckscale {

struct YieldReportContext {
    std::uint64_t seed = 1;
    Spread spread = Spread::uniform;
    std::string mask;  // the mask in words
};

std::string yield_text(const YieldResult& r, const YieldReportContext& c);
std::string yield_json(const YieldResult& r, const YieldReportContext& c);

// The mask in words: "within +-1 dB of the nominal over its passband (...)".
std::string describe_mask(const Mask& m);

}  // namespace deckscale
