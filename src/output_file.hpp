// Writing outputs atomically: a temporary file in the target's folder, then rename().
#pragma once

#include <functional>
#include <string>
#include <string_view>

#include "byte_sink.hpp"

namespace deckscale {

// Writes `content` to `path` atomically. Returns an error text, empty on success.
std::string write_file_atomically(const std::string& path, std::string_view content);

// The same, with the content produced piece by piece: `produce` writes the pieces in order
// to the sink it is given (large outputs never sit in memory as a whole).
std::string write_file_atomically(const std::string& path,
                                  const std::function<void(ByteSink&)>& produce);

}  // namespace deckscale
