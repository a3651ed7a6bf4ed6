// Writing outputs atomically: each file goes to a temporary file in the target's folder and is
// renamed into place only when every file of the run has been written whole. A failure, an
// exception or an interrupting signal leaves the old files (or none) and no temporary file.
#pragma once

#include <functional>
#include <string>
#include <string_view>
#include <vector>

#include "base/byte_sink.hpp"

namespace deckscale {

// How a written file must survive a crash of the whole machine.
enum class Durability {
    atomic,  // readers see the old file or the complete new one, never a part (rename)
    synced,  // and the new file is on disk before it replaces the old one (fsync first):
             // for a file that replaces the user's own input
};

// The outputs of one run. `add` writes a file's new content beside it under a temporary
// name; `commit` renames them all into place. Until `commit`, no target has changed, and a
// batch destroyed uncommitted (an error, an exception) removes its temporary files.
class OutputBatch {
public:
    OutputBatch() = default;
    OutputBatch(const OutputBatch&) = delete;
    OutputBatch& operator=(const OutputBatch&) = delete;
    ~OutputBatch();

    // Returns an error text, empty on success. On an error nothing of this file remains.
    std::string add(const std::string& path, const std::function<void(ByteSink&)>& produce,
                    Durability durability = Durability::atomic);
    std::string add(const std::string& path, std::string_view content,
                    Durability durability = Durability::atomic);
    // Renames every added file into place, in the order added. Returns an error text.
    std::string commit();

private:
    struct Pending {
        std::string target;
        std::string temporary;
        int slot;  // in the registry that remove_unfinished_outputs() empties
    };
    std::vector<Pending> pending_;
};

// Writes `content` to `path` atomically (a batch of one). Returns an error text.
std::string write_file_atomically(const std::string& path, std::string_view content,
                                  Durability durability = Durability::atomic);
std::string write_file_atomically(const std::string& path,
                                  const std::function<void(ByteSink&)>& produce,
                                  Durability durability = Durability::atomic);

// Removes every temporary file of every uncommitted batch. Async-signal-safe: meant for a
// handler of SIGINT/SIGTERM that then ends the process (the command line installs one).
void remove_unfinished_outputs() noexcept;

}  // namespace deckscale
