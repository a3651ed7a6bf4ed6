// A rewrite is a sorted, conflict-checked set of byte-range edits into one file; exactly one
// function (apply_edits) writes output. With no edits the input comes back unchanged.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace deckscale {

struct Edit {
    std::uint32_t offset = 0;  // where the replaced bytes start
    std::uint32_t length = 0;  // how many bytes are replaced (0 = insertion)
    std::string text;          // what replaces them
};

class EditSet {
public:
    // Adds an edit. An edit whose text equals the bytes it replaces is not stored. Throws
    // std::logic_error naming both edits if it overlaps one already stored.
    void add(std::string_view original, Edit e);

    const std::vector<Edit>& edits() const { return edits_; }
    bool empty() const { return edits_.empty(); }
    std::size_t size() const { return edits_.size(); }

private:
    std::vector<Edit> edits_;  // sorted by offset
};

// Copies `original`, replacing the edited ranges.
std::string apply_edits(std::string_view original, const EditSet& edits);

// Copies original[begin, end) with the edits that lie inside that range applied.
std::string apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                        std::uint32_t end);

}  // namespace deckscale
