#include "deck/circuit_cards.hpp"

#include <set>
#include <string>
#include <vector>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

struct FileUse {
    bool whole = false;              // included with .include (or the deck itself)
    std::set<std::string> sections;  // .lib sections selected
    bool in_subckt = false;          // included inside a .subckt
    bool operator==(const FileUse&) const = default;
};

// Walks one file's cards with the .subckt depth and the .lib section each sits in; calls
// `card(c, depth, active)`, active when the card is in a part of the file that is used.
template <class F>
void walk(const Deck& deck, std::size_t f, const FileUse& use, F&& card) {
    int depth = 0;
    std::string section;
    deck.visit_file(f, [&](const Card& c) {
        bool active = use.whole || (!section.empty() && use.sections.count(section));
        if (c.kind == CardKind::dot) {
            std::string kw = card_keyword(c);
            if (kw == ".subckt") ++depth;
            if (kw == ".ends" && depth > 0) --depth;
            if (kw == ".endl") section.clear();
            if (kw == ".lib" && c.fields.size() >= 2 && !deck.include_at(f, c.fields[1].begin))
                section = to_lower(c.field_text(1));
        }
        card(c, depth, active);
    });
}

}  // namespace

void visit_circuit_elements(const Deck& deck, const CircuitCardVisitor& visit) {
    std::size_t n = deck.files.size();
    std::vector<FileUse> uses(n);
    uses[0].whole = true;
    // Files are numbered as the reader meets them, so an including file comes before the file
    // it includes, except where a later file includes an earlier one again: repeat until
    // nothing changes (at most a few rounds).
    for (bool changed = true; changed;) {
        changed = false;
        std::vector<FileUse> next = uses;
        for (std::size_t f = 0; f < n; ++f) {
            if (!uses[f].whole && uses[f].sections.empty()) continue;
            walk(deck, f, uses[f], [&](const Card& c, int depth, bool active) {
                if (!active || c.kind != CardKind::dot || c.fields.size() < 2) return;
                const IncludeRef* inc = deck.include_at(f, c.fields[1].begin);
                if (!inc || inc->target_file >= n) return;
                FileUse& to = next[inc->target_file];
                if (inc->section.empty())
                    to.whole = true;
                else
                    to.sections.insert(to_lower(inc->section));
                to.in_subckt = to.in_subckt || uses[f].in_subckt || depth > 0;
            });
        }
        if (next != uses) {
            uses = std::move(next);
            changed = true;
        }
    }
    for (std::size_t f = 0; f < n; ++f) {
        if (!uses[f].whole && uses[f].sections.empty()) continue;
        walk(deck, f, uses[f], [&](const Card& c, int depth, bool active) {
            if (active && c.kind == CardKind::element) visit(f, c, uses[f].in_subckt || depth > 0);
        });
    }
}

}  // namespace deckscale
