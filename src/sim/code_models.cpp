#include "sim/code_models.hpp"

#include <algorithm>
#include <array>
#include <cctype>
#include <cstdlib>

#include "sim/process.hpp"

namespace deckscale {
namespace {

std::string lower(std::string_view s) {
    std::string out(s);
    for (char& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    return out;
}

bool is_word_char(char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; }

// `word` occurs in `text` (lower case) not preceded or followed by a letter, digit or '_'.
bool has_word(std::string_view text, std::string_view word) {
    for (std::size_t at = text.find(word); at != std::string_view::npos;
         at = text.find(word, at + 1)) {
        bool starts = at == 0 || !is_word_char(text[at - 1]);
        std::size_t end = at + word.size();
        if (starts && (end == text.size() || !is_word_char(text[end]))) return true;
    }
    return false;
}

// Model types ngspice 39 has built in (its device table), lower case.
// Types missing here only cost the time of loading the code models.
constexpr std::array<std::string_view, 26> builtin_model_types{
    "r",   "res", "c",     "cap",   "l",     "ind",  "d",    "npn", "pnp",
    "njf", "pjf", "nmf",   "pmf",   "nhfet", "phfet", "nmos", "pmos", "vdmos",
    "sw",  "csw", "ltra",  "urc",   "txl",   "cpl",  "nsoi", "psoi"};

bool builtin_type(std::string_view type) {
    return std::find(builtin_model_types.begin(), builtin_model_types.end(), type) !=
           builtin_model_types.end();
}

// The type of a ".model name type(...)" card (lower case), or "" if it has none.
std::string model_type(std::string_view card) {
    std::size_t at = 0;
    for (int field = 0; field < 2; ++field) {  // skip ".model" and the name
        at = card.find_first_not_of(" \t", at);
        if (at == std::string_view::npos) return "";
        at = card.find_first_of(" \t(", at);
        if (at == std::string_view::npos) return "";
    }
    at = card.find_first_not_of(" \t", at);
    if (at == std::string_view::npos) return "";
    std::size_t end = card.find_first_of(" \t(", at);
    return std::string(card.substr(at, end == std::string_view::npos ? end : end - at));
}

}  // namespace

bool needs_code_models(const std::vector<std::string>& cards) {
    for (std::size_t i = 1; i < cards.size(); ++i) {  // cards[0] is the title
        std::string card = lower(cards[i]);
        std::size_t first = card.find_first_not_of(" \t");
        if (first == std::string::npos || card[first] == '*') continue;
        char c = card[first];
        if (c == 'a' || c == 'u') return true;
        // TABLE too: ngspice 39 turns `E2 tab 0 TABLE {v(in)} = (…)` into a code-model
        // device (tried: "ae2 %v(e2_int2) %v(e2_int1) xfer_e2" fails without them).
        if (has_word(card, "poly") || has_word(card, "laplace") || has_word(card, "freq") ||
            has_word(card, "table"))
            return true;
        if (card.compare(first, 6, ".model") == 0 && !builtin_type(model_type(card.substr(first))))
            return true;
    }
    return false;
}

std::string without_code_models(std::string_view spinit) {
    std::string out;
    while (!spinit.empty()) {
        std::size_t nl = spinit.find('\n');
        std::string_view line = spinit.substr(0, nl == std::string_view::npos ? spinit.size() : nl + 1);
        spinit.remove_prefix(line.size());
        std::size_t first = line.find_first_not_of(" \t");
        bool code_model = first != std::string_view::npos &&
                          lower(line.substr(first, 9)) == "codemodel" &&
                          (line.size() == first + 9 || !is_word_char(line[first + 9]));
        if (!code_model) out.append(line);
    }
    return out;
}

std::string spinit_dir() {
    if (const char* scripts = std::getenv("SPICE_SCRIPTS")) return scripts;
    const char* lib = std::getenv("SPICE_LIB_DIR");
    return std::string(lib ? lib : "/usr/share/ngspice") + "/scripts";
}

std::string spinit_without_code_models() {
    std::optional<std::string> spinit = read_small_file(spinit_dir() + "/spinit");
    return spinit ? without_code_models(*spinit) : "";
}

}  // namespace deckscale
