#include "yield/mask.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <sstream>

#include "deck/spice_number.hpp"

namespace deckscale {
namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

std::optional<double> number(const std::string& word) {
    NumberParse p = parse_spice_number(word);
    if (!p.number || p.problem != NumberProblem::none) return std::nullopt;
    return p.number->value;
}

// Linear interpolation in log frequency between the rows around f (f within the rows).
double interpolate(const std::vector<MaskRow>& rows, double f, double MaskRow::*field) {
    auto hi = std::lower_bound(rows.begin(), rows.end(), f,
                               [](const MaskRow& r, double x) { return r.frequency < x; });
    if (hi == rows.begin()) return (*hi).*field;
    auto lo = hi - 1;
    double t = std::log(f / lo->frequency) / std::log(hi->frequency / lo->frequency);
    return (*lo).*field + t * ((*hi).*field - (*lo).*field);
}

// Peak-to-valley ripple: the highest maximum (the ends count) less the lowest interior local
// minimum; 0 for a response without an interior minimum (a monotonic roll-off is no ripple).
double ripple_of(const std::vector<double>& db) {
    if (db.size() < 3) return 0;
    double top = *std::max_element(db.begin(), db.end());
    double valley = std::numeric_limits<double>::infinity();
    for (std::size_t k = 1; k + 1 < db.size(); ++k)
        if (db[k] < db[k - 1] && db[k] <= db[k + 1]) valley = std::min(valley, db[k]);
    return std::isinf(valley) ? 0 : top - valley;
}

}  // namespace

std::string parse_mask_rows(const std::string& text, const std::string& path, Mask& mask) {
    std::istringstream in(text);
    std::string line;
    int line_no = 0;
    mask.rows.clear();
    while (std::getline(in, line)) {
        ++line_no;
        std::istringstream words(line);
        std::vector<std::string> w;
        for (std::string s; words >> s;) w.push_back(s);
        if (w.empty() || w[0][0] == '#' || w[0][0] == '*') continue;
        auto where = [&] { return fmt::format("{}:{}: ", path, line_no); };
        if (w.size() != 3) return where() + "a mask row is: frequency min_dB max_dB";
        auto f = number(w[0]), lo = number(w[1]), hi = number(w[2]);
        if (!f || !lo || !hi) return where() + "not a number in this row";
        if (!(*f > 0)) return where() + "the frequency must be positive";
        if (*lo > *hi) return where() + "min_dB is above max_dB";
        if (!mask.rows.empty() && !(*f > mask.rows.back().frequency))
            return where() + "frequencies must increase from row to row";
        mask.rows.push_back({*f, *lo, *hi});
    }
    if (mask.rows.empty()) return path + ": the mask file has no rows";
    mask.rows_source = path;
    return "";
}

std::string parse_range(const std::string& text, double& low, double& high) {
    auto colon = text.find(':');
    if (colon == std::string::npos) return fmt::format("'{}' is not F1:F2", text);
    auto a = number(text.substr(0, colon)), b = number(text.substr(colon + 1));
    if (!a || !b || !(*a >= 0) || !(*b > *a))
        return fmt::format("'{}' is not F1:F2 with 0 <= F1 < F2", text);
    low = *a;
    high = *b;
    return "";
}

std::optional<double> corner_of(const std::vector<double>& f, const std::vector<double>& db) {
    if (db.empty()) return std::nullopt;
    std::size_t peak =
        static_cast<std::size_t>(std::max_element(db.begin(), db.end()) - db.begin());
    double level = db[peak] - 3;
    auto cross = [&](std::size_t a, std::size_t b) {  // db[a] >= level > db[b]
        double t = (db[a] - level) / (db[a] - db[b]);
        return std::exp(std::log(f[a]) + t * (std::log(f[b]) - std::log(f[a])));
    };
    for (std::size_t k = peak + 1; k < db.size(); ++k)
        if (db[k] < level) return cross(k - 1, k);
    for (std::size_t k = peak; k-- > 0;)
        if (db[k] < level) return cross(k + 1, k);
    return std::nullopt;
}

MaskJudge make_judge(const Mask& mask, const std::vector<double>& frequency,
                     const std::vector<double>& nominal_db, std::string& error) {
    MaskJudge j;
    j.frequency = frequency;
    j.nominal_db = nominal_db;
    j.corner_low = mask.corner_low;
    j.corner_high = mask.corner_high;
    std::size_t n = frequency.size();
    double peak = nominal_db.empty() ? 0 : *std::max_element(nominal_db.begin(), nominal_db.end());
    if (!nominal_db.empty())
        j.peak = static_cast<std::size_t>(std::max_element(nominal_db.begin(), nominal_db.end()) -
                                          nominal_db.begin());
    j.in_band.assign(n, 0);
    j.in_passband.assign(n, 0);
    j.lower.assign(n, nan);
    j.upper.assign(n, nan);
    bool any = false;
    for (std::size_t k = 0; k < n; ++k) {
        double f = frequency[k];
        j.in_passband[k] = nominal_db[k] >= peak - 3;
        bool band = mask.band_low ? f >= *mask.band_low && f <= *mask.band_high : j.in_passband[k];
        j.in_band[k] = band;
        if (mask.rows.empty()) {
            if (band) {
                j.lower[k] = nominal_db[k] - mask.window_db;
                j.upper[k] = nominal_db[k] + mask.window_db;
                any = true;
            }
        } else if (f >= mask.rows.front().frequency && f <= mask.rows.back().frequency) {
            j.lower[k] = interpolate(mask.rows, f, &MaskRow::min_db);
            j.upper[k] = interpolate(mask.rows, f, &MaskRow::max_db);
            any = true;
        }
    }
    if (!any && !mask.corner_low)
        error = mask.rows.empty()
                    ? "no swept frequency lies in the mask's band"
                    : "no swept frequency lies between the mask file's first and last row";
    return j;
}

ResponseFigures MaskJudge::judge(const std::vector<double>& db) const {
    ResponseFigures r;
    r.margin_db = std::numeric_limits<double>::infinity();
    std::vector<double> passband;
    for (std::size_t k = 0; k < db.size() && k < frequency.size(); ++k) {
        if (in_band[k]) r.deviation_db = std::max(r.deviation_db, std::abs(db[k] - nominal_db[k]));
        if (in_passband[k]) passband.push_back(db[k]);
        if (!std::isnan(lower[k]))
            r.margin_db = std::min({r.margin_db, db[k] - lower[k], upper[k] - db[k]});
        // A response the simulator could not compute (NaN) in the mask is outside it: std::min
        // would pass over it, and the trial would count as a pass.
        if (std::isnan(db[k]) && (in_band[k] || !std::isnan(lower[k])))
            r.margin_db = -std::numeric_limits<double>::infinity();
    }
    if (peak < db.size()) r.gain_db = db[peak];
    r.ripple_db = ripple_of(passband);
    r.corner_hz = corner_of(frequency, db);
    bool corner_ok =
        !corner_low || (r.corner_hz && *r.corner_hz >= *corner_low && *r.corner_hz <= *corner_high);
    r.pass = r.margin_db >= 0 && corner_ok;
    return r;
}

}  // namespace deckscale
