#include "values/snap.hpp"

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"

namespace deckscale {
namespace {

// Significant digits of a rounded value: E192 has three, so four keep every member exact.
constexpr int kDigits = 4;

template <class S>
auto series_for(S& s, char letter) -> decltype(&s.r) {
    switch (letter) {
        case 'r':
            return &s.r;
        case 'c':
            return &s.c;
        case 'l':
            return &s.l;
    }
    return nullptr;
}

Diagnostic left_alone(const Card& c, const Token& t, std::string_view text) {
    Diagnostic d;
    d.severity = Severity::note;
    d.file = c.file->path();
    auto pos = c.file->position(t.begin);
    d.line = pos.line;
    d.column = pos.column;
    d.length = t.end - t.begin;
    d.source_line = std::string(c.file->line_text(pos.line));
    d.message =
        fmt::format("'{}' is not a plain number: {} is left as written", text, c.field_text(0));
    return d;
}

}  // namespace

std::optional<SnapSeries> parse_snap_series(const std::string& text, std::string& error) {
    SnapSeries s;
    std::size_t pos = 0;
    while (pos <= text.size()) {
        std::size_t comma = text.find(',', pos);
        std::string item =
            text.substr(pos, comma == std::string::npos ? std::string::npos : comma - pos);
        auto eq = item.find('=');
        std::string kind = to_lower(item.substr(0, eq == std::string::npos ? 0 : eq));
        auto series = eq == std::string::npos ? std::nullopt : e_series(item.substr(eq + 1));
        auto* slot = kind.size() == 1 ? series_for(s, kind[0]) : nullptr;
        if (!slot || !series) {
            error = fmt::format(
                "'{}': write KIND=SERIES, KIND one of R, C, L and SERIES one of E3, "
                "E6, E12, E24, E48, E96, E192 (e.g. R=E96,C=E12,L=E12)",
                item);
            return std::nullopt;
        }
        *slot = std::move(series);
        if (comma == std::string::npos) break;
        pos = comma + 1;
    }
    return s;
}

SnapResult snap_deck(const Deck& deck, const SnapSeries& series) {
    SnapResult r;
    r.edits.resize(deck.files.size());
    for (std::size_t f = 0; f < deck.files.size(); ++f) {
        std::string_view text = deck.files[f].source->text();
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::element || c.fields.empty()) return;
            std::string name = card_keyword(c);
            const auto* chosen = series_for(series, name[0]);
            if (!chosen || !*chosen) return;
            // The value: the third positional field, or "R=" / "C=" / "L=" (as verify reads it).
            int positional = 0;
            const auto& fl = c.fields;
            for (std::size_t i = 1; i < fl.size(); ++i) {
                bool expression = fl[i].kind == TokenKind::brace || fl[i].kind == TokenKind::squote;
                if (expression && positional == 2) {  // the value itself is an expression
                    r.left_alone.push_back(left_alone(c, fl[i], c.field_text(i)));
                    return;
                }
                if (fl[i].kind != TokenKind::word) continue;
                bool keyed = i + 1 < fl.size() && fl[i + 1].kind == TokenKind::equals;
                std::size_t at = i;
                if (keyed) {
                    std::string key = to_lower(c.field_text(i));
                    if (key.size() != 1 || key[0] != name[0] || i + 2 >= fl.size()) {
                        i += 2;
                        continue;
                    }
                    at = i + 2;
                } else if (++positional != 3) {
                    continue;
                }
                std::string_view value_text = c.field_text(at);
                auto p = parse_spice_number(value_text);
                if (!p.number || !(p.number->value > 0)) {
                    r.left_alone.push_back(left_alone(c, fl[at], value_text));
                    return;
                }
                double rounded = nearest(**chosen, p.number->value);
                SnappedPart part{std::string(c.field_text(0)),
                                 c.file->path(),
                                 c.file->position(fl[0].begin).line,
                                 std::string(value_text),
                                 "",
                                 p.number->value,
                                 rounded};
                part.new_text = std::abs(part.error()) < 1e-12
                                    ? part.old_text
                                    : respell(*p.number, rounded, kDigits);
                if (part.new_text != part.old_text)
                    r.edits[f].add(text,
                                   Edit{fl[at].begin, fl[at].end - fl[at].begin, part.new_text});
                r.parts.push_back(std::move(part));
                return;
            }
        });
    }
    return r;
}

}  // namespace deckscale
