// Physical units of deck values and how each one scales. A scaled circuit reproduces the
// original when node voltages stay, branch currents are divided by Km and time is divided
// by Kf; so a value of unit U is multiplied by Km^a * Kf^b with (a, b) from U's SI
// dimensions, V -> 1, A -> 1/Km, s -> 1/Kf (shared notes "scaling-rules.md" §0; the classic
// R' = Km R, L' = Km/Kf L, C' = C/(Km Kf) follow, common practice).
#pragma once

#include <cmath>
#include <string_view>

namespace deckscale {

enum class Unit : unsigned char {
    none,      // dimensionless, temperature, geometry, counts, degrees
    volt,
    ampere,
    ohm,
    siemens,
    second,
    hertz,     // also rad/s and 1/s (damping)
    farad,     // also coulomb (charge scales like capacitance times voltage)
    henry,
    signal,    // a source's own quantity: volt on V sources, ampere on I sources
};

struct ScaleFactors {
    double km = 1;
    double kf = 1;
};

struct UnitExponents {
    int km;
    int kf;
};

constexpr UnitExponents exponents(Unit u) {
    switch (u) {
        case Unit::none: return {0, 0};
        case Unit::volt: return {0, 0};
        case Unit::ampere: return {-1, 0};
        case Unit::ohm: return {1, 0};
        case Unit::siemens: return {-1, 0};
        case Unit::second: return {0, -1};
        case Unit::hertz: return {0, 1};
        case Unit::farad: return {-1, -1};
        case Unit::henry: return {1, -1};
        case Unit::signal: return {0, 0};  // resolved to volt or ampere before use
    }
    return {0, 0};
}

// x^n for a small integer n, by multiplication (exact for n = -1, 0, 1 like std::pow).
inline double int_power(double x, int n) {
    double r = 1;
    for (int i = 0; i < (n < 0 ? -n : n); ++i) r *= x;
    return n < 0 ? 1 / r : r;
}

inline double factor_of(UnitExponents e, ScaleFactors f) {
    return int_power(f.km, e.km) * int_power(f.kf, e.kf);
}

inline double factor_of(Unit u, ScaleFactors f) { return factor_of(exponents(u), f); }

constexpr std::string_view unit_name(Unit u) {
    switch (u) {
        case Unit::none: return "-";
        case Unit::volt: return "V";
        case Unit::ampere: return "A";
        case Unit::ohm: return "Ohm";
        case Unit::siemens: return "S";
        case Unit::second: return "s";
        case Unit::hertz: return "Hz";
        case Unit::farad: return "F";
        case Unit::henry: return "H";
        case Unit::signal: return "V|A";
    }
    return "-";
}

}  // namespace deckscale
