#include "scale/diode_model.hpp"

#include <fmt/format.h>

#include <map>
#include <string>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/pass.hpp"
#include "scale/terminals.hpp"

namespace deckscale {
namespace {

// Diode model parameters by ngspice 39's `devhelp` names and aliases, as the power of Km a
// model card scaled in place of m multiplies them by: saturation, recombination, knee,
// breakdown and tunnelling currents (per area and per perimeter alike) and the junction
// capacitances / Km, the series resistance x Km.
struct KmRule {
    const char* key;
    ModelKmRule rule;
};
// clang-format off
constexpr KmRule kKmRules[] = {
    {"is", {-1, "A"}},     {"js", {-1, "A"}},    {"jsw", {-1, "A"}},   {"isr", {-1, "A"}},
    {"ikf", {-1, "A"}},    {"ik", {-1, "A"}},    {"ikr", {-1, "A"}},   {"ibv", {-1, "A"}},
    {"ib", {-1, "A"}},     {"jtun", {-1, "A"}},  {"jtunsw", {-1, "A"}},
    {"cjo", {-1, "F"}},    {"cj0", {-1, "F"}},   {"cj", {-1, "F"}},    {"cjp", {-1, "F"}},
    {"cjsw", {-1, "F"}},   {"rs", {1, "Ohm"}},
};
// clang-format on
// The parameters that stay: voltages, exponents and emission coefficients, temperatures and
// their coefficients, the transit time (divided by Kf with the charges) and the level.
constexpr const char* kKept[] = {
    "level", "tnom", "trs",  "trs1", "trs2", "n",      "ns",   "tt",   "ttt1", "ttt2", "vj",
    "pb",    "m",    "mj",   "tm1",  "tm2",  "php",    "mjsw", "ctp",  "ctc",  "cta",  "tlev",
    "tlevc", "eg",   "xti",  "tpb",  "tphp", "ntun",   "xtitun", "keg", "af",  "fc",   "fcs",
    "bv",    "nbv",  "tcv",  "nr",
};

bool kept(std::string_view key) {
    for (const char* k : kKept)
        if (key == k) return true;
    return false;
}

// A diode model card (fields from 3 on) that follows Km by its parameters alone.
bool card_follows(const Card& c) {
    std::vector<Atom> atoms;
    atoms_of(c, 3, atoms);
    for (const auto& a : atoms) {
        if (!a.key) return false;  // a positional value: not a diode parameter
        std::string key = to_lower(c.text(*a.key));
        if (key == "kf") {  // flicker noise would follow another law than by m
            auto n = a.value ? parse_spice_number(c.text(*a.value)) : NumberParse{};
            if (!n.number || n.number->value != 0) return false;
            continue;
        }
        if (diode_model_km_rule(key).km_power == 0 && !kept(key)) return false;
    }
    return true;
}

}  // namespace

ModelKmRule diode_model_km_rule(std::string_view lower_key) {
    for (const auto& r : kKmRules)
        if (lower_key == r.key) return r.rule;
    return {};
}

bool diodes_follow_by_model(const Deck& deck) {
    std::map<std::string, bool> models;  // diode models by lower-case name: follows?
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind == CardKind::dot && c.fields.size() >= 3 && card_keyword(c) == ".model" &&
                iequals(c.field_text(2), "d"))
                models[to_lower(c.field_text(1))] = card_follows(c);
        });
    bool all = true;
    for (const auto& [name, follows] : models) all = all && follows;
    for (std::size_t f = 0; f < deck.files.size() && all; ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (!all || c.kind != CardKind::element || c.fields.empty() ||
                ascii_lower(c.field_text(0)[0]) != 'd')
                return;
            ElementLinks links =
                element_links(c, [&](const std::string& n) { return models.count(n) > 0; });
            all = links.model.has_value();
        });
    return all;
}

void add_diode_model_defaults(ScalePass& p, const std::vector<Atom>& atoms) {
    const Card& c = p.card();
    bool is = false, ibv = false, bv = false;
    for (const auto& a : atoms) {
        if (!a.key) continue;
        std::string key = to_lower(c.text(*a.key));
        is = is || key == "is" || key == "js";
        ibv = ibv || key == "ibv" || key == "ib";
        bv = bv || key == "bv";
    }
    // Inside the parentheses when the card has them (ngspice reads either way).
    const Token& last = c.fields.back();
    std::uint32_t at = last.kind == TokenKind::rparen ? last.begin : last.end;
    double k = 1 / p.factors().km;
    std::string text, keys;
    auto add = [&](const char* key, double value) {
        text += fmt::format(" {}={}", key, format_plain(value * k, p.digits()));
        keys += keys.empty() ? key : fmt::format(", {}", key);
    };
    if (!is) add("is", 1e-14);
    if (bv && !ibv) add("ibv", 1e-3);
    if (!text.empty())  // one insertion: edits at one offset must not overlap
        p.insert(at, text, fmt::format("{} (added: ngspice's default / Km)", keys), k);
}

}  // namespace deckscale
