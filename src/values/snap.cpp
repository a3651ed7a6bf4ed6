#include "values/snap.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <optional>
#include <utility>

#include "base/text_util.hpp"
#include "deck/rcl_fields.hpp"
#include "deck/spice_number.hpp"
#include "values/snap_params.hpp"

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
    std::optional<ESeries> every;  // a bare series: for each kind not named
    std::size_t pos = 0;
    while (pos <= text.size()) {
        std::size_t comma = text.find(',', pos);
        std::string item =
            text.substr(pos, comma == std::string::npos ? std::string::npos : comma - pos);
        auto eq = item.find('=');
        std::string kind = to_lower(item.substr(0, eq == std::string::npos ? 0 : eq));
        auto series = e_series(eq == std::string::npos ? item : item.substr(eq + 1));
        auto* slot = eq == std::string::npos ? (every ? nullptr : &every)
                     : kind.size() == 1      ? series_for(s, kind[0])
                                             : nullptr;
        if (!slot || !series) {
            error = fmt::format(
                "'{}': write KIND=SERIES, KIND one of R, C, L and SERIES one of E3, "
                "E6, E12, E24, E48, E96, E192 (e.g. R=E96,C=E12,L=E12), or one series for "
                "every kind not named (E24, or E12,R=E96)",
                item);
            return std::nullopt;
        }
        *slot = std::move(series);
        if (comma == std::string::npos) break;
        pos = comma + 1;
    }
    if (every)
        for (auto* slot : {&s.r, &s.c, &s.l})
            if (!*slot) *slot = every;
    return s;
}

SnapResult snap_deck(const Deck& deck, const SnapSeries& series) {
    SnapResult r;
    r.edits.resize(deck.files.size());
    std::vector<std::pair<std::size_t, std::uint32_t>> order;  // per part: where it is written
    auto add_part = [&](SnappedPart part, const ESeries& chosen, std::string_view text,
                        const SpiceNumber& number, std::size_t file, std::uint32_t begin,
                        std::uint32_t end) {
        part.rounded = nearest(chosen, part.ideal);
        part.new_text =
            std::abs(part.error()) < 1e-12 ? part.old_text : respell(number, part.rounded, kDigits);
        if (part.new_text != part.old_text)
            r.edits[file].add(text, Edit{begin, end - begin, part.new_text});
        order.emplace_back(file, begin);
        r.parts.push_back(std::move(part));
    };
    // Values written as an expression: whole-value parameter uses may be rounded at the
    // parameter's definition (values/snap_params); the rest are left alone.
    std::vector<ParamValueUse> uses;
    std::vector<std::pair<std::pair<std::size_t, std::uint32_t>, Diagnostic>> notes;
    std::vector<std::pair<Diagnostic, std::string>> expression_notes;  // per use: note, text
    for (std::size_t f = 0; f < deck.files.size(); ++f) {
        std::string_view text = deck.files[f].source->text();
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::element || c.fields.empty()) return;
            std::string name = card_keyword(c);
            const auto* chosen = series_for(series, name[0]);
            if (!chosen || !*chosen) return;
            const auto& fl = c.fields;
            auto rcl = rcl_fields(c);
            if (!rcl || !rcl->value) return;
            const Token& t = fl[*rcl->value];
            std::string_view value_text = c.field_text(*rcl->value);
            if (t.kind == TokenKind::brace || t.kind == TokenKind::squote) {
                uses.push_back(ParamValueUse{f, t.begin, name[0], std::string(c.field_text(0))});
                expression_notes.emplace_back(left_alone(c, t, value_text), value_text);
                return;
            }
            auto p = parse_spice_number(value_text);
            if (!p.number || !(p.number->value > 0)) {
                notes.emplace_back(std::pair{f, t.begin}, left_alone(c, t, value_text));
                return;
            }
            SnappedPart part{std::string(c.field_text(0)),
                             c.file->path(),
                             c.file->position(fl[0].begin).line,
                             std::string(value_text),
                             "",
                             p.number->value,
                             0};
            add_part(std::move(part), **chosen, text, *p.number, f, t.begin, t.end);
        });
    }
    ParamSnapPlan plan = plan_param_snap(deck, uses);
    for (const auto& sp : plan.params) {
        const SourceFile& file = *deck.files[sp.file].source;
        std::string_view value_text = file.view(sp.begin, sp.end);
        SnappedPart part{sp.name,
                         file.path(),
                         file.position(sp.begin).line,
                         std::string(value_text),
                         "",
                         sp.value,
                         0};
        part.elements = sp.elements;
        add_part(std::move(part), **series_for(series, sp.kind), file.text(),
                 *parse_spice_number(value_text).number, sp.file, sp.begin, sp.end);
    }
    for (std::size_t i = 0; i < uses.size(); ++i) {
        std::pair<std::size_t, std::uint32_t> key{uses[i].file, uses[i].begin};
        auto use = plan.use_of.find(key);
        if (use != plan.use_of.end() && use->second >= 0) continue;
        auto& [d, written] = expression_notes[i];
        if (auto why = plan.why.find(key); why != plan.why.end())
            d.message = fmt::format("'{}' is {}: {} is left as written", written, why->second,
                                    uses[i].element);
        notes.emplace_back(key, std::move(d));
    }
    // Parts and notes in file order.
    std::vector<std::size_t> idx(r.parts.size());
    for (std::size_t i = 0; i < idx.size(); ++i) idx[i] = i;
    std::stable_sort(idx.begin(), idx.end(),
                     [&](std::size_t a, std::size_t b) { return order[a] < order[b]; });
    std::vector<SnappedPart> sorted;
    for (std::size_t i : idx) sorted.push_back(std::move(r.parts[i]));
    r.parts = std::move(sorted);
    std::stable_sort(notes.begin(), notes.end(),
                     [](const auto& a, const auto& b) { return a.first < b.first; });
    for (auto& n : notes) r.left_alone.push_back(std::move(n.second));
    return r;
}

}  // namespace deckscale
