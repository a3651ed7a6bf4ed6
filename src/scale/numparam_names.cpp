#include "scale/numparam_names.hpp"

#include <fmt/format.h>

#include <cctype>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

bool ident_char(char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; }

}  // namespace

std::optional<std::string> unknown_numparam_name(std::string_view expr) {
    std::size_t i = 0;
    while (i < expr.size()) {
        if (!std::isalpha(static_cast<unsigned char>(expr[i])) && expr[i] != '_') {
            // Skip a number with its suffix letters ("2.5meg") as one piece.
            if (std::isdigit(static_cast<unsigned char>(expr[i])) || expr[i] == '.')
                while (i < expr.size() && (ident_char(expr[i]) || expr[i] == '.')) ++i;
            else
                ++i;
            continue;
        }
        std::size_t j = i;
        while (j < expr.size() && ident_char(expr[j])) ++j;
        if (to_lower(expr.substr(i, j - i)) == "pi") return std::string("pi");
        i = j;
    }
    return std::nullopt;
}

void check_numparam_names(ScalePass& p, const Token& value) {
    if (value.kind != TokenKind::brace && value.kind != TokenKind::squote &&
        value.kind != TokenKind::word)
        return;
    auto name = unknown_numparam_name(p.card().text(value));
    if (name && !p.is_param(*name)) p.fail(value, unknown_numparam_name_message(*name));
    if (auto number = fatal_numparam_number(p.card().text(value)))
        p.fail(value, fatal_numparam_number_message(*number));
}

std::optional<std::string> fatal_numparam_number(std::string_view expr) {
    auto digit = [&](std::size_t k) {
        return k < expr.size() && std::isdigit(static_cast<unsigned char>(expr[k]));
    };
    std::size_t i = 0;
    while (i < expr.size()) {
        if (std::isalpha(static_cast<unsigned char>(expr[i])) || expr[i] == '_') {
            while (i < expr.size() && ident_char(expr[i])) ++i;  // a name, digits and all
            continue;
        }
        if (!digit(i) && !(expr[i] == '.' && digit(i + 1))) {
            ++i;
            continue;
        }
        std::size_t start = i;
        if (expr[i] == '0' && i + 1 < expr.size() && (expr[i + 1] == 'x' || expr[i + 1] == 'X')) {
            // sscanf's %lG reads hexadecimal: {0x10} is 16 to ngspice 39 (deck-syntax notes).
            for (i += 2; i < expr.size() && std::isxdigit(static_cast<unsigned char>(expr[i]));)
                ++i;
            continue;
        }
        while (digit(i) || (i < expr.size() && expr[i] == '.')) ++i;
        if (i < expr.size() && (expr[i] == 'e' || expr[i] == 'E')) {
            std::size_t k = i + 1;
            if (k < expr.size() && (expr[k] == '+' || expr[k] == '-')) ++k;
            if (digit(k))
                for (i = k; digit(i);) ++i;
        }
        std::size_t letters = i;
        while (i < expr.size() && std::isalpha(static_cast<unsigned char>(expr[i]))) ++i;
        if (i > letters && digit(i)) {
            while (i < expr.size() && (ident_char(expr[i]) || expr[i] == '.')) ++i;
            return std::string(expr.substr(start, i - start));
        }
    }
    return std::nullopt;
}

std::string fatal_numparam_number_message(const std::string& number) {
    return fmt::format(
        "ngspice 39's parameter evaluator cannot read '{}' (a digit after the letters, as in "
        "1k5 or the exponent in 1d3): it stops with \"Formula() error\" and the simulator "
        "cannot recover; write it as a plain number (1.5k, 1e3)",
        number);
}

std::string unknown_numparam_name_message(const std::string& name) {
    return fmt::format(
        "'{}' is not known to ngspice 39 in .param and {{...}} expressions (it stops "
        "with \"Undefined parameter [{}]\"); write the number or define .param {}=...",
        name, name, name);
}

}  // namespace deckscale
