#include "scale/hold_scan.hpp"

#include <algorithm>

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


// The region (by byte range) that holds `offset` of `file`; -1 when none.
int region_by_range(const std::vector<ScannedRegion>& regions, std::size_t file,
                    std::uint32_t offset) {
    auto after = std::upper_bound(
        regions.begin(), regions.end(), std::make_pair(file, offset),
        [](const std::pair<std::size_t, std::uint32_t>& at, const ScannedRegion& r) {
            return at < std::make_pair(r.file, r.begin);
        });
    if (after == regions.begin()) return -1;
    const ScannedRegion& r = *(after - 1);
    return r.file == file && offset < r.end ? static_cast<int>(after - 1 - regions.begin()) : -1;
}

// Per file, the region (of a scan that took every file as top level) its includes sit in:
// -1 when every include of it is at the top level, shared_include when they disagree. The
// include graph is acyclic (the reader refuses cycles), so this settles within as many
// rounds as the graph is deep.
std::vector<int> files_inside_regions(const Deck& deck, const HoldScan& s) {
    std::vector<int> inside(deck.files.size(), -1);
    for (std::size_t round = 0; round <= deck.files.size(); ++round) {
        std::vector<int> next(deck.files.size(), -1);
        std::vector<bool> seen(deck.files.size(), false);
        for (const IncludeRef& inc : deck.includes) {
            int from = inside[inc.from_file];
            int where = from != -1 ? from
                                   : region_by_range(s.regions, inc.from_file, inc.path_token.begin);
            int& to = next[inc.target_file];
            if (!seen[inc.target_file]) to = where;
            else if (to != where) to = shared_include;
            seen[inc.target_file] = true;
        }
        next[0] = -1;
        if (next == inside) break;
        inside = std::move(next);
    }
    return inside;
}

// Scans one file's cards into `s`. `inside`: the region the whole file belongs to (it is
// included inside that .subckt), or -1.
void scan_file(const Deck& deck, std::size_t f, int inside, HoldScan& s) {
    auto is_model = [&](const std::string& name) { return deck.symbols.models.count(name) > 0; };
    const int floor = inside >= 0 ? 1 : 0;  // a stray .ends cannot leave the including region
    int depth = floor;
    int region = inside;
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
            } else if (kw == ".ends" && depth > floor) {
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

}  // namespace

HoldScan scan_for_holds(const Deck& deck) {
    HoldScan s;
    const std::size_t n = deck.files.size();
    for (std::size_t f = 0; f < n; ++f) scan_file(deck, f, -1, s);
    s.file_region.assign(n, -1);
    std::vector<int> inside = files_inside_regions(deck, s);
    if (std::none_of(inside.begin(), inside.end(), [](int r) { return r != -1; })) return s;
    // Again, with the files included inside a .subckt read as part of it: the top-level
    // files first (their regions are the first scan's), then those.
    HoldScan t;
    std::map<std::pair<std::size_t, std::uint32_t>, int> index;  // (file, begin): region
    for (std::size_t f = 0; f < n; ++f)
        if (inside[f] < 0) scan_file(deck, f, -1, t);
    for (std::size_t r = 0; r < t.regions.size(); ++r)
        index[{t.regions[r].file, t.regions[r].begin}] = static_cast<int>(r);
    t.file_region.assign(n, -1);
    for (std::size_t f = 0; f < n; ++f) {
        if (inside[f] == shared_include) t.file_region[f] = shared_include;
        if (inside[f] < 0) continue;
        const ScannedRegion& old = s.regions[static_cast<std::size_t>(inside[f])];
        t.file_region[f] = index.at({old.file, old.begin});
        scan_file(deck, f, t.file_region[f], t);
    }
    return t;
}

const IncludeRef* include_inside_region(const Deck& deck, const HoldScan& scan, std::size_t file) {
    for (const IncludeRef& inc : deck.includes)
        if (inc.target_file == file &&
            (scan.file_region[inc.from_file] >= 0 ||
             region_by_range(scan.regions, inc.from_file, inc.path_token.begin) >= 0))
            return &inc;
    return nullptr;
}

}  // namespace deckscale
