#include "scale/expression.hpp"

#include <cctype>

#include <fmt/format.h>

#include "base/text_util.hpp"

namespace deckscale {

std::string factor_text(double k) { return fmt::format("{:.15g}", k); }

std::string times_factor(double k) {
    if (k >= 1) return "*" + factor_text(k);
    return "/" + factor_text(1 / k);
}

namespace {

bool ident_start(char c) { return std::isalpha(static_cast<unsigned char>(c)) || c == '_'; }
bool ident_char(char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '.' || c == '#';
}

// Index of the ')' matching the '(' at `open`, or npos.
std::size_t matching_paren(std::string_view s, std::size_t open) {
    int depth = 0;
    for (std::size_t i = open; i < s.size(); ++i) {
        if (s[i] == '(') ++depth;
        if (s[i] == ')' && --depth == 0) return i;
    }
    return std::string_view::npos;
}

std::size_t skip_blanks(std::string_view s, std::size_t i) {
    while (i < s.size() && (s[i] == ' ' || s[i] == '\t')) ++i;
    return i;
}

}  // namespace

Substitution substitute_variables(std::string_view expr, ScaleFactors f) {
    Substitution r;
    std::string& out = r.text;
    std::size_t i = 0;
    while (i < expr.size()) {
        char c = expr[i];
        if (c == '@') {
            r.unsupported.push_back("device parameter reference '@...'");
            out += c;
            ++i;
            continue;
        }
        if (!ident_start(c) || (i > 0 && (ident_char(expr[i - 1]) ||
                                          std::isdigit(static_cast<unsigned char>(expr[i - 1]))))) {
            out += c;
            ++i;
            continue;
        }
        std::size_t j = i;
        while (j < expr.size() && ident_char(expr[j])) ++j;
        std::string name = to_lower(expr.substr(i, j - i));
        std::size_t k = skip_blanks(expr, j);
        bool call = k < expr.size() && expr[k] == '(';
        if (!call && name == "time" && f.kf != 1) {
            out += "(time" + times_factor(f.kf) + ")";
            r.changed = true;
        } else if (!call && name == "hertz" && f.kf != 1) {
            out += "(hertz" + times_factor(1 / f.kf) + ")";
            r.changed = true;
        } else if (call && name == "i") {
            std::size_t close = matching_paren(expr, k);
            if (close == std::string_view::npos) {
                out += expr.substr(i);
                break;
            }
            std::string_view whole = expr.substr(i, close + 1 - i);
            if (f.km != 1) {
                out += "(" + std::string(whole) + times_factor(f.km) + ")";
                r.changed = true;
            } else {
                out += whole;
            }
            i = close + 1;
            continue;
        } else if (call && (name == "v" || name == "vm" || name == "vp" || name == "vr" ||
                            name == "vi" || name == "vdb")) {
            // Node names inside v(...) are names, never variables.
            std::size_t close = matching_paren(expr, k);
            if (close == std::string_view::npos) {
                out += expr.substr(i);
                break;
            }
            out += expr.substr(i, close + 1 - i);
            i = close + 1;
            continue;
        } else if (call && name == "ddt") {
            std::size_t close = matching_paren(expr, k);
            if (close == std::string_view::npos) {
                out += expr.substr(i);
                break;
            }
            auto inner = substitute_variables(expr.substr(k + 1, close - k - 1), f);
            for (auto& u : inner.unsupported) r.unsupported.push_back(std::move(u));
            std::string call_text = std::string(expr.substr(i, k + 1 - i)) + inner.text + ")";
            if (f.kf != 1) {
                out += "(" + call_text + times_factor(1 / f.kf) + ")";
                r.changed = true;
            } else {
                out += call_text;
                r.changed = r.changed || inner.changed;
            }
            i = close + 1;
            continue;
        } else if (call && (name == "idt" || name == "sdt" || name == "integ")) {
            r.unsupported.push_back("'" + name + "()' (not an ngspice 39 function)");
            out += expr.substr(i, j - i);
        } else {
            out += expr.substr(i, j - i);
        }
        i = j;
    }
    return r;
}

}  // namespace deckscale
