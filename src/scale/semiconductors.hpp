// Semiconductor devices (D, Q, J, Z, M) and their models. A junction device is made 1/Km as
// large by its parallel multiplier m (every current, charge and conductance times m, series
// resistances divided by it), a JFET by its area (see GMIN in semiconductors.cpp); a
// frequency change divides every capacitance and every
// transit time of the model by Kf, which leaves the DC curves alone (shared notes
// "scaling-rules.md" §4; ngspice 39 runs there: diode, BJT and MOS level 1 exact).
#pragma once

#include <map>
#include <memory>
#include <optional>
#include <string>

#include "deck/load.hpp"
#include "scale/units.hpp"

namespace deckscale {

class ScalePass;

// What a MOS model tells about whether it can follow a frequency change.
struct MosModel {
    std::string type;     // nmos, pmos, vdmos (lower case)
    int level = 1;        // ngspice's default; -1 when written as an expression
    std::string missing;  // of VTO, KP, GAMMA, PHI: those not given explicitly
};
using MosModels = std::map<std::string, MosModel>;  // by lower-case model name

// Every MOS and BJT model card of a deck (include files too): their types and levels (a BJT's
// `missing` means nothing).
std::shared_ptr<const MosModels> collect_mos_models(const Deck& deck);

// True for an element whose junctions get a GMIN that ngspice 39 does not multiply by the
// element's m: D, J, Z, M of MOS level 1-3 or VDMOS, and Q of a model other than Gummel-Poon
// (VBIC, HICUM) (`models`: the deck's MOS and BJT models).
bool gmin_apart_device(const Card& c, const MosModels& models);

// True for the .model types handled here (d npn pnp njf pjf nmf pmf nmos pmos vdmos).
bool is_semiconductor_model_type(const std::string& lower_type);

// How the .model rewrite scales parameter `key` (lower case) of a model of `lower_type`, as
// exponents of Km and Kf, for `altermod` of that parameter: a charge parameter by 1/Kf (TOX by
// Kf), a VDMOS gate capacitance by 1/Km too, every other by nothing (the instances' m does a
// magnitude change); with `diode_by_model`, a diode's by its Km rule (scale/diode_model.hpp).
// nullopt, with `why`, for what a card rewrite does not follow by a factor: self-heating,
// flicker noise and the level.
std::optional<UnitExponents> semiconductor_model_param(const std::string& lower_type,
                                                       const std::string& key, ScaleFactors f,
                                                       bool diode_by_model, std::string& why);

// Handlers called by the pass: an instance line and a .model card of a type above.
void scale_semiconductor(ScalePass& p, char letter);
void scale_semiconductor_model(ScalePass& p, const std::string& lower_type);

}  // namespace deckscale
