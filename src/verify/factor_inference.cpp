#include "verify/factor_inference.hpp"

#include <algorithm>
#include <cmath>
#include <map>
#include <set>

#include "base/text_util.hpp"
#include "deck/deck_params.hpp"
#include "deck/param_eval.hpp"
#include "deck/rcl_fields.hpp"
#include "deck/spice_number.hpp"

namespace deckscale {
namespace {

double median(std::vector<double> v) {
    std::sort(v.begin(), v.end());
    std::size_t n = v.size();
    return n % 2 ? v[n / 2] : std::sqrt(v[n / 2 - 1] * v[n / 2]);
}

double predicted_ratio(char letter, double km, double kf) {
    switch (letter) {
        case 'r': return km;
        case 'c': return 1 / (km * kf);
        case 'l': return km / kf;
    }
    return 1;
}

// Keys of `key=value` pairs of a card (lower case).
void add_keys(const Card& c, std::set<std::string>& to) {
    for (std::size_t i = 1; i + 1 < c.fields.size(); ++i)
        if (c.fields[i].kind == TokenKind::word && c.fields[i + 1].kind == TokenKind::equals)
            to.insert(to_lower(c.field_text(i)));
}

// Elements by name and occurrence ("r1", 0), so that the n-th R1 of one deck (in another
// .subckt, or in another .if branch) is paired with the n-th R1 of the other.
std::map<std::pair<std::string, int>, const ElementValue*> by_occurrence(
    const std::vector<ElementValue>& values) {
    std::map<std::pair<std::string, int>, const ElementValue*> out;
    std::map<std::string, int> seen;
    for (const auto& e : values) out[{e.name, seen[e.name]++}] = &e;
    return out;
}

}  // namespace

std::vector<ElementValue> element_values(const Deck& deck) {
    std::vector<ElementValue> out;
    ParamTable params = top_level_params(deck);
    for (std::size_t f = 0; f < deck.files.size(); ++f) {
        // Parameters of the enclosing .subckt cards, one set per open .subckt.
        std::vector<std::set<std::string>> open;
        std::set<std::string> local;
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind == CardKind::dot) {
                std::string kw = card_keyword(c);
                if (kw == ".subckt") open.emplace_back();
                if (kw == ".ends" && !open.empty()) open.pop_back();
                if ((kw == ".subckt" || kw == ".param") && !open.empty()) add_keys(c, open.back());
                local.clear();
                for (const auto& names : open) local.insert(names.begin(), names.end());
            }
            auto rcl = rcl_fields(c);
            if (!rcl || !rcl->value) return;
            std::size_t at = *rcl->value;
            auto value = value_with_params(c.field_text(at), params, local);
            // `C1 a b cmod 1n`: a model name may come before the value.
            if (!value && !rcl->keyed && c.fields[at].kind == TokenKind::word && rcl->after_value) {
                at = *rcl->after_value;
                value = value_with_params(c.field_text(at), params, local);
            }
            if (!value) return;
            auto pos = c.file->position(c.fields[0].begin);
            out.push_back({card_keyword(c), rcl->letter, *value, c.file->path(), pos.line,
                           std::string(c.field_text(at)), !open.empty()});
        });
    }
    return out;
}

FactorInference infer_factors(const std::vector<ElementValue>& original,
                              const std::vector<ElementValue>& scaled) {
    FactorInference r;
    auto by_name = by_occurrence(scaled);
    std::map<std::string, int> seen;
    std::vector<double> km_est;
    std::vector<std::pair<char, double>> reactive;  // letter, ratio
    for (const auto& e : original) {
        auto it = by_name.find({e.name, seen[e.name]++});
        if (it == by_name.end() || e.value == 0 || it->second->value == 0) continue;
        double ratio = it->second->value / e.value;
        if (!(ratio > 0)) continue;
        if (e.letter == 'r') km_est.push_back(ratio);
        else reactive.emplace_back(e.letter, ratio);
    }
    r.resistor_pairs = static_cast<int>(km_est.size());
    r.reactive_pairs = static_cast<int>(reactive.size());
    if (km_est.empty() && reactive.size() < 2) {
        r.message = "no matched resistors (by name) to infer Km from; give --km and --kf";
        return r;
    }
    if (!km_est.empty()) {
        r.km = median(km_est);
    } else {
        // Only C and L: C'/C * L'/L = 1/Kf^2 and L'/L / C'/C = Km^2.
        std::vector<double> cs, ls;
        for (auto [l, x] : reactive) (l == 'c' ? cs : ls).push_back(x);
        if (cs.empty() || ls.empty()) {
            r.message = "without matched resistors both a capacitor and an inductor are needed; give --km and --kf";
            return r;
        }
        r.km = std::sqrt(median(ls) / median(cs));
    }
    std::vector<double> kf_est;
    for (auto [l, x] : reactive) kf_est.push_back(l == 'c' ? 1 / (x * r.km) : r.km / x);
    if (kf_est.empty()) {
        r.kf = 1;
        r.message = "no matched capacitors or inductors: Kf taken as 1";
    } else {
        r.kf = median(kf_est);
    }
    r.ok = true;
    return r;
}

std::optional<double> kf_from_analyses(const DeckAnalyses& original, const DeckAnalyses& scaled) {
    if (original.ac && scaled.ac && original.ac->fstop > 0 && scaled.ac->fstop > 0)
        return scaled.ac->fstop / original.ac->fstop;
    if (original.tran && scaled.tran && original.tran->tstop > 0 && scaled.tran->tstop > 0)
        return original.tran->tstop / scaled.tran->tstop;
    if (original.noise && scaled.noise && original.noise->fstop > 0 && scaled.noise->fstop > 0)
        return scaled.noise->fstop / original.noise->fstop;
    if (original.sp && scaled.sp && original.sp->fstop > 0 && scaled.sp->fstop > 0)
        return scaled.sp->fstop / original.sp->fstop;
    if (original.disto && scaled.disto && original.disto->sweep.fstop > 0 &&
        scaled.disto->sweep.fstop > 0)
        return scaled.disto->sweep.fstop / original.disto->sweep.fstop;
    return std::nullopt;
}

std::vector<RatioMismatch> check_ratios(const std::vector<ElementValue>& original,
                                        const std::vector<ElementValue>& scaled, double km,
                                        double kf, double tolerance) {
    std::vector<RatioMismatch> out;
    auto by_name = by_occurrence(scaled);
    std::map<std::string, int> seen;
    for (const auto& e : original) {
        auto it = by_name.find({e.name, seen[e.name]++});
        if (it == by_name.end()) continue;
        double expected = e.value * predicted_ratio(e.letter, km, kf);
        double dev = expected == 0 ? (it->second->value == 0 ? 0 : 1) : it->second->value / expected - 1;
        if (std::fabs(dev) > tolerance) out.push_back({e, *it->second, expected, dev});
    }
    std::sort(out.begin(), out.end(), [](const RatioMismatch& a, const RatioMismatch& b) {
        return std::fabs(a.deviation) > std::fabs(b.deviation);
    });
    return out;
}

}  // namespace deckscale
