#include "scale/semiconductors.hpp"
#include <cmath>

#include <fmt/format.h>

#include <string_view>
#include <vector>

#include "base/text_util.hpp"
#include "deck/analyses.hpp"
#include "deck/spice_number.hpp"
#include "scale/diode_model.hpp"
#include "scale/flicker.hpp"
#include "scale/pass.hpp"
#include "scale/terminals.hpp"

namespace deckscale {
namespace {

// The model parameters a frequency change rewrites, as powers of Kf; every other parameter
// of a level-1 model is a voltage, an exponent, a temperature coefficient or a magnitude
// that the instance's m takes care of. Rows from the shared notes "scaling-rules.md" §4
// (diode, BJT and MOS level 1 checked there with ngspice 39 runs), names and aliases as
// ngspice 39's `devhelp` lists them (diode cjo/cj0/cj; BJT cjs/csub/ccs).
struct ChargeRule {
    char family;  // d q j z m
    const char* key;
    int kf_power;
    const char* unit;
};
// clang-format off
constexpr ChargeRule kChargeRules[] = {
    {'d', "cjo", -1, "F"},  {'d', "cj0", -1, "F"},  {'d', "cj", -1, "F"},   {'d', "cjp", -1, "F"},
    {'d', "tt", -1, "s"},
    {'q', "cje", -1, "F"},  {'q', "cjc", -1, "F"},  {'q', "cjs", -1, "F"},  {'q', "csub", -1, "F"},
    {'q', "ccs", -1, "F"},  {'q', "tf", -1, "s"},   {'q', "tr", -1, "s"},   {'q', "qco", -1, "C"},
    {'j', "cgs", -1, "F"},  {'j', "cgd", -1, "F"},
    {'z', "cgs", -1, "F"},  {'z', "cgd", -1, "F"},
    // MOS level 1 (Meyer): the intrinsic caps follow Cox = eps/TOX; overlap and junction caps.
    {'m', "tox", 1, "m"},   {'m', "cgso", -1, "F"}, {'m', "cgdo", -1, "F"}, {'m', "cgbo", -1, "F"},
    {'m', "cbd", -1, "F"},  {'m', "cbs", -1, "F"},  {'m', "cj", -1, "F"},   {'m', "cjsw", -1, "F"},
    // VDMOS ('v'): explicit gate capacitances, its body diode's junction capacitance and
    // transit time (ngspice 39 manual 11.3; its DC current takes KP, not an oxide).
    {'v', "cgs", -1, "F"},  {'v', "cgdmax", -1, "F"}, {'v', "cgdmin", -1, "F"},
    {'v', "cjo", -1, "F"},  {'v', "tt", -1, "s"},
};
// clang-format on

// Self-heating networks: a thermal resistance and capacitance that m is not known to scale
// (VDMOS: junction to case and case to ambient, and the junction's heat capacity).
constexpr const char* kThermalKeys[] = {"rth0", "cth0", "rth", "cth", "rthjc", "rthca", "cthj"};

// ngspice 39's VDMOS leaves its gate capacitances out of the instance's m (tried here: a
// VDMOS stage at Km = 10 by m alone was off by 8.4 in AC, its operating point exact; with
// CGS, CGDMAX and CGDMIN / Km as well AC agreed to 1e-11; its body diode (IS, CJO, TT, RB),
// RG, RD and RS follow m), so a magnitude change divides them on the model card.
constexpr const char* kVdmosGateCaps[] = {"cgs", "cgdmax", "cgdmin"};

char family_of(const std::string& type) {
    if (type == "d") return 'd';
    if (type == "npn" || type == "pnp") return 'q';
    if (type == "njf" || type == "pjf") return 'j';
    if (type == "nmf" || type == "pmf") return 'z';
    if (type == "nmos" || type == "pmos" || type == "vdmos") return 'm';
    return 0;
}

// ngspice 39's MOS level numbers (manual §11.2) as the names people know them by.
std::string mos_level_name(const MosModel& m) {
    if (m.type == "vdmos") return "VDMOS";
    if (m.level < 0) return "level given by an expression";
    struct Name {
        int level;
        const char* name;
    };
    // clang-format off
    static const Name names[] = {{2, "MOS2"},    {3, "MOS3"},     {6, "MOS6"},    {9, "MOS9"},
                                 {4, "BSIM1"},   {5, "BSIM2"},    {8, "BSIM3"},   {49, "BSIM3"},
                                 {14, "BSIM4"},  {54, "BSIM4"},   {10, "BSIMSOI"}, {58, "BSIMSOI"},
                                 {44, "EKV"},    {55, "EKV"},     {68, "HiSIM2"}, {73, "HiSIM_HV"},
                                 {69, "PSP"},    {70, "PSP"},     {60, "STAG SOI3"}};
    // clang-format on
    for (const auto& n : names)
        if (n.level == m.level) return fmt::format("level {}, {}", m.level, n.name);
    return fmt::format("level {}", m.level);
}

// The level= of a model card: 1 when not given, -1 when it is not a plain number.
int level_of(const Card& c, const std::vector<Atom>& atoms) {
    for (const auto& a : atoms) {
        if (!a.key || !iequals(c.text(*a.key), "level")) continue;
        if (!a.value) return -1;
        auto n = parse_spice_number(c.text(*a.value));
        // A level is a small whole number; anything else (found by the deck fuzz target:
        // level=1e30 overflowed the conversion to int) is "not a plain number".
        if (!n.number || !(std::fabs(n.number->value) <= 1000)) return -1;
        return static_cast<int>(n.number->value);
    }
    return 1;
}

bool given(const Card& c, const std::vector<Atom>& atoms, std::string_view key) {
    for (const auto& a : atoms)
        if (a.key && a.value && iequals(c.text(*a.key), key)) return true;
    return false;
}

MosModel mos_model_of(const Card& c, const std::vector<Atom>& atoms, const std::string& type) {
    MosModel m;
    m.type = type;
    m.level = level_of(c, atoms);
    struct Explicit {
        const char* key;
        const char* alias;
        const char* name;
    };
    const Explicit needed[] = {{"vto", "vt0", "VTO"},
                               {"kp", "kp", "KP"},
                               {"gamma", "gamma", "GAMMA"},
                               {"phi", "phi", "PHI"}};
    for (const auto& n : needed)
        if (!given(c, atoms, n.key) && !given(c, atoms, n.alias))
            m.missing += m.missing.empty() ? std::string(n.name) : std::string(", ") + n.name;
    return m;
}

std::string kf_text(double kf) { return fmt::format("{:.9g}", kf); }

// Why a MOS model cannot follow Kf (empty when it can).
std::string mos_refusal(const MosModel& m, double kf) {
    if (m.type == "vdmos") return "";  // its charges are parameters of their own
    if (m.level == 1) {
        if (m.missing.empty()) return "";
        return fmt::format(
            "level 1 follows a frequency change only with VTO, KP, GAMMA and PHI "
            "given explicitly (otherwise TOX, which must be multiplied by Kf = "
            "{}, also sets them); not given: {}",
            kf_text(kf), m.missing);
    }
    if (m.level >= 2 && m.level <= 9 && m.level != 4 && m.level != 5 && m.level != 8)
        return fmt::format(
            "its oxide thickness also enters the DC equations (mobility, "
            "short-channel terms), so no model change follows a frequency change "
            "(Kf = {}); with Kf = 1 it scales exactly by m",
            kf_text(kf));
    return fmt::format(
        "its intrinsic charge and its DC current both come from the oxide "
        "capacitance, so no model change follows a frequency change (Kf = {}); "
        "with Kf = 1 it scales exactly by m",
        kf_text(kf));
}

// Scales a BJT by its area (area' = area / Km; areab and areac, where given, too: shared notes
// "scaling-rules.md" §4, verified there: op identical, AC 8.9e-9), for a deck that also has
// junctions whose GMIN ngspice does not multiply by m. The card's leading value after its model
// name is its area (ngspice 39 manual 8.1).
void scale_bjt_area(ScalePass& p, double k) {
    const Card& c = p.card();
    ElementLinks links =
        element_links(c, [&](const std::string& name) { return p.model_type(name) != nullptr; });
    bool area = false;
    // The model name is a plain word (element_links), so the value after it is no key's.
    if (links.model) {
        std::size_t at = *links.model + 1;
        if (at < c.fields.size() && p.is_value_token(c.fields[at]) &&
            (at + 1 == c.fields.size() || c.fields[at + 1].kind != TokenKind::equals)) {
            p.scale_by(c.fields[at], k, "area", "-", UnitExponents{-1, 0});
            area = true;
        }
    }
    for (const auto& a : p.atoms(1)) {
        if (!a.key || !a.value) continue;
        std::string key = to_lower(c.text(*a.key));
        if (key != "area" && key != "areab" && key != "areac") continue;
        p.scale_by(*a.value, k, key, "-", UnitExponents{-1, 0});
        if (key == "area") area = true;
    }
    if (!area)
        p.insert(c.fields.back().end, fmt::format(" area={}", format_plain(k, p.digits())),
                 "area (added)", k);
}

// ngspice 39 reads a bare number after a diode's model name only in its PSpice compatibility
// mode (shared notes "deck-syntax.md" §4; tried here: `D1 a 0 dm 2` stops the load with
// "could not find a valid modelname", `area=2` works), so such a deck is refused as ngspice
// would refuse it.
void refuse_bare_diode_area(ScalePass& p) {
    const Card& c = p.card();
    ElementLinks links =
        element_links(c, [&](const std::string& name) { return p.model_type(name) != nullptr; });
    if (!links.model) return;
    std::size_t at = *links.model + 1;
    if (at < c.fields.size() && p.is_number(c.fields[at]) &&
        (at + 1 == c.fields.size() || c.fields[at + 1].kind != TokenKind::equals))
        p.fail(c.fields[at],
               fmt::format("ngspice 39 reads a bare number after a diode's model name only in "
                           "its PSpice compatibility mode ('{}' stops the load with \"could not "
                           "find a valid modelname\"); write area={}",
                           c.field_text(0), c.field_text(at)));
}

}  // namespace

bool gmin_apart_device(const Card& c, const MosModels& models) {
    if (c.kind != CardKind::element || c.fields.empty()) return false;
    char letter = ascii_lower(c.field_text(0)[0]);
    if (letter == 'd' || letter == 'z' || letter == 'j') return true;
    if (letter != 'm' && letter != 'q') return false;
    ElementLinks links =
        element_links(c, [&](const std::string& name) { return models.count(name) > 0; });
    if (!links.model) return false;
    auto it = models.find(to_lower(c.field_text(*links.model)));
    if (it == models.end()) return false;
    const MosModel& m = it->second;
    // A BJT other than Gummel-Poon: VBIC (level 4) and HICUM (level 8) leave their GMIN out
    // of m (tried: a CE stage at Km = 10 by m was 2.3e-6 off at its operating point, exact to
    // 2e-10 with GMIN / Km; the Gummel-Poon model multiplies it, 1.2e-7 off with GMIN / Km).
    if (letter == 'q') return m.type != "vdmos" && m.level > 1;
    return m.type == "vdmos" || (m.level >= 1 && m.level <= 3);
}

bool is_semiconductor_model_type(const std::string& lower_type) {
    return family_of(lower_type) != 0;
}

std::shared_ptr<const MosModels> collect_mos_models(const Deck& deck) {
    auto out = std::make_shared<MosModels>();
    std::vector<Atom> atoms;
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::dot || c.fields.size() < 3 || card_keyword(c) != ".model")
                return;
            std::string type = to_lower(c.field_text(2));
            if (family_of(type) != 'm' && family_of(type) != 'q') return;
            atoms_of(c, 3, atoms);
            out->emplace(to_lower(c.field_text(1)), mos_model_of(c, atoms, type));
        });
    return out;
}

void scale_semiconductor(ScalePass& p, char letter) {
    const Card& c = p.card();
    ScaleFactors f = p.factors();
    if (letter == 'd') refuse_bare_diode_area(p);
    if (f.km == 1 && f.kf == 1) return;
    // How ngspice 39 applies m to the GMIN across the device's junctions (ngspice 39.3 runs,
    // a junction reverse-biased through 1 MOhm, Km = 10, reltol 1e-9: with m = 1/Km the
    // leakage followed exactly with GMIN unchanged for Q, J, BSIM3 and BSIM4, with GMIN / Km
    // for D, Z and MOS levels 1-3; VDMOS followed neither, 0.9 % off with GMIN / Km). A JFET's
    // area leaves GMIN alone (exact with GMIN / Km), so J is scaled by its area and joins
    // D and Z. So does a BJT's area: in a deck with D, J, Z or MOS level 1-3, whose GMIN must
    // be divided by Km, a BJT is scaled by its area (beside a diode, the same leakage test
    // followed to 1.6e-4 of 1.1e-11 A, about 2 IS not following the area, where m was 90 %
    // off), and so it is in a deck that sets its own gmin, which is divided by Km too (a CE
    // stage with .options gmin=1e-10, Km = 10: AC 3e-11 by area, 2e-5 by m); elsewhere by
    // m, which is exact with GMIN as it is.
    ToleranceScan& t = p.tolerances();
    t.semiconductors = true;
    bool apart = gmin_apart_device(c, p.mos_models());
    if (apart) t.gmin_apart = true;
    if (letter == 'd' && !t.diode) t.diode = ToleranceScan::Place{p.file_index(), c.begin(), ""};
    // A Gummel-Poon BJT goes by area beside GMIN-apart devices; VBIC and HICUM, apart
    // themselves, by m (HICUM's area left a capacitance behind: AC 1.2e-5 off, tried).
    bool bjt_area = letter == 'q' && !apart && f.km != 1 && p.bjt_by_area();
    if (letter == 'q' && !apart) (bjt_area ? t.gmin_apart : t.gmin_times_m) = true;
    ElementLinks links = letter == 'm' ? element_links(c, [&](const std::string& name) {
        return p.model_type(name) != nullptr;
    })
                                       : ElementLinks{};
    if (letter == 'm' && links.model) {
        const Token& model_token = c.fields[*links.model];
        std::string model = to_lower(c.text(model_token));
        const MosModels& models = p.mos_models();
        auto it = models.find(model);
        if (it != models.end()) {
            const MosModel& m = it->second;
            // GMIN apart from m: MOS levels 1-3, and VDMOS (gmin_apart_device).
            bool apart = m.type == "vdmos" || (m.level >= 1 && m.level <= 3);
            t.gmin_times_m = t.gmin_times_m || !apart;
        }
        if (f.kf != 1 && it == models.end()) {
            p.unscalable(model_token, fmt::format("MOSFET '{}': model '{}' is not defined in "
                                                  "this deck, so whether it can follow a "
                                                  "frequency change is not known",
                                                  c.field_text(0), c.text(model_token)));
            return;
        }
        std::string why = f.kf != 1 ? mos_refusal(it->second, f.kf) : "";
        if (!why.empty()) {
            p.unscalable(model_token,
                         fmt::format("MOSFET '{}' uses model '{}' ({}): {}", c.field_text(0),
                                     c.text(model_token), mos_level_name(it->second), why));
            return;
        }
    } else if (letter == 'm' && f.kf != 1) {
        p.unscalable(c.fields[0], fmt::format("MOSFET '{}' names no model of this deck, so "
                                              "whether it can follow a frequency change is not "
                                              "known",
                                              c.field_text(0)));
        return;
    }
    if (f.km == 1) return;
    if (letter == 'd' && p.diode_by_model()) return;  // its model card carries Km
    // m' = m / Km (ngspice multiplies currents, charges and conductances by m and divides the
    // series resistances: notes §4, verified there for D, Q and MOS level 1 and BSIM3).
    double k = 1 / f.km;
    if (bjt_area) {
        scale_bjt_area(p, k);
        return;
    }
    const char* by = letter == 'j' ? "area" : "m";
    // J d g s model [area]: a positional area right after the model name.
    if (letter == 'j' && c.fields.size() > 5 && p.is_value_token(c.fields[5]) &&
        (c.fields.size() == 6 || c.fields[6].kind != TokenKind::equals)) {
        p.scale_by(c.fields[5], k, "area", "-", UnitExponents{-1, 0});
        return;
    }
    for (const auto& a : p.atoms(1)) {
        if (!a.key || !iequals(c.text(*a.key), by)) continue;
        if (a.value) p.scale_by(*a.value, k, by, "-", UnitExponents{-1, 0});
        return;
    }
    p.insert(c.fields.back().end, fmt::format(" {}={}", by, format_plain(k, p.digits())),
             fmt::format("{} (added)", by), k);
}

void scale_semiconductor_model(ScalePass& p, const std::string& type) {
    const Card& c = p.card();
    ScaleFactors f = p.factors();
    if (f.km == 1 && f.kf == 1) return;
    const auto& atoms = p.atoms(3);
    for (const auto& a : atoms)
        for (const char* key : kThermalKeys)
            if (a.key && a.value && iequals(c.text(*a.key), key)) {
                p.unscalable(*a.key, fmt::format("self-heating parameter '{}' of model '{}': "
                                                 "the device's m is not known to scale its "
                                                 "thermal network",
                                                 c.text(*a.key), c.field_text(1)));
                return;
            }
    // The instances' m does all of a magnitude change but for flicker noise (below); a
    // frequency change divides the charges.
    bool charges = f.kf != 1;
    char family = family_of(type);
    int level = level_of(c, atoms);
    if (charges && family == 'm') {
        // MOS models that cannot follow Kf stay as they are: their instances are refused.
        if (!mos_refusal(mos_model_of(c, atoms, type), f.kf).empty()) return;
    } else if (charges && level != 1) {
        const char* what = family == 'd'   ? "diode"
                           : family == 'q' ? "bipolar transistor"
                           : family == 'j' ? "JFET"
                                           : "MESFET";
        p.unscalable(c.fields[2],
                     fmt::format("{} model '{}' is {}: only level 1 has a known "
                                 "set of charge parameters to divide by Kf = {}; "
                                 "with Kf = 1 it scales exactly by m",
                                 what, c.field_text(1),
                                 level < 0 ? std::string("of a level given by an expression")
                                           : fmt::format("level {}", level),
                                 kf_text(f.kf)));
        return;
    }
    // A diode in a deck with .disto: its model card carries Km as well (scale/diode_model.hpp).
    bool by_model = family == 'd' && p.diode_by_model();
    std::optional<double> flicker = flicker_rewrite(p);  // scale/flicker.hpp
    for (const auto& a : atoms) {
        if (!a.key || !a.value) continue;
        if (flicker && iequals(c.text(*a.key), "kf")) {
            p.scale_by(*a.value, *flicker, "kf (flicker noise follows)", "-");
            continue;
        }
        std::string key = to_lower(c.text(*a.key));
        ModelKmRule km = by_model ? diode_model_km_rule(key) : ModelKmRule{};
        if (type == "vdmos" && f.km != 1)
            for (const char* cap : kVdmosGateCaps)
                if (key == cap) km = ModelKmRule{-1, "F"};
        UnitExponents e{km.km_power, 0};
        const char* unit = km.unit;
        char rules = type == "vdmos" ? 'v' : family;
        for (const auto& r : kChargeRules)
            if (charges && r.family == rules && key == r.key) {
                e.kf = r.kf_power > 0 ? 1 : -1;
                unit = r.unit;
                break;
            }
        if (e.km != 0 || e.kf != 0) p.scale_by(*a.value, factor_of(e, f), key, unit, e);
    }
    if (by_model) add_diode_model_defaults(p, atoms);
}

std::optional<UnitExponents> semiconductor_model_param(const std::string& type,
                                                       const std::string& key, ScaleFactors f,
                                                       bool diode_by_model, std::string& why) {
    for (const char* k : kThermalKeys)
        if (key == k) {
            why = fmt::format("self-heating parameter '{}': the device's m is not known to "
                              "scale its thermal network",
                              key);
            return std::nullopt;
        }
    if (key == "kf" || key == "af" || key == "level") {
        why = fmt::format("'{}' is not followed by a factor ({})", key,
                          key == "level" ? "the model's equations change"
                                         : "flicker noise follows m only in part");
        return std::nullopt;
    }
    char family = family_of(type);
    ModelKmRule km = family == 'd' && diode_by_model ? diode_model_km_rule(key) : ModelKmRule{};
    if (type == "vdmos" && f.km != 1)
        for (const char* cap : kVdmosGateCaps)
            if (key == cap) km = ModelKmRule{-1, "F"};
    UnitExponents e{km.km_power, 0};
    char rules = type == "vdmos" ? 'v' : family;
    if (f.kf != 1)
        for (const auto& r : kChargeRules)
            if (r.family == rules && key == r.key) {
                e.kf = r.kf_power > 0 ? 1 : -1;
                break;
            }
    return e;
}

void ScalePass::note_diode_distortion(const Deck& deck) {
    if (!analyses_) analyses_ = std::make_shared<const DeckAnalyses>(find_analyses(deck));
    if (!analyses_->asks_disto || diode_by_model()) return;
    const ToleranceScan::Place& d = *tolerances_.diode;
    // ngspice 39.3 runs (a diode at 0.6 V through 1 kOhm, Km = Kf = 10): every other
    // analysis followed m to 1e-13, the .disto harmonics came out 99 % low with m = 0.1 and
    // 95 % off with area = 0.1 (shared notes "scaling-rules.md" §6); the model card follows
    // (scale/diode_model.hpp), so this note is for decks whose models cannot.
    result_.notes.push_back(deck.files[d.file].source->diagnose(
        Severity::note, d.offset, 1,
        "ngspice 39's .disto does not apply a diode's m (nor its area) to the distortion "
        "terms, and the diode models of this deck cannot carry Km instead (a parameter not "
        "known here, flicker noise, or a model not in the deck), so its .disto results do not "
        "follow Km (a diode scaled by m = 0.1 gave harmonics 99 % low); every other analysis "
        "does, and verify shows how far the distortion moved"));
}

void ScalePass::note_gmin(const Deck& deck) {
    const ToleranceScan& s = tolerances_;
    if (!s.gmin_times_m) return;
    std::string what;
    if (s.gmin_apart)
        what =
            "ngspice multiplies the GMIN across Gummel-Poon BJT and BSIM-family MOS junctions "
            "by the device's m, but not the GMIN across D, J, Z, MOS level 1-3, VDMOS, VBIC "
            "and HICUM junctions: with both in this deck GMIN is divided by Km for the latter, "
            "so the former's GMIN currents (GMIN times a junction voltage) come out Km times "
            "too small";
    else if (deck.symbols.gmin_set)
        what =
            "the deck's gmin is divided by Km, but ngspice multiplies the GMIN across "
            "Gummel-Poon BJT and BSIM-family MOS junctions by the device's m already: their "
            "GMIN currents (GMIN times a junction voltage) come out Km times too small";
    else
        return;
    std::size_t file = s.end ? s.end->file : 0;
    std::uint32_t offset = s.end ? s.end->offset : 0;
    result_.notes.push_back(deck.files[file].source->diagnose(Severity::note, offset, 1, what));
}

}  // namespace deckscale
