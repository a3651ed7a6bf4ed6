#include "yield/stats.hpp"

#include <algorithm>
#include <cmath>

namespace deckscale {

Interval wilson_interval(std::uint64_t passed, std::uint64_t trials, double z) {
    if (trials == 0) return {};
    double n = static_cast<double>(trials);
    double p = static_cast<double>(passed) / n;
    double z2 = z * z;
    double centre = (p + z2 / (2 * n)) / (1 + z2 / n);
    double half = z / (1 + z2 / n) * std::sqrt(p * (1 - p) / n + z2 / (4 * n * n));
    return {std::max(0.0, centre - half), std::min(1.0, centre + half)};
}

Summary summarize(std::vector<double> v) {
    Summary s;
    s.count = v.size();
    if (v.empty()) return s;
    std::sort(v.begin(), v.end());
    double sum = 0;
    for (double x : v) sum += x;
    s.mean = sum / static_cast<double>(v.size());
    double ss = 0;
    for (double x : v) ss += (x - s.mean) * (x - s.mean);
    s.sd = v.size() > 1 ? std::sqrt(ss / static_cast<double>(v.size() - 1)) : 0;
    auto quantile = [&](double q) {
        double h = (static_cast<double>(v.size()) - 1) * q;
        auto lo = static_cast<std::size_t>(std::floor(h));
        std::size_t hi = std::min(lo + 1, v.size() - 1);
        return v[lo] + (h - static_cast<double>(lo)) * (v[hi] - v[lo]);
    };
    s.min = v.front();
    s.max = v.back();
    s.p5 = quantile(0.05);
    s.median = quantile(0.5);
    s.p95 = quantile(0.95);
    return s;
}

std::vector<Sensitivity> rank_sensitivities(const std::vector<std::string>& parts,
                                            const std::vector<std::vector<double>>& deviations,
                                            const std::vector<double>& figure) {
    std::vector<Sensitivity> out;
    std::size_t n = figure.size();
    if (n < 2) return out;
    double my = 0;
    for (double y : figure) my += y;
    my /= static_cast<double>(n);
    double vy = 0;
    for (double y : figure) vy += (y - my) * (y - my);
    for (std::size_t p = 0; p < parts.size() && p < deviations.size(); ++p) {
        const std::vector<double>& x = deviations[p];
        if (x.size() != n) continue;
        double mx = 0;
        for (double v : x) mx += v;
        mx /= static_cast<double>(n);
        double vx = 0, cxy = 0;
        for (std::size_t t = 0; t < n; ++t) {
            vx += (x[t] - mx) * (x[t] - mx);
            cxy += (x[t] - mx) * (figure[t] - my);
        }
        if (!(vx > 0)) continue;  // a part held at its nominal value
        double slope = cxy / vx;
        out.push_back({parts[p], slope, vy > 0 ? slope * slope * vx / vy : 0});
    }
    std::stable_sort(out.begin(), out.end(),
                     [](const Sensitivity& a, const Sensitivity& b) { return a.share > b.share; });
    return out;
}

}  // namespace deckscale
