#include "scale/flicker.hpp"

#include <cmath>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/pass.hpp"

namespace deckscale {
namespace {

// How KF must change, per family: KF' = KF * Km^(AF * km_af + km_offset) * Kf^kf_power
// (Kf^EF instead when kf_is_ef). Measured with ngspice 39.3 (`.noise ... 1`, the flicker
// part of each device, `onoise_<name>_1overf`, original against the deck this tool writes,
// at Km = 10, Kf = 1; Km = 1, Kf = 10; Km = 10, Kf = 100, with AF = 1.4, EF = 1.2): the
// factor the flicker PSD missed was exactly the one below. D, Q (m) keep their flicker per
// unit of m; J (area), Z (m) and R (value) see only the current, KF I^AF (notes §8:
// Km^(AF-1) Kf^EF); MOS levels 1, 2, 9 and VDMOS (m) divide by m twice, level 3 once; the
// BSIM3, BSIM4 and B4SOI flicker models follow m exactly. MOS level 1 also sees its
// TOX x Kf through Cox^2, hence Kf^-1. Families marked `kf_known = false` only ever scale
// with Kf = 1 (the pass refuses a frequency change for them).
struct Law {
    int km_af;
    int km_offset;
    bool kf_known;
    int kf_power;
    bool kf_is_ef;
};

char family_of(const std::string& type) {
    if (type == "d") return 'd';
    if (type == "npn" || type == "pnp") return 'q';
    if (type == "njf" || type == "pjf") return 'j';
    if (type == "nmf" || type == "pmf") return 'z';
    if (type == "nmos" || type == "pmos" || type == "vdmos") return 'm';
    if (type == "r" || type == "res") return 'r';
    return 0;
}

bool bsim_family(int level) {
    return level == 8 || level == 49 || level == 14 || level == 54 || level == 10 || level == 58;
}

std::optional<Law> law_of(const FlickerModel& m) {
    switch (family_of(m.type)) {
        case 'd':
            return Law{0, 0, true, 1, false};
        case 'q':
            if (m.level == 1) return Law{0, 0, true, 1, false};
            return std::nullopt;
        case 'j':
            if (m.level == 1 || m.level == 2) return Law{1, -1, true, 1, false};
            return std::nullopt;
        case 'z':
            if (m.level == 1) return Law{1, -1, true, 1, false};
            return std::nullopt;
        case 'r':
            return Law{1, -1, true, 0, true};
        case 'm':
            if (m.type == "vdmos" || m.level == 2 || m.level == 9)
                return Law{1, -2, false, 0, false};
            if (m.level == 1) return Law{1, -2, true, -1, false};
            if (m.level == 3) return Law{1, -1, false, 0, false};
            if (bsim_family(m.level)) return Law{0, 0, false, 0, false};
            return std::nullopt;
    }
    return std::nullopt;
}

std::optional<double> plain_value(const Card& c, const Atom& a) {
    if (!a.value) return std::nullopt;
    auto n = parse_spice_number(c.text(*a.value));
    if (!n.number) return std::nullopt;
    return n.number->value;
}

}  // namespace

bool FlickerModel::has_flicker() const { return (kf && *kf != 0) || !plain || !other.empty(); }

std::optional<FlickerModel> flicker_model_of(const Card& c, const std::vector<Atom>& atoms) {
    if (c.fields.size() < 3) return std::nullopt;
    FlickerModel m;
    m.type = to_lower(c.field_text(2));
    if (!family_of(m.type)) return std::nullopt;
    m.name = std::string(c.field_text(1));
    auto pos = c.file->position(c.begin());
    m.where = fmt::format("{}:{}", c.file->path(), pos.line);
    std::optional<double> fnoimod, noimod, af, ef;
    for (const auto& a : atoms) {
        if (!a.key) continue;
        std::string key = to_lower(c.text(*a.key));
        auto v = plain_value(c, a);
        if (key == "level") {
            m.level = v && std::fabs(*v) <= 1000 ? static_cast<int>(*v) : -1;  // 1e30 would overflow
        } else if (key == "kf" || key == "af" || key == "ef") {
            if (!v) {
                m.plain = false;
                continue;
            }
            (key == "kf" ? m.kf : key == "af" ? af : ef) = *v;
        } else if (key == "kfn" || key == "kfre" || key == "noia" || key == "noib" ||
                   key == "noic" || key == "coflick") {
            if (!v || *v != 0) m.other.push_back(key);
        } else if (key == "fnoimod") {
            fnoimod = v;
        } else if (key == "noimod") {
            noimod = v;
        }
    }
    if (af) m.af = *af;
    if (ef) m.ef = *ef;
    // Flicker noise on by default: BSIM4 and B4SOI (FNOIMOD = 1 with non-zero NOIA); BSIM3
    // with NOIMOD 2 or 3 (NOIA's default). Seen in ngspice 39.3: a BSIM4 and a B4SOI model
    // with no noise parameter, and a BSIM3 model with only noimod=2, all give a non-zero
    // onoise_m1_1overf.
    bool bsim4 = m.level == 14 || m.level == 54 || m.level == 10 || m.level == 58;
    if (m.type != "vdmos" && family_of(m.type) == 'm' && m.other.empty()) {
        if (bsim4 && !(fnoimod && *fnoimod == 0)) m.other.push_back("default");
        if ((m.level == 8 || m.level == 49) && noimod && (*noimod == 2 || *noimod == 3))
            m.other.push_back("default");
    }
    return m;
}

std::vector<FlickerModel> flicker_models(const Deck& deck) {
    std::vector<FlickerModel> out;
    std::vector<Atom> atoms;
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::dot || c.fields.size() < 3 || card_keyword(c) != ".model")
                return;
            atoms_of(c, 3, atoms);
            if (auto m = flicker_model_of(c, atoms)) out.push_back(std::move(*m));
        });
    return out;
}

std::optional<double> flicker_kf_factor(const FlickerModel& m, ScaleFactors f, std::string& why) {
    if (f.km == 1 && f.kf == 1) return 1.0;
    auto law = law_of(m);
    if (!law) {
        why = fmt::format(
            "how ngspice 39 scales the flicker noise of a '{}' model{} with the "
            "instance is not known",
            m.type, m.level == 1 ? "" : fmt::format(" of level {}", m.level));
        return std::nullopt;
    }
    if (!m.plain) {
        why = "its KF, AF or EF is not a plain number";
        return std::nullopt;
    }
    if (!law->kf_known && f.kf != 1) {
        why = "its flicker noise is not known to follow a frequency change (nor is the model)";
        return std::nullopt;
    }
    double km_power = law->km_af * m.af + law->km_offset;
    double kf_power = law->kf_is_ef ? m.ef : law->kf_power;
    double k = std::pow(f.km, km_power) * (f.kf == 1 ? 1.0 : std::pow(f.kf, kf_power));
    if (!flicker_follows(k) && !m.other.empty()) {
        why = fmt::format("its flicker noise is also set by {}, which a KF factor cannot follow",
                          m.other.front() == "default" ? std::string("the model's default NOIA")
                                                       : "'" + m.other.front() + "'");
        return std::nullopt;
    }
    return k;
}

bool flicker_follows(double kf_factor) { return std::fabs(kf_factor - 1) <= 1e-12; }

std::optional<double> flicker_rewrite(ScalePass& p) {
    if (!p.follow_flicker()) return std::nullopt;
    const Card& c = p.card();
    const auto& atoms = p.atoms(3);
    auto m = flicker_model_of(c, atoms);
    if (!m || !m->has_flicker()) return std::nullopt;
    std::string why;
    auto k = flicker_kf_factor(*m, p.factors(), why);
    if (!k) {
        const Token* at = &c.fields[2];
        for (const auto& a : atoms)
            if (a.key && iequals(c.text(*a.key), "kf")) at = a.key;
        p.unscalable(*at, fmt::format("--follow-flicker: the flicker noise of model '{}' cannot "
                                      "be made to follow: {}",
                                      m->name, why));
        return std::nullopt;
    }
    if (flicker_follows(*k)) return std::nullopt;
    return k;
}

}  // namespace deckscale
