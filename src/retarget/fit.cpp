#include "retarget/fit.hpp"

#include <cmath>

namespace deckscale {
namespace {

constexpr int kGridPoints = 1000;

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

FitChoice best_fit(const std::vector<FitPart>& parts, const SnapSeries& series, double lo, double hi) {
    std::vector<double> candidates{lo, hi};
    double span = std::log(hi / lo);
    for (int i = 1; i < kGridPoints; ++i) candidates.push_back(lo * std::exp(span * i / kGridPoints));
    for (const auto& p : parts) {
        const auto& e = series_of(series, p.letter);
        if (!e || !(p.value > 0)) continue;
        // Members m (and geometric midpoints) in every decade the part can reach.
        double v_lo = scaled(p, p.letter == 'c' ? hi : lo), v_hi = scaled(p, p.letter == 'c' ? lo : hi);
        for (int d = static_cast<int>(std::floor(std::log10(v_lo))); d <= std::ceil(std::log10(v_hi)); ++d) {
            const auto& h = e->hundredths;
            for (std::size_t i = 0; i < h.size(); ++i) {
                double m = h[i] / 100.0 * std::pow(10.0, d);
                double next = (i + 1 < h.size() ? h[i + 1] / 100.0 : 10.0) * std::pow(10.0, d);
                for (double target : {m, std::sqrt(m * next)}) {
                    double km = p.letter == 'c' ? p.value / target : target / p.value;
                    if (km >= lo && km <= hi) candidates.push_back(km);
                }
            }
        }
    }
    FitChoice best;
    bool first = true;
    for (double km : candidates) {
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
