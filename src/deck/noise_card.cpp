#include "deck/noise_card.hpp"

#include <vector>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/deck_params.hpp"
#include "deck/spice_number.hpp"
#include "deck/sweep_rewrite.hpp"
#include "deck/sweep_steps.hpp"

namespace deckscale {
std::optional<NoiseSpec> read_noise_card(const Card& c, std::string& error,
                                         const ParamTable* params) {
    // v ( node [, ref] ) — the only output form ngspice 39 accepts for noise.
    const auto& f = c.fields;
    std::size_t i = 1;
    auto kind = [&](std::size_t k) { return k < f.size() ? f[k].kind : TokenKind::title; };
    if (kind(1) != TokenKind::word || !iequals(c.field_text(1), "v") ||
        kind(2) != TokenKind::lparen || kind(3) != TokenKind::word) {
        error = "the output must be v(node) or v(node,ref)";
        return std::nullopt;
    }
    NoiseSpec s;
    s.output = fmt::format("v({}", c.field_text(3));
    i = 4;
    if (kind(i) == TokenKind::comma && kind(i + 1) == TokenKind::word) {
        s.output += fmt::format(",{}", c.field_text(i + 1));
        i += 2;
    }
    if (kind(i) != TokenKind::rparen) {
        error = "the output must be v(node) or v(node,ref)";
        return std::nullopt;
    }
    s.output += ")";
    std::vector<std::string_view> w;
    for (std::size_t k = i + 1; k < f.size(); ++k) {
        if (f[k].kind != TokenKind::word && f[k].kind != TokenKind::brace &&
            f[k].kind != TokenKind::squote) {
            error = fmt::format("unexpected '{}'", c.field_text(k));
            return std::nullopt;
        }
        w.push_back(c.field_text(k));
    }
    if (w.size() < 5 || w.size() > 6) {
        error = "needs an input source, dec|oct|lin, a point count and two frequencies";
        return std::nullopt;
    }
    s.source = to_lower(w[0]);
    if (s.source.empty() || (s.source[0] != 'v' && s.source[0] != 'i')) {
        error = fmt::format("the input '{}' is not an independent V or I source", w[0]);
        return std::nullopt;
    }
    s.type = to_lower(w[1]);
    if (s.type != "dec" && s.type != "oct" && s.type != "lin") {
        error = fmt::format("unknown sweep type '{}'", w[1]);
        return std::nullopt;
    }
    std::string summary;
    auto n = analysis_value(w[2], params, &s.points_text),
         f1 = analysis_value(w[3], params, &s.fstart_text),
         f2 = analysis_value(w[4], params, &s.fstop_text);
    std::optional<double> pts =
        w.size() == 6 ? analysis_value(w[5], params, &summary) : std::optional<double>(0);
    if (!n || !f1 || !f2 || !pts) {
        error = "the point counts and frequencies must be numbers or expressions of the deck's "
                "top-level parameters";
        return std::nullopt;
    }
    if (*n < 1 || *f1 <= 0 || *f2 < *f1) {
        error = "the sweep must have at least one point and 0 < fstart <= fstop";
        return std::nullopt;
    }
    if (w.size() == 6) s.summary_text = summary;
    s.fstart = *f1;
    s.fstop = *f2;
    return s;
}

NoiseSpec map_noise(const NoiseSpec& s, double kf) {
    NoiseSpec m = s;
    SweepRewrite w = rewrite_sweep(
        SweepKind::noise, {s.type, s.points_text, s.fstart_text, s.fstop_text}, kf, s.reltol);
    if (!w.refusal.empty()) {  // ngspice cannot step the original either: plain products
        m.fstart_text = fmt::format("{:.15g}", s.fstart * kf);
        m.fstop_text = fmt::format("{:.15g}", s.fstop * kf);
    } else {
        m.points_text = w.fields[1];
        m.fstart_text = w.fields[2];
        m.fstop_text = w.fields[3];
    }
    m.fstart = ngspice_read(m.fstart_text);
    m.fstop = ngspice_read(m.fstop_text);
    return m;
}

std::string noise_card(const NoiseSpec& s) {
    std::string card = fmt::format(".noise {} {} {} {} {} {}", s.output, s.source, s.type,
                                   s.points_text, s.fstart_text, s.fstop_text);
    if (!s.summary_text.empty()) card += " " + s.summary_text;
    return card;
}

}  // namespace deckscale
