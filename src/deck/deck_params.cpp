#include "deck/deck_params.hpp"

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"

namespace deckscale {

// Top-level `.param name=value` definitions of every file (those inside a .subckt are the
// subcircuit's own and are left out).
ParamTable top_level_params(const Deck& deck) {
    ParamTable table;
    for (std::size_t f = 0; f < deck.files.size(); ++f) {
        int depth = 0;
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::dot) return;
            std::string kw = card_keyword(c);
            if (kw == ".subckt") ++depth;
            if (kw == ".ends" && depth > 0) --depth;
            if (kw != ".param" || depth > 0) return;
            const auto& fl = c.fields;
            for (std::size_t i = 1; i + 2 < fl.size(); ++i)
                if (fl[i].kind == TokenKind::word && fl[i + 1].kind == TokenKind::equals &&
                    fl[i + 2].kind != TokenKind::equals)
                    table.define(to_lower(c.field_text(i)), std::string(c.field_text(i + 2)));
        });
    }
    return table;
}

// A literal number, a `{…}`/`'…'` expression or a bare parameter name, evaluated with the
// deck's parameters. Names in `local` (the parameters of the enclosing .subckt cards and the
// .param cards inside them) vary per instance: a value that uses one gives nothing.
std::optional<double> value_with_params(std::string_view text, const ParamTable& params,
                                        const std::set<std::string>& local) {
    auto p = parse_spice_number(text);
    if (p.number) return p.number->value;
    if (p.problem != NumberProblem::not_a_number || text.empty()) return std::nullopt;
    if (text.front() == '{' || text.front() == '\'') text = text.substr(1, text.size() - 2);
    return evaluate_param_expression(text, [&](const std::string& name) -> std::optional<double> {
        if (local.count(name)) return std::nullopt;
        return params.value(name);
    });
}

std::optional<double> analysis_value(std::string_view word, const ParamTable* params,
                                     std::string* text) {
    auto p = parse_spice_number(word);
    if (p.number) {
        if (text) *text = std::string(word);
        return p.number->value;
    }
    if (!params || word.empty() || (word.front() != '{' && word.front() != '\''))
        return std::nullopt;
    auto v = value_with_params(word, *params);
    if (v && text) *text = fmt::format("{:.17g}", *v);
    return v;
}

}  // namespace deckscale
