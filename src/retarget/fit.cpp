#include "retarget/fit.hpp"

#include <algorithm>
#include <cmath>

namespace deckscale {
namespace {

const std::optional<ESeries>& series_of(const SnapSeries& s, char letter) {
    return letter == 'r' ? s.r : letter == 'c' ? s.c : s.l;
}

double scaled(const FitPart& p, double km) { return p.letter == 'c' ? p.value / km : p.value * km; }

bool better(const FitScore& a, const FitScore& b) {
    if (a.worst < b.worst - 1e-9) return true;
    if (a.worst > b.worst + 1e-9) return false;
    return a.worst_capacitor < b.worst_capacitor - 1e-9;
}

}  // namespace

double part_error(const FitPart& p, const SnapSeries& series, double km) {
    const auto& e = series_of(series, p.letter);
    if (!e || !(p.value > 0)) return 0;
    double ideal = scaled(p, km);
    return nearest(*e, ideal) / ideal - 1;
}

FitScore fit_score(const std::vector<FitPart>& parts, const SnapSeries& series, double km) {
    FitScore s;
    for (const auto& p : parts) {
        const auto& e = series_of(series, p.letter);
        if (!e || !(p.value > 0)) continue;
        double ideal = scaled(p, km);
        double err = std::abs(std::log(nearest(*e, ideal) / ideal));
        s.worst = std::max(s.worst, err);
        if (p.letter == 'c') s.worst_capacitor = std::max(s.worst_capacitor, err);
    }
    return s;
}

FitChoice best_fit(const std::vector<FitPart>& parts, const SnapSeries& series, double lo,
                   double hi) {
    // Where some part's rounding changes (midway between members) or its error is zero (on a
    // member), in u = ln Km; between two such points every part's |error| is linear in u.
    std::vector<double> points{std::log(lo), std::log(hi)};
    for (const auto& p : parts) {
        const auto& e = series_of(series, p.letter);
        if (!e || !(p.value > 0)) continue;
        double v_lo = scaled(p, p.letter == 'c' ? hi : lo),
               v_hi = scaled(p, p.letter == 'c' ? lo : hi);
        for (int d = static_cast<int>(std::floor(std::log10(v_lo))) - 1;
             d <= std::ceil(std::log10(v_hi)); ++d) {
            const auto& h = e->hundredths;
            for (std::size_t i = 0; i < h.size(); ++i) {
                double m = h[i] / 100.0 * std::pow(10.0, d);
                double next = (i + 1 < h.size() ? h[i + 1] / 100.0 : 10.0) * std::pow(10.0, d);
                for (double target : {m, std::sqrt(m * next)}) {
                    double km = p.letter == 'c' ? p.value / target : target / p.value;
                    if (km >= lo && km <= hi) points.push_back(std::log(km));
                }
            }
        }
    }
    std::sort(points.begin(), points.end());
    // Candidates: every such point, and inside each interval the u where the steepest rising
    // and the steepest falling |error| lines meet (the minimum of their maximum).
    std::vector<double> candidates = points;
    for (std::size_t k = 0; k + 1 < points.size(); ++k) {
        double a = points[k], b = points[k + 1];
        if (b - a < 1e-12) continue;
        double um = (a + b) / 2;
        double rising = -1e300, falling = -1e300;  // max of |e| - u, max of |e| + u
        for (const auto& p : parts) {
            const auto& e = series_of(series, p.letter);
            if (!e || !(p.value > 0)) continue;
            double ideal = scaled(p, std::exp(um));
            double err = std::log(nearest(*e, ideal) / ideal);  // d err/du: -1 (R, L), +1 (C)
            double slope = (p.letter == 'c' ? 1 : -1) * (err >= 0 ? 1 : -1);
            if (slope > 0)
                rising = std::max(rising, std::abs(err) - um);
            else
                falling = std::max(falling, std::abs(err) + um);
        }
        if (rising > -1e299 && falling > -1e299)
            candidates.push_back(std::clamp((falling - rising) / 2, a, b));
    }
    FitChoice best;
    bool first = true;
    for (double u : candidates) {
        double km = std::clamp(std::exp(u), lo, hi);
        FitScore s = fit_score(parts, series, km);
        if (first || better(s, best.score) || (!better(best.score, s) && km < best.km)) {
            best.km = km;
            best.score = s;
            first = false;
        }
    }
    best.candidates = static_cast<int>(candidates.size());
    return best;
}

}  // namespace deckscale
