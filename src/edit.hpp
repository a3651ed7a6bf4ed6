// A rewrite is a sorted, conflict-checked set of byte-range edits into one file; exactly one
// function (apply_edits) writes output. With no edits the input comes back unchanged.
#pragma once

#include <cstdint>
#include <functional>
#include <string>
#include <string_view>
#include <vector>

namespace deckscale {

struct Edit {
    std::uint32_t offset = 0;  // where the replaced bytes start
    std::uint32_t length = 0;  // how many bytes are replaced (0 = insertion)
    std::string text;          // what replaces them
};

// A stored edit, its text viewed in the set's own storage.
struct EditView {
    std::uint32_t offset;
    std::uint32_t length;
    std::string_view text;
};

class EditSet {
public:
    // Adds an edit. An edit whose text equals the bytes it replaces is not stored. Throws
    // std::logic_error naming both edits if it overlaps one already stored.
    void add(std::string_view original, const Edit& e);

    // Appends the edits of a set whose edits all lie after this set's (throws std::logic_error
    // if the first of them overlaps the last of these).
    void append(EditSet&& later);

    // Room for that many edits and bytes of new text (untouched room costs no memory).
    void reserve(std::size_t edits, std::size_t text_bytes) {
        slots_.reserve(edits);
        texts_.reserve(text_bytes);
    }

    bool empty() const { return slots_.empty(); }
    std::size_t size() const { return slots_.size(); }
    EditView at(std::size_t i) const {
        const Slot& s = slots_[i];
        return {s.offset, s.length, std::string_view(texts_).substr(s.text_begin, s.text_size)};
    }

private:
    // Edits of a large deck number in the millions: 16 bytes each plus their text, kept in
    // one buffer, rather than a std::string per edit.
    struct Slot {
        std::uint32_t offset, length, text_begin, text_size;
    };
    std::size_t lower_bound(std::uint32_t offset) const;

    std::vector<Slot> slots_;  // sorted by offset
    std::string texts_;
};

// Hands original[begin, end), with the edits that lie inside that range applied, to `sink`
// in pieces. The one place that turns edits into output; the functions below use it.
void apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                 std::uint32_t end, const std::function<void(std::string_view)>& sink);

// Copies `original`, replacing the edited ranges.
std::string apply_edits(std::string_view original, const EditSet& edits);

// Copies original[begin, end) with the edits that lie inside that range applied.
std::string apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                        std::uint32_t end);

}  // namespace deckscale
