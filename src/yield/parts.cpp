#include "yield/parts.hpp"

#include <fmt/format.h>

#include <set>

#include "deck/spice_number.hpp"

namespace deckscale {
namespace {

bool is_rcl(const std::string& keyword) {
    return !keyword.empty() && (keyword[0] == 'r' || keyword[0] == 'c' || keyword[0] == 'l');
}

}  // namespace

PartList find_parts(const Deck& deck, const ToleranceSpec& tolerances) {
    PartList out;
    std::set<std::string> seen;
    for (std::size_t f = 0; f < deck.files.size(); ++f) {
        int depth = 0;
        const SourceFile& file = *deck.files[f].source;
        deck.visit_file(f, [&](const Card& c) {
            std::string kw = card_keyword(c);
            if (c.kind == CardKind::dot) {
                if (kw == ".subckt") ++depth;
                if (kw == ".ends" && depth > 0) --depth;
                return;
            }
            if (c.kind != CardKind::element || !is_rcl(kw)) return;
            auto hold = [&](std::string why) {
                const Token& t = c.fields[0];
                out.held.push_back(file.diagnose(Severity::note, t.begin, t.size(),
                                                 fmt::format("{} keeps its value: {}", kw, why)));
            };
            if (depth > 0) return hold("it is inside a subcircuit");
            if (f != 0) return hold("it is in an included file");
            if (c.fields.size() < 4) return hold("it has no value field");
            NumberParse p = parse_spice_number(c.field_text(3));
            if (!p.number || p.problem != NumberProblem::none || !(p.number->value > 0))
                return hold("its value is not a positive number");
            seen.insert(kw);
            out.parts.push_back({kw, p.number->value, tolerances.of(kw)});
        });
    }
    for (const auto& [name, tol] : tolerances.by_part)
        if (!seen.count(name))
            out.errors.push_back(
                fmt::format("--tolerance {}: no R, C or L of that name with a "
                            "plain value at the deck's top level",
                            name));
    return out;
}

}  // namespace deckscale
