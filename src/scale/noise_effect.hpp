// What a rescaling does to noise, for the change report: a higher impedance level buys lower
// power at the cost of noise. Thermal and shot noise follow the rescaled circuit as output
// noise density x sqrt(Km) at Kf f and integrated output noise x sqrt(Km Kf) over the mapped
// band (shared notes "scaling-rules.md" §8, checked there with ngspice 39); flicker noise
// does so only where its KF follows (scale/flicker.hpp).
#pragma once

#include <string>
#include <vector>

#include "deck/load.hpp"
#include "scale/units.hpp"

namespace deckscale {

struct NoiseEffect {
    double density = 1;     // output noise density at Kf f over the original's at f: sqrt(Km)
    double integrated = 1;  // integrated output noise over the mapped band: sqrt(Km Kf)
    // Models with flicker noise, named with where they are ("dmod (deck.cir:7)"):
    std::vector<std::string> flicker_rewritten;  // KF rewritten by --follow-flicker
    std::vector<std::string> flicker_off;        // KF left: their flicker noise does not follow
    std::vector<std::string> flicker_unknown;    // not known whether it follows
    std::string line;                            // one line for people; empty when Km = Kf = 1
};

NoiseEffect noise_effect(const Deck& deck, ScaleFactors f, bool follow_flicker);

// An amplitude ratio in dB, "+10 dB", "-6.02 dB".
std::string amplitude_db_text(double ratio);

}  // namespace deckscale
