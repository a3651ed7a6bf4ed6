// Card handler for independent V and I sources: DC, AC, DISTOF and every transient
// function (ngspice 39 manual 4.1; shared notes "scaling-rules.md" §2).
#include <cmath>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/pass.hpp"
#include "scale/rules.hpp"

namespace deckscale {
namespace {

bool is_function(const std::string& w) {
    return w == "pulse" || w == "sin" || w == "sine" || w == "exp" || w == "pwl" || w == "sffm" ||
           w == "am" || w == "trnoise" || w == "trrandom";
}

// Fields of one value that ngspice 39 takes bare ("acmag 2") as well as keyed ("acmag=2"):
// names of the parameter tables in vsrc.c and isrc.c of ngspice-39.3, where "c" is the
// current source's alias of "dc" and "r"/"td" (PWL repeat and delay) are voltage-source
// only [T: libngspice 39 reads "I1 b 0 c 2m acmag 1m" as 2 mA DC and 1 mA AC, and refuses
// "r=0" on a current source as an unknown parameter].
bool is_single_value_field(const std::string& w, char letter) {
    if (w == "acmag" || w == "acphase") return true;
    return letter == 'v' ? (w == "r" || w == "td") : (w == "c" || w == "m");
}

Unit resolve(Unit u, char letter) {
    if (u != Unit::signal) return u;
    return letter == 'i' ? Unit::ampere : Unit::volt;
}

bool is_port_field(const std::string& w) {
    return w == "portnum" || w == "z0" || w == "pwr" || w == "freq" || w == "phase";
}

// A V source that is an RF port (ngspice 39 manual 4.1.11; vsrc.c, vsrcpar.c, vsrctemp.c
// in ngspice-39.3): "portnum n" makes it one, and then its reference impedance z0 (default
// 50 Ohm, taken when portnum meets no positive z0 set before it), and, for a transient,
// its available power pwr (default 1 mW) and frequency freq (default 1 GHz), which drive
// it with a sine of amplitude sqrt(4 pwr z0). Each field is "name value" or "name=value",
// applied in card order. S-parameters stay with z0 x Km (shared notes "scaling-rules.md"
// §2, verified there); the sine keeps its voltage with pwr / Km and follows with freq x Kf.
class RfPort {
public:
    void field(ScalePass& p, const std::string& w, const Token* value) {
        if (w == "portnum") {
            bool off = value && p.is_number(*value) &&
                       std::floor(0.5 + parse_spice_number(p.text(*value)).number->value) <= 0;
            if (value) p.scale_value(*value, Unit::none, "portnum");
            if (off) return;
            port_ = true;
            if (z0_ != Z0::positive) z0_ = Z0::by_default;
        } else if (w == "z0") {
            if (!value) return;
            p.scale_value(*value, Unit::ohm, "z0");
            bool not_positive =
                p.is_number(*value) && parse_spice_number(p.text(*value)).number->value <= 0;
            z0_ = not_positive ? Z0::not_positive : Z0::positive;
        } else if (w == "pwr") {
            if (value) p.scale_by(*value, 1 / p.factors().km, "pwr", "W", UnitExponents{-1, 0});
            drive_ = pwr_ = true;
        } else if (w == "freq") {
            if (value) p.scale_value(*value, Unit::hertz, "freq");
            drive_ = freq_ = true;
        } else if (value) {
            p.scale_value(*value, Unit::none, w);
        }
    }

    // Writes out the defaults a port relies on that the factors change.
    void finish(ScalePass& p) const {
        if (!port_) return;
        ScaleFactors f = p.factors();
        std::string added;
        if (z0_ == Z0::by_default && f.km != 1)
            added += fmt::format(" z0={}", format_plain(50 * f.km, p.digits()));
        if (drive_ && !pwr_ && f.km != 1)
            added += fmt::format(" pwr={}", format_plain(1e-3 / f.km, p.digits()));
        if (drive_ && !freq_ && f.kf != 1)
            added += fmt::format(" freq={}", format_plain(1e9 * f.kf, p.digits()));
        if (!added.empty())
            p.insert(p.card().fields.back().end, added, "port defaults (added)", 1);
    }

private:
    enum class Z0 { unset, positive, not_positive, by_default };
    bool port_ = false, drive_ = false, pwr_ = false, freq_ = false;
    Z0 z0_ = Z0::unset;
};

}  // namespace

void scale_source(ScalePass& p, char letter) {
    std::string scope(1, letter);
    const auto& atoms = p.atoms(1);
    auto value_at = [&](std::size_t i) {
        return i < atoms.size() && !atoms[i].key && p.is_value_token(*atoms[i].value);
    };
    auto rule = [&](std::string_view sc, std::string_view field) {
        auto u = find_rule(sc, field);
        return resolve(*u, letter);
    };
    bool have_dc = false;
    RfPort port;
    for (std::size_t i = 2; i < atoms.size(); ++i) {  // atoms 0 and 1 are the nodes
        const Atom& a = atoms[i];
        if (a.key) {
            std::string key = to_lower(p.text(*a.key));
            if (key == "ac" || key == "dc") {  // "AC=1" is accepted by ngspice too
                if (a.value) p.scale_value(*a.value, rule(scope, key), key);
                if (key == "ac" && value_at(i + 1)) p.scale_value(*atoms[++i].value, Unit::none, "ac phase");
                continue;
            }
            if (letter == 'v' && is_port_field(key)) {
                port.field(p, key, a.value);
                continue;
            }
            auto u = find_rule(scope, key);
            if (!u) {
                p.unscalable(*a.key, fmt::format("parameter '{}' is not in the rule table for "
                                                 "{} sources", p.text(*a.key), letter == 'v' ? "voltage" : "current"));
                continue;
            }
            if (a.value) p.scale_value(*a.value, resolve(*u, letter), key);
            continue;
        }
        const Token& t = *a.value;
        std::string w = to_lower(p.text(t));
        if (w == "dc") {
            if (value_at(i + 1)) p.scale_value(*atoms[++i].value, rule(scope, "dc"), "dc");
            have_dc = true;
        } else if (w == "ac" || w == "distof1" || w == "distof2") {
            if (value_at(i + 1)) p.scale_value(*atoms[++i].value, rule(scope, w), w);
            if (value_at(i + 1)) p.scale_value(*atoms[++i].value, Unit::none, w + " phase");
        } else if (is_function(w)) {
            // Arguments: every following value up to the next word that is not one.
            std::vector<const Token*> args;
            std::size_t j = i + 1;
            while (j < atoms.size() && !atoms[j].key && p.is_value_token(*atoms[j].value))
                args.push_back(atoms[j++].value);
            if (w == "trrandom" && letter == 'i' && !args.empty() && p.is_number(*args[0]) &&
                parse_spice_number(p.text(*args[0])).number->value == 4) {
                p.unscalable(t, "TRRANDOM type 4 (Poisson) on a current source: its rate cannot "
                                "be divided; scale the source with m= instead");
                i = j - 1;
                continue;
            }
            for (std::size_t k = 0; k < args.size(); ++k) {
                std::string field;
                Unit u;
                if (w == "pwl") {
                    field = k % 2 == 0 ? "time" : "value";
                    u = rule("pwl", field);
                    field = fmt::format("pwl {} {}", field, k / 2 + 1);
                } else {
                    std::string pos = fmt::format("#{}", k + 1);
                    auto r = find_rule(w == "sine" ? "sin" : w, pos);
                    if (!r) {
                        p.unscalable(*args[k], fmt::format("{} has no argument {}", p.text(t), k + 1));
                        continue;
                    }
                    u = resolve(*r, letter);
                    field = fmt::format("{} {}", w, pos);
                }
                p.scale_value(*args[k], u, field);
            }
            i = j - 1;
        } else if (is_single_value_field(w, letter)) {
            if (value_at(i + 1))
                p.scale_value(*atoms[++i].value, rule(scope, w), w);
            else
                p.unscalable(t, fmt::format("source field '{}' needs a value", p.text(t)));
            if (w == "c") have_dc = true;
        } else if (w == "external") {
            p.unscalable(t, "EXTERNAL sources get their values from the host program, which "
                            "must supply scaled values itself");
        } else if (letter == 'v' && is_port_field(w)) {
            port.field(p, w, value_at(i + 1) ? atoms[++i].value : nullptr);
        } else if (!have_dc && p.is_value_token(t)) {
            p.scale_value(t, rule(scope, "dc"), "dc");
            have_dc = true;
        } else {
            p.unscalable(t, fmt::format("unknown source field '{}'", p.text(t)));
        }
    }
    port.finish(p);
}

}  // namespace deckscale
