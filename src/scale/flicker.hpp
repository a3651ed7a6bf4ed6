// Flicker (1/f) noise under scaling. Thermal and shot noise follow a rescaled circuit by
// themselves (output noise density x sqrt(Km) at Kf f, shared notes "scaling-rules.md" §8);
// a flicker current PSD KF I^AF / f^EF does not: at the mapped frequency its PSD changes by
// another factor, which depends on how ngspice 39 lets the instance's m or area and the
// model's TOX enter its formula. This file knows, per model family, the factor KF must be
// multiplied by so that flicker noise follows the thermal law too (the noise-following rule,
// `scale --follow-flicker`), for decks scaled the way this tool scales them (D, Q, Z, M by m;
// J by area; R by value; MOS level 1 TOX x Kf).
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "deck/card.hpp"
#include "deck/load.hpp"
#include "scale/units.hpp"

namespace deckscale {

struct Atom;
class ScalePass;

struct FlickerModel {
    std::string name;          // as written
    std::string type;          // lower case: d, npn, njf, nmf, nmos, vdmos, r, ...
    int level = 1;             // -1 when not a plain number
    std::optional<double> kf;  // KF as given; nullopt when not given (ngspice's default 0)
    double af = 1, ef = 1;     // AF and EF as given, else ngspice's default 1
    bool plain = true;         // false when KF, AF or EF is not a plain number
    // Flicker parameters other than KF given non-zero ("kfn", "noia", ...), or "default"
    // for families with flicker noise switched on by default (BSIM4, B4SOI).
    std::vector<std::string> other;
    std::string where;  // "deck.cir:12"
    bool has_flicker() const;
};

// The model of one .model card (fields from 3 on in `atoms`); nullopt for a type without
// flicker noise parameters.
std::optional<FlickerModel> flicker_model_of(const Card& card, const std::vector<Atom>& atoms);

// Every model card of the deck (include files too) whose type has flicker parameters.
std::vector<FlickerModel> flicker_models(const Deck& deck);

// The factor KF must be multiplied by so that the model's flicker noise follows the thermal
// law under `f` (1 when it follows by itself); nullopt when it is not known or KF cannot do
// it, with the reason in `why`.
std::optional<double> flicker_kf_factor(const FlickerModel& m, ScaleFactors f, std::string& why);

// True when the factor is 1 to rounding (nothing to rewrite).
bool flicker_follows(double kf_factor);

// For the pass, on the current .model card when --follow-flicker is set: the factor its KF
// is to be multiplied by, or nullopt when there is nothing to do. A model whose flicker
// noise cannot be made to follow is reported as unscalable.
std::optional<double> flicker_rewrite(ScalePass& p);

}  // namespace deckscale
