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
}

std::string unknown_numparam_name_message(const std::string& name) {
    return fmt::format(
        "'{}' is not known to ngspice 39 in .param and {{...}} expressions (it stops "
        "with \"Undefined parameter [{}]\"); write the number or define .param {}=...",
        name, name, name);
}

}  // namespace deckscale
