// Helpers shared by the tests of the scaling pass: scale a deck held in memory and look at
// what came out (the rewritten text, the change list, the diagnostics).
#pragma once

#include <cmath>
#include <map>
#include <string>
#include <vector>

#include "base/file_system.hpp"
#include "deck/load.hpp"
#include "deck/spice_number.hpp"
#include "scale/rescale.hpp"
#include "write/edit.hpp"

namespace deckscale::test {

struct Scaled {
    std::vector<std::string> texts;  // every file of the deck, edits applied ([0] = top deck)
    ScaleResult result;
    const std::string& text() const { return texts.front(); }
};

// Scales `deck` (path "deck.cir", plus `extra` files by path) entirely in memory.
inline Scaled scale_with(const std::string& deck, const ScaleSettings& s,
                         const std::map<std::string, std::string>& extra = {}) {
    MemoryFileSystem fs;
    fs.add("deck.cir", deck);
    for (const auto& [path, text] : extra) fs.add(path, text);
    Deck d = load_deck("deck.cir", fs);
    Scaled out;
    out.result = scale_deck(d, s);
    for (std::size_t i = 0; i < d.files.size(); ++i)
        out.texts.push_back(apply_edits(d.files[i].source->text(), out.result.edits[i]));
    return out;
}

inline Scaled scale_text(const std::string& deck, double km, double kf, int digits = 7,
                         bool mark = false,
                         const std::map<std::string, std::string>& extra = {}) {
    ScaleSettings s;
    s.factors = {km, kf};
    s.digits = digits;
    s.mark_unscalable = mark;
    return scale_with(deck, s, extra);
}

// The value a number token stands for; NaN when it is not a plain number.
inline double number_value(std::string_view text) {
    auto p = parse_spice_number(text);
    return p.number ? p.number->value : std::nan("");
}

inline bool close_to(double a, double b, double rel) {
    return std::fabs(a - b) <= rel * std::max(std::fabs(a), std::fabs(b));
}

// The whitespace-separated fields of line `n` (0-based) of a text, with '(', ')', ',' and '='
// treated as blanks too.
inline std::vector<std::string> line_fields(const std::string& text, std::size_t n) {
    std::size_t start = 0;
    for (std::size_t i = 0; i < n; ++i) start = text.find('\n', start) + 1;
    std::string line = text.substr(start, text.find('\n', start) - start);
    std::vector<std::string> out;
    std::string cur;
    for (char c : line) {
        if (c == ' ' || c == '\t' || c == '(' || c == ')' || c == ',' || c == '=' || c == '\r') {
            if (!cur.empty()) out.push_back(cur);
            cur.clear();
        } else {
            cur += c;
        }
    }
    if (!cur.empty()) out.push_back(cur);
    return out;
}

}  // namespace deckscale::test
