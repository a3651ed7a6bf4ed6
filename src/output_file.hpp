// Writing outputs atomically: a temporary file in the target's folder, then rename().
#pragma once

#include <string>
#include <string_view>

namespace deckscale {

// Writes `content` to `path` atomically. Returns an error text, empty on success.
std::string write_file_atomically(const std::string& path, std::string_view content);

}  // namespace deckscale
