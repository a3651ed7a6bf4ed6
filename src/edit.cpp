#include "edit.hpp"

#include <algorithm>
#include <stdexcept>

#include <fmt/format.h>

namespace deckscale {
namespace {

std::string describe(const Edit& e) {
    return fmt::format("[{}, {}) -> \"{}\"", e.offset, e.offset + e.length, e.text);
}

bool overlaps(const Edit& a, const Edit& b) {
    // Two insertions at one offset, or an insertion inside a replaced range, conflict too.
    if (a.offset == b.offset) return true;
    const Edit& first = a.offset < b.offset ? a : b;
    const Edit& second = a.offset < b.offset ? b : a;
    return first.offset + first.length > second.offset;
}

}  // namespace

void EditSet::add(std::string_view original, Edit e) {
    if (e.offset + e.length > original.size())
        throw std::logic_error(fmt::format("edit {} lies outside the file", describe(e)));
    if (original.substr(e.offset, e.length) == e.text) return;
    auto it = std::lower_bound(edits_.begin(), edits_.end(), e.offset,
                               [](const Edit& x, std::uint32_t off) { return x.offset < off; });
    if (it != edits_.end() && overlaps(*it, e))
        throw std::logic_error(fmt::format("overlapping edits {} and {}", describe(*it), describe(e)));
    if (it != edits_.begin() && overlaps(*(it - 1), e))
        throw std::logic_error(
            fmt::format("overlapping edits {} and {}", describe(*(it - 1)), describe(e)));
    edits_.insert(it, std::move(e));
}

std::string apply_edits(std::string_view original, const EditSet& edits) {
    return apply_edits(original, edits, 0, static_cast<std::uint32_t>(original.size()));
}

std::string apply_edits(std::string_view original, const EditSet& edits, std::uint32_t begin,
                        std::uint32_t end) {
    std::string out;
    std::size_t grow = 0;
    for (const auto& e : edits.edits()) grow += e.text.size();
    out.reserve(end - begin + grow);
    std::size_t pos = begin;
    auto it = std::lower_bound(edits.edits().begin(), edits.edits().end(), begin,
                               [](const Edit& x, std::uint32_t off) { return x.offset < off; });
    for (; it != edits.edits().end() && it->offset + it->length <= end; ++it) {
        if (it->offset == end && it->length == 0 && end != original.size()) break;
        out.append(original.substr(pos, it->offset - pos));
        out.append(it->text);
        pos = it->offset + it->length;
    }
    out.append(original.substr(pos, end - pos));
    return out;
}

}  // namespace deckscale
