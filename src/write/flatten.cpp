#include "write/flatten.hpp"

#include <fmt/format.h>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

struct IncludeCard {
    std::uint32_t begin, end;  // the whole card
    const IncludeRef* ref;
};

std::vector<IncludeCard> include_cards(const Deck& deck, std::size_t file) {
    std::vector<IncludeCard> out;
    deck.visit_file(file, [&](const Card& c) {
        if (c.kind != CardKind::dot || c.fields.size() < 2) return;
        if (const IncludeRef* r = deck.include_at(file, c.fields[1].begin))
            out.push_back({c.begin(), c.end(), r});
    });
    return out;
}

// [begin, end) of the cards of a .lib section (between ".lib name" and ".endl").
std::pair<std::uint32_t, std::uint32_t> section_range(const Deck& deck, std::size_t file,
                                                       const std::string& section) {
    std::uint32_t begin = 0, end = 0;
    bool inside = false, done = false;
    deck.visit_file(file, [&](const Card& c) {
        if (done || c.kind != CardKind::dot) return;
        std::string kw = card_keyword(c);
        if (!inside && kw == ".lib" && c.fields.size() == 2 && iequals(c.field_text(1), section)) {
            inside = true;
            begin = c.end();
        } else if (inside && kw == ".endl") {
            end = c.begin();
            done = true;
        }
    });
    if (!done) {
        const auto& src = *deck.files[file].source;
        throw DeckError(Diagnostic{Severity::error, src.path(), 0, 0, 0, "",
                                   fmt::format("library section '{}' not found", section), {}});
    }
    return {begin, end};
}

std::string flatten_range(const Deck& deck, const std::vector<EditSet>& edits, std::size_t file,
                          std::uint32_t begin, std::uint32_t end) {
    std::string_view text = deck.files[file].source->text();
    std::string out;
    std::uint32_t pos = begin;
    for (const auto& inc : include_cards(deck, file)) {
        if (inc.begin < begin || inc.end > end) continue;
        out += apply_edits(text, edits[file], pos, inc.begin);
        const auto& target = *deck.files[inc.ref->target_file].source;
        out += fmt::format("* deckscale: contents of {}{} follow\n", target.path(),
                           inc.ref->section.empty() ? "" : " section " + inc.ref->section);
        std::uint32_t tb = 0, te = static_cast<std::uint32_t>(target.text().size());
        if (!inc.ref->section.empty())
            std::tie(tb, te) = section_range(deck, inc.ref->target_file, inc.ref->section);
        std::string inner = flatten_range(deck, edits, inc.ref->target_file, tb, te);
        if (!inner.empty() && inner.back() != '\n') inner += '\n';
        out += inner;
        out += fmt::format("* deckscale: end of {}\n", target.path());
        pos = inc.end;
    }
    out += apply_edits(text, edits[file], pos, end);
    return out;
}

}  // namespace

std::string flatten_deck(const Deck& deck, const std::vector<EditSet>& edits) {
    return flatten_range(deck, edits, 0, 0, static_cast<std::uint32_t>(deck.top().text().size()));
}

}  // namespace deckscale
