// Writing outputs atomically: a temporary file in the target's folder, then rename().
#pragma once

#include <functional>
#include <string>
#include <string_view>

#include "base/byte_sink.hpp"

namespace deckscale {

// How a written file must survive a crash of the whole machine.
enum class Durability {
    atomic,  // readers see the old file or the complete new one, never a part (rename)
    synced,  // and the new file is on disk before it replaces the old one (fsync first):
             // for a file that replaces the user's own input
};

// Writes `content` to `path` atomically. Returns an error text, empty on success.
std::string write_file_atomically(const std::string& path, std::string_view content,
                                  Durability durability = Durability::atomic);

// The same, with the content produced piece by piece: `produce` writes the pieces in order
// to the sink it is given (large outputs never sit in memory as a whole).
std::string write_file_atomically(const std::string& path,
                                  const std::function<void(ByteSink&)>& produce,
                                  Durability durability = Durability::atomic);

}  // namespace deckscale
