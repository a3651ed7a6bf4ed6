// The stress of a rescaled deck's parts as a table for a terminal and as JSON.
#pragma once

#include <string>

#include "stress/measure.hpp"

namespace deckscale {

std::string stress_text(const StressResult& r, const StressRequest& request);
std::string stress_json(const StressResult& r, const StressRequest& request);

}  // namespace deckscale
