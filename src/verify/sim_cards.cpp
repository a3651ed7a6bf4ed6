#include "verify/sim_cards.hpp"

#include <set>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "scale/rescale.hpp"
#include "verify/tight_tolerances.hpp"
#include "write/flatten.hpp"

namespace deckscale {
namespace {

const std::set<std::string>& removed_cards() {
    static const std::set<std::string> s{".ac", ".dc", ".tran", ".op", ".noise", ".disto", ".pz",
                                         ".sens", ".tf", ".sp", ".pss", ".four", ".meas",
                                         ".measure", ".print", ".plot", ".probe", ".save",
                                         ".width", ".end"};
    return s;
}

// Removes a whole card; edits already made inside it (none are expected on analysis and
// output cards) give way.
void remove_card(EditSet& edits, std::string_view text, const Card& c) {
    EditSet kept;
    for (std::size_t i = 0; i < edits.size(); ++i) {
        EditView e = edits.at(i);
        if (e.offset + e.length <= c.begin() || e.offset >= c.end())
            kept.add(text, Edit{e.offset, e.length, std::string(e.text)});
    }
    kept.add(text, Edit{c.begin(), c.end() - c.begin(), ""});
    edits = std::move(kept);
}

bool kept_measure(const Card& c, const std::string& analysis) {
    std::string kw = card_keyword(c);
    return !analysis.empty() && (kw == ".meas" || kw == ".measure") && c.fields.size() > 2 &&
           iequals(c.field_text(1), analysis);
}

}  // namespace

std::vector<std::string> simulation_cards(const Deck& deck, const SimDeckOptions& o) {
    // A value written as a bare parameter name ("R1 a b rval") works in ngspice 39 but with a
    // "can't find model" warning, which the simulator layer rightly treats as an error: the
    // copy that is simulated spells it "{rval}", which means the same and draws no warning.
    ScaleSettings braces;
    braces.brace_bare_params = true;
    braces.record_changes = false;
    ScaleResult braced = scale_deck(deck, braces);
    std::vector<EditSet> edits = std::move(braced.edits);
    edits.resize(deck.files.size());
    for (std::size_t f = 0; f < deck.files.size(); ++f) {
        std::string_view text = deck.files[f].source->text();
        deck.visit_file(f, [&](const Card& c) {
            bool remove = c.kind == CardKind::control || c.kind == CardKind::after_end ||
                          (c.kind == CardKind::dot && removed_cards().count(card_keyword(c)) &&
                           !kept_measure(c, o.keep_measures));
            if (remove) {
                remove_card(edits[f], text, c);
                return;
            }
            if (!o.drive.empty() && c.kind == CardKind::element && card_keyword(c) == o.drive) {
                const Token& last = c.fields.back();
                edits[f].add(text, Edit{last.end, 0, fmt::format(" ac {:.17g}", o.drive_ac)});
            }
        });
    }
    std::string flat = flatten_deck(deck, edits);
    std::vector<std::string> cards;
    std::size_t pos = 0;
    while (pos <= flat.size()) {
        std::size_t nl = flat.find('\n', pos);
        std::string line = flat.substr(pos, nl == std::string::npos ? std::string::npos : nl - pos);
        if (!line.empty() && line.back() == '\r') line.pop_back();
        cards.push_back(std::move(line));
        if (nl == std::string::npos) break;
        pos = nl + 1;
    }
    if (!cards.empty() && cards.front().rfind("\xEF\xBB\xBF", 0) == 0) cards.front().erase(0, 3);
    while (cards.size() > 1 && cards.back().empty()) cards.pop_back();
    if (cards.empty()) cards.push_back("deck");
    if (cards.front().empty()) cards.front() = "untitled deck";
    if (o.tight_tolerances && has_junction_devices(deck))
        cards.push_back(tight_options_card(*o.tight_tolerances));
    for (const auto& extra : o.extra_cards) cards.push_back(extra);
    cards.push_back(o.analysis);
    cards.push_back(".end");
    return cards;
}

}  // namespace deckscale
