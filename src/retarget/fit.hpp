// Best fit of the impedance level: within a range of Km the user allows, the Km at which the
// deck's R, C and L values, rounded to their series, land closest to the ideal ones. The
// score is the worst part's error on a log scale, |ln(rounded/ideal)|; between Km values that
// score alike (to 1e-9), the one with the smaller worst capacitor error wins (capacitors
// usually come in the coarsest series), then the smaller Km.
#pragma once

#include <string>
#include <vector>

#include "values/snap.hpp"

namespace deckscale {

struct FitPart {
    std::string name;
    char letter = 0;   // 'r', 'c' or 'l'
    double value = 0;  // at Km = 1: R and L scale by Km, C by 1/Km
};

// The part's rounding error at `km`: rounded/ideal - 1 (0 when its kind has no series).
double part_error(const FitPart& part, const SnapSeries& series, double km);

struct FitScore {
    double worst = 0;            // max |ln(rounded/ideal)| over the parts with a series
    double worst_capacitor = 0;  // the same over capacitors
};

FitScore fit_score(const std::vector<FitPart>& parts, const SnapSeries& series, double km);

struct FitChoice {
    double km = 1;
    FitScore score;
    int candidates = 0;  // Km values scored
};

// Exact over the range: the score is the largest of the parts' |ln error|, each linear in
// ln Km between the points where a part lies on a member or midway between two; so the best
// Km is one of those points, the ends, or in some interval the point where the highest rising
// and the highest falling line meet. All are scored; the best is returned.
FitChoice best_fit(const std::vector<FitPart>& parts, const SnapSeries& series, double km_low,
                   double km_high);

}  // namespace deckscale
