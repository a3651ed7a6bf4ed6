// Writing outputs atomically: a temporary file in the target's folder, then rename().
#pragma once

#include <functional>
#include <string>
#include <string_view>

namespace deckscale {

// Writes `content` to `path` atomically. Returns an error text, empty on success.
std::string write_file_atomically(const std::string& path, std::string_view content);

// The same, with the content produced piece by piece: `produce` calls its argument with each
// piece in order (large outputs never sit in memory as a whole).
using PieceSink = std::function<void(std::string_view)>;
std::string write_file_atomically(const std::string& path,
                                  const std::function<void(const PieceSink&)>& produce);

}  // namespace deckscale
