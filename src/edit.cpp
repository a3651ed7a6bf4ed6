#include "edit.hpp"

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

}  // namespace

std::size_t EditSet::lower_bound(std::uint32_t offset) const {
    // Edits usually arrive in file order: check the end first.
    if (slots_.empty() || slots_.back().offset < offset) return slots_.size();
    auto it = std::lower_bound(slots_.begin(), slots_.end(), offset,
                               [](const Slot& x, std::uint32_t off) { return x.offset < off; });
    return static_cast<std::size_t>(it - slots_.begin());
}

void EditSet::add(std::string_view original, const Edit& e) {
    if (e.offset + e.length > original.size())
        throw std::logic_error(
            fmt::format("edit {} lies outside the file", describe(e.offset, e.length, e.text)));
    if (original.substr(e.offset, e.length) == e.text) return;
    EditView v{e.offset, e.length, e.text};
    std::size_t i = lower_bound(e.offset);
    for (std::size_t j : {i, i - 1}) {
        if (j >= slots_.size()) continue;  // also catches i - 1 when i == 0
        EditView other = at(j);
        if (overlaps(other, v))
            throw std::logic_error(fmt::format("overlapping edits {} and {}",
                                               describe(other.offset, other.length, other.text),
                                               describe(e.offset, e.length, e.text)));
    }
    Slot s{e.offset, e.length, static_cast<std::uint32_t>(texts_.size()),
           static_cast<std::uint32_t>(e.text.size())};
    texts_ += e.text;
    slots_.insert(slots_.begin() + static_cast<std::ptrdiff_t>(i), s);
}

void EditSet::append(EditSet&& later) {
    if (later.empty()) return;
    if (empty()) {
        *this = std::move(later);
        return;
    }
    EditView last = at(size() - 1), first = later.at(0);
    if (first.offset < last.offset || overlaps(last, first))
        throw std::logic_error(fmt::format("overlapping edits {} and {}",
                                           describe(last.offset, last.length, last.text),
                                           describe(first.offset, first.length, first.text)));
    auto shift = static_cast<std::uint32_t>(texts_.size());
    texts_ += later.texts_;
    slots_.reserve(slots_.size() + later.slots_.size());
    for (Slot s : later.slots_) {
        s.text_begin += shift;
        slots_.push_back(s);
    }
}

std::string apply_edits(std::string_view original, const EditSet& edits) {
    return apply_edits(original, edits, 0, static_cast<std::uint32_t>(original.size()));
}

void apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                 std::uint32_t end, const std::function<void(std::string_view)>& sink) {
    std::size_t pos = begin;
    // First edit at or after `begin`.
    std::size_t lo = 0, hi = edits.size();
    while (lo < hi) {
        std::size_t mid = (lo + hi) / 2;
        if (edits.at(mid).offset < begin) lo = mid + 1;
        else hi = mid;
    }
    for (std::size_t i = lo; i < edits.size(); ++i) {
        EditView e = edits.at(i);
        if (e.offset + e.length > end) break;
        // An insertion exactly at `end` belongs to what follows, except at the file's end.
        if (e.offset == end && e.length == 0 && end != original.size()) break;
        if (e.offset > pos) sink(original.substr(pos, e.offset - pos));
        if (!e.text.empty()) sink(e.text);
        pos = e.offset + e.length;
    }
    if (end > pos) sink(original.substr(pos, end - pos));
}

std::string apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                        std::uint32_t end) {
    std::string out;
    out.reserve(end - begin + (end - begin) / 8);
    apply_edits(original, edits, begin, end, [&](std::string_view piece) { out.append(piece); });
    return out;
}

}  // namespace deckscale
