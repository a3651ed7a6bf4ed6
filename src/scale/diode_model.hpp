// Diodes scaled through their model card instead of m. ngspice 39's .disto leaves a diode's m
// and area out of its distortion terms (harmonics 99 % low at m = 0.1), while a model card
// with its currents and capacitances divided by Km and its series resistance multiplied by Km
// is the same diode 1/Km as large to every analysis, .disto included (shared notes
// "scaling-rules.md" §4 "D model alternative" and §6; ngspice 39.3 runs here: AC and both
// harmonics within 1e-13). The pass takes this way for the diodes of a deck with .disto
// (ScalePass::diode_by_model) when every diode model of the deck can follow.
#pragma once

#include <string_view>
#include <vector>

#include "deck/load.hpp"

namespace deckscale {

struct Atom;
class ScalePass;

// How a model parameter changes with Km on its card (here a diode's on this way; the pass
// also uses it for a VDMOS's gate capacitances): the power of Km it is multiplied by (-1 for
// currents and capacitances, 1 for RS) and its unit; km_power 0 for the others.
struct ModelKmRule {
    int km_power = 0;
    const char* unit = "";
};
ModelKmRule diode_model_km_rule(std::string_view lower_key);

// True when every diode model card of the deck (include files too) can follow Km by its
// parameters alone (each parameter known, no flicker noise, no self-heating) and every D
// instance uses one of them.
bool diodes_follow_by_model(const Deck& deck);

// On a diode model card scaled this way: writes out the defaults ngspice 39 would use for a
// current the card leaves out (IS = 1e-14 A; IBV = 1e-3 A where BV is given), divided by Km
// (ngspice-39.3 src/spicelib/devices/dio/diosetup.c).
void add_diode_model_defaults(ScalePass& p, const std::vector<Atom>& atoms);

}  // namespace deckscale
