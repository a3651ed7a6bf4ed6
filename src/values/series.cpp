#include "values/series.hpp"

#include <cmath>
#include <stdexcept>
#include <string>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

// 10^(i/n) rounded half up to `figures` significant figures, in hundredths (100 ... 1000).
int by_rule(int i, int n, int figures) {
    double x = std::pow(10.0, static_cast<double>(i) / n);
    double unit = figures == 2 ? 10 : 1;  // hundredths per last digit
    return static_cast<int>(std::floor(x * 100 / unit + 0.5) * unit);
}

// The members the standard fixed otherwise than the rule (IEC 60063:2015; the historical
// E24 values, and E192's 9.20 where the rule gives 9.19): index -> hundredths.
struct Exception {
    int n, index, hundredths;
};
constexpr Exception kExceptions[] = {
    {24, 10, 270}, {24, 11, 300}, {24, 12, 330}, {24, 13, 360},   {24, 14, 390},
    {24, 15, 430}, {24, 16, 470}, {24, 22, 820}, {192, 185, 920},
};

std::vector<int> generated(int n) {
    std::vector<int> v;
    for (int i = 0; i < n; ++i) v.push_back(by_rule(i, n, n <= 24 ? 2 : 3));
    for (const auto& e : kExceptions)
        if (e.n == n) v[e.index] = e.hundredths;
    return v;
}

ESeries every(int step, int n, const std::vector<int>& base) {
    ESeries s{n, {}};
    for (std::size_t i = 0; i < base.size(); i += step) s.hundredths.push_back(base[i]);
    return s;
}

}  // namespace

ESeries e_series(int n) {
    switch (n) {
        case 3:
        case 6:
        case 12:
        case 24:
            return every(24 / n, n, generated(24));
        case 48:
        case 96:
        case 192:
            return every(192 / n, n, generated(192));
    }
    throw std::invalid_argument("no E series E" + std::to_string(n));
}

std::optional<ESeries> e_series(std::string_view name) {
    std::string s = to_lower(name);
    if (s.size() < 2 || s[0] != 'e') return std::nullopt;
    for (int n : {3, 6, 12, 24, 48, 96, 192})
        if (s == "e" + std::to_string(n)) return e_series(n);
    return std::nullopt;
}

double nearest(const ESeries& s, double value) {
    double decade = std::pow(10.0, std::floor(std::log10(value)));
    double best = 0, best_distance = 0;
    // Members of the decade below, this one and the next one's first: floating-point
    // decade boundaries cannot hide the nearest.
    for (double d : {decade / 10, decade, decade * 10})
        for (int h : s.hundredths) {
            double m = h / 100.0 * d;
            double distance = std::abs(std::log(m / value));
            if (best == 0 || distance < best_distance - 1e-12 ||
                (std::abs(distance - best_distance) <= 1e-12 && m > best)) {
                best = m;
                best_distance = distance;
            }
        }
    return best;
}

bool is_member(const ESeries& s, double value) {
    if (!(value > 0)) return false;
    double m = nearest(s, value);
    return std::abs(m / value - 1) <= 1e-9;
}

}  // namespace deckscale
