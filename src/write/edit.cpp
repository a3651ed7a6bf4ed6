#include "write/edit.hpp"

#include <algorithm>
#include <stdexcept>

#include <fmt/format.h>

namespace deckscale {
namespace {

std::string describe(std::uint32_t offset, std::uint32_t length, std::string_view text) {
    return fmt::format("[{}, {}) -> \"{}\"", offset, offset + length, text);
}

bool overlaps(const EditView& a, const EditView& b) {
    // Two insertions at one offset, or an insertion inside a replaced range, conflict too.
    if (a.offset == b.offset) return true;
    const EditView& first = a.offset < b.offset ? a : b;
    const EditView& second = a.offset < b.offset ? b : a;
    return first.offset + first.length > second.offset;
}

// Throws the error for two overlapping edits, naming both.
[[noreturn]] void overlap_error(const EditView& a, const EditView& b) {
    throw std::logic_error(fmt::format("overlapping edits {} and {}",
                                       describe(a.offset, a.length, a.text),
                                       describe(b.offset, b.length, b.text)));
}

}  // namespace

std::size_t EditSet::Segment::lower_bound(std::uint32_t offset) const {
    // Edits usually arrive in file order: check the end first.
    if (slots.empty() || slots.back().offset < offset) return slots.size();
    auto it = std::lower_bound(slots.begin(), slots.end(), offset,
                               [](const Slot& x, std::uint32_t off) { return x.offset < off; });
    return static_cast<std::size_t>(it - slots.begin());
}

EditView EditSet::at(std::size_t i) const {
    for (const Segment& seg : segments_) {
        if (i < seg.slots.size()) return seg.view(i);
        i -= seg.slots.size();
    }
    throw std::out_of_range("EditSet::at");
}

void EditSet::reserve(std::size_t edits, std::size_t text_bytes) {
    if (segments_.empty()) segments_.emplace_back();
    Segment& seg = segments_.back();
    seg.slots.reserve(seg.slots.size() + edits);
    seg.texts.reserve(seg.texts.size() + text_bytes);
}

void EditSet::merge_segments() {
    if (segments_.size() < 2) return;
    Segment all;
    all.slots.reserve(size_);
    for (Segment& seg : segments_) {
        auto shift = static_cast<std::uint32_t>(all.texts.size());
        all.texts += seg.texts;
        for (Slot s : seg.slots) {
            s.text_begin += shift;
            all.slots.push_back(s);
        }
    }
    segments_.clear();
    segments_.push_back(std::move(all));
}

void EditSet::add(std::string_view original, std::uint32_t offset, std::uint32_t length,
                  std::string_view text) {
    const EditView e{offset, length, text};
    if (e.offset + e.length > original.size())
        throw std::logic_error(
            fmt::format("edit {} lies outside the file", describe(e.offset, e.length, e.text)));
    if (original.substr(e.offset, e.length) == e.text) return;
    // The usual case appends to the last segment; an edit further back (rare) goes into one
    // segment that holds everything.
    if (segments_.size() > 1 && !segments_.back().slots.empty() &&
        e.offset <= segments_.back().slots.back().offset)
        merge_segments();
    if (segments_.empty()) segments_.emplace_back();
    Segment& seg = segments_.back();
    std::size_t i = seg.lower_bound(e.offset);
    auto check = [&](const EditView& other) {
        if (overlaps(other, e)) overlap_error(other, e);
    };
    if (i < seg.slots.size()) check(seg.view(i));
    if (i > 0) {
        check(seg.view(i - 1));
    } else if (segments_.size() > 1) {  // the last edit of the segment before
        const Segment& before = segments_[segments_.size() - 2];
        if (!before.slots.empty()) check(before.view(before.slots.size() - 1));
    }
    Slot s{e.offset, e.length, static_cast<std::uint32_t>(seg.texts.size()),
           static_cast<std::uint32_t>(e.text.size())};
    seg.texts += e.text;
    if (i == seg.slots.size())
        seg.slots.push_back(s);
    else
        seg.slots.insert(seg.slots.begin() + static_cast<std::ptrdiff_t>(i), s);
    ++size_;
}

void EditSet::add_after(std::string_view original, std::uint32_t offset, std::string_view text) {
    merge_segments();
    if (!segments_.empty()) {
        Segment& seg = segments_.back();
        std::size_t i = seg.lower_bound(offset);
        if (i < seg.slots.size() && seg.slots[i].offset == offset && seg.slots[i].length == 0) {
            std::string joined = std::string(seg.view(i).text) + std::string(text);
            seg.slots[i].text_begin = static_cast<std::uint32_t>(seg.texts.size());
            seg.slots[i].text_size = static_cast<std::uint32_t>(joined.size());
            seg.texts += joined;
            return;
        }
    }
    add(original, offset, 0, text);
}

void EditSet::append(EditSet&& later) {
    if (later.empty()) return;
    if (!empty()) {
        EditView last = at(size_ - 1), first = later.at(0);
        if (first.offset < last.offset || overlaps(last, first)) overlap_error(last, first);
    }
    // Segments with no edits (reserved room only) are dropped; the others are moved.
    std::erase_if(segments_, [](const Segment& seg) { return seg.slots.empty(); });
    for (Segment& seg : later.segments_)
        if (!seg.slots.empty()) segments_.push_back(std::move(seg));
    size_ += later.size_;
    later.segments_.clear();
    later.size_ = 0;
}

std::string apply_edits(std::string_view original, const EditSet& edits) {
    return apply_edits(original, edits, 0, static_cast<std::uint32_t>(original.size()));
}

void apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                 std::uint32_t end, ByteSink& sink) {
    std::size_t pos = begin;
    edits.visit_from(begin, [&](const EditView& e) {
        if (e.offset + e.length > end) return false;
        // An insertion exactly at `end` belongs to what follows, except at the file's end.
        if (e.offset == end && e.length == 0 && end != original.size()) return false;
        sink.write(original.substr(pos, e.offset - pos));
        sink.write(e.text);
        pos = e.offset + e.length;
        return true;
    });
    if (end > pos) sink.write(original.substr(pos, end - pos));
}

std::string apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                        std::uint32_t end) {
    std::string out;
    out.reserve(end - begin + (end - begin) / 8);
    StringSink sink(out);
    apply_edits(original, edits, begin, end, sink);
    sink.flush();
    return out;
}

}  // namespace deckscale
