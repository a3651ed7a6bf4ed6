#include "scale/hold_scan.hpp"

#include "base/text_util.hpp"
#include "scale/terminals.hpp"

namespace deckscale {
namespace {

// Where a card's last line end starts, and its text ("" when the card has none).
std::pair<std::uint32_t, std::string> line_end_of(const Card& c) {
    if (!c.tokens.empty() && c.tokens.back().kind == TokenKind::line_end)
        return {c.tokens.back().begin, std::string(c.text(c.tokens.back()))};
    return {c.end(), ""};
}

}  // namespace

HoldScan scan_for_holds(const Deck& deck) {
    HoldScan s;
    auto is_model = [&](const std::string& name) { return deck.symbols.models.count(name) > 0; };
    for (std::size_t f = 0; f < deck.files.size(); ++f) {
        int depth = 0;
        int region = -1;
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind == CardKind::title && f == 0) {
                auto [at, eol] = line_end_of(c);
                s.title_end = at;
                if (!eol.empty()) s.title_eol = eol;
                return;
            }
            if (c.fields.empty()) return;
            if (c.kind == CardKind::dot) {
                std::string kw = card_keyword(c);
                if (kw == ".subckt" && c.fields.size() > 1) {
                    std::string name = to_lower(c.field_text(1));
                    if (depth == 0) {
                        ScannedRegion r;
                        r.name = name;
                        r.written = std::string(c.field_text(1));
                        r.file = f;
                        r.begin = c.begin();
                        r.name_offset = c.fields[1].begin;
                        s.regions.push_back(std::move(r));
                        region = static_cast<int>(s.regions.size()) - 1;
                    } else {
                        s.regions[region].local_subckts.insert(name);
                    }
                    s.subckts[name].push_back(
                        {std::string(c.field_text(1)), f, c.fields[1].begin, depth ? region : -1});
                    ++depth;
                } else if (kw == ".ends" && depth > 0) {
                    if (--depth == 0) {
                        ScannedRegion& r = s.regions[region];
                        r.end = c.end();
                        auto [at, eol] = line_end_of(c);
                        r.copy_at = at;
                        r.eol = eol.empty() ? "\n" : eol;
                        region = -1;
                    }
                } else if (kw == ".model" && c.fields.size() > 1) {
                    std::string name = to_lower(c.field_text(1));
                    if (depth > 0) s.regions[region].local_models.insert(name);
                    s.models[name].push_back(
                        {std::string(c.field_text(1)), f, c.fields[1].begin, depth ? region : -1});
                }
                return;
            }
            if (c.kind != CardKind::element) return;
            ElementLinks links = element_links(c, is_model);
            ScannedElement e;
            e.name = std::string(c.field_text(0));
            e.file = f;
            e.offset = c.fields[0].begin;
            for (std::size_t i : links.current_nodes) e.nodes.push_back(to_lower(c.field_text(i)));
            if (links.model) e.model = to_lower(c.field_text(*links.model));
            if (links.subckt) e.subckt = to_lower(c.field_text(*links.subckt));
            e.region = depth > 0 ? region : -1;
            e.nested = depth > 1;
            s.elements.push_back(std::move(e));
        });
    }
    return s;
}

}  // namespace deckscale
