// A rewrite is a sorted, conflict-checked set of byte-range edits into one file; exactly one
// function (apply_edits) writes output. With no edits the input comes back unchanged.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "base/big_buffer.hpp"
#include "base/byte_sink.hpp"

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
    void add(std::string_view original, const Edit& e) { add(original, e.offset, e.length, e.text); }
    void add(std::string_view original, std::uint32_t offset, std::uint32_t length,
             std::string_view text);

    // An insertion at `offset` that follows any insertion already stored there (the two
    // become one); otherwise as add(). For text appended at a file's end, where the last
    // card may already have an insertion.
    void add_after(std::string_view original, std::uint32_t offset, std::string_view text);

    // Appends the edits of a set whose edits all lie after this set's (throws std::logic_error
    // if the first of them overlaps the last of these). Its storage is taken over, not copied.
    void append(EditSet&& later);

    // Room for that many more edits and bytes of new text (untouched room costs no memory).
    void reserve(std::size_t edits, std::size_t text_bytes);

    bool empty() const { return size_ == 0; }
    std::size_t size() const { return size_; }
    EditView at(std::size_t i) const;

    // Calls f(EditView) for every edit in offset order, starting at the first edit whose
    // offset is at least `from`, until f returns false.
    template <typename F>
    void visit_from(std::uint32_t from, F&& f) const {
        for (const Segment& seg : segments_) {
            if (seg.slots.empty() || seg.slots.back().offset < from) continue;
            for (std::size_t i = seg.lower_bound(from); i < seg.slots.size(); ++i)
                if (!f(seg.view(i))) return;
            from = 0;
        }
    }

private:
    // Edits of a large deck number in the millions: 16 bytes each plus their text, kept in
    // one buffer per segment, rather than a std::string per edit. A set is one segment,
    // or several when sets made for consecutive pieces of a file were appended.
    struct Slot {
        std::uint32_t offset, length, text_begin, text_size;
    };
    struct Segment {
        std::vector<Slot, BigAllocator<Slot>> slots;  // sorted by offset; before the next segment's
        std::basic_string<char, std::char_traits<char>, BigAllocator<char>> texts;
        std::size_t lower_bound(std::uint32_t offset) const;
        EditView view(std::size_t i) const {
            const Slot& s = slots[i];
            return {s.offset, s.length, std::string_view(texts).substr(s.text_begin, s.text_size)};
        }
    };
    void merge_segments();

    std::vector<Segment> segments_;
    std::size_t size_ = 0;
};

// Writes original[begin, end), with the edits that lie inside that range applied, to `sink`.
// The one place that turns edits into output; the functions below use it.
void apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                 std::uint32_t end, ByteSink& sink);

// Copies `original`, replacing the edited ranges.
std::string apply_edits(std::string_view original, const EditSet& edits);

// Copies original[begin, end) with the edits that lie inside that range applied.
std::string apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                        std::uint32_t end);

}  // namespace deckscale
