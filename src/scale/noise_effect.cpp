#include "scale/noise_effect.hpp"

#include <algorithm>
#include <cmath>

#include <fmt/format.h>

#include "scale/expression.hpp"
#include "scale/flicker.hpp"

namespace deckscale {
namespace {

// Three significant digits without an exponent where that stays short: "x3.16", "x1000".
std::string three_digits(double r) {
    if (!(r >= 1e-4 && r < 1e7)) return fmt::format("{:.3g}", r);
    int decimals = std::max(0, 2 - static_cast<int>(std::floor(std::log10(r))));
    std::string s = fmt::format("{:.{}f}", r, decimals);
    if (s.find('.') != std::string::npos) {
        while (s.back() == '0') s.pop_back();
        if (s.back() == '.') s.pop_back();
    }
    return s;
}

std::string ratio_text(double r) {
    return fmt::format("x{} ({})", three_digits(r), amplitude_db_text(r));
}

std::string names(const std::vector<std::string>& v) {
    std::string s;
    for (const auto& n : v) s += (s.empty() ? "" : ", ") + n;
    return s;
}

}  // namespace

std::string amplitude_db_text(double ratio) {
    double db = 20 * std::log10(ratio);
    if (std::fabs(db) < 5e-13) db = 0;
    return fmt::format("{:+.3g} dB", db);
}

NoiseEffect noise_effect(const Deck& deck, ScaleFactors f, bool follow_flicker) {
    NoiseEffect e;
    e.density = std::sqrt(f.km);
    e.integrated = std::sqrt(f.km * f.kf);
    if (f.km == 1 && f.kf == 1) return e;
    for (const auto& m : flicker_models(deck)) {
        if (!m.has_flicker()) continue;
        std::string why;
        auto k = flicker_kf_factor(m, f, why);
        std::string name = fmt::format("{} ({})", m.name, m.where);
        if (!k)
            e.flicker_unknown.push_back(name);
        else if (flicker_follows(*k))
            continue;
        else
            (follow_flicker ? e.flicker_rewritten : e.flicker_off).push_back(name);
    }
    std::string km = fmt::format("noise (thermal, shot): Km = {}", factor_text(f.km));
    if (f.kf == 1)
        e.line = fmt::format("{}: output noise density and integrated output noise {}", km,
                             ratio_text(e.density));
    else if (f.km == 1)
        e.line = fmt::format(
            "{}: output noise density unchanged at Kf f; integrated output noise "
            "{} over the Kf = {} times wider band",
            km, ratio_text(e.integrated), factor_text(f.kf));
    else
        e.line = fmt::format(
            "{}: output noise density {} at Kf f; integrated output noise {} over "
            "the Kf = {} times wider band",
            km, ratio_text(e.density), ratio_text(e.integrated), factor_text(f.kf));
    if (!e.flicker_rewritten.empty())
        e.line += fmt::format("; flicker noise follows too: KF rewritten in {}",
                              names(e.flicker_rewritten));
    if (!e.flicker_off.empty())
        e.line += fmt::format(
            "; flicker (1/f) noise of {} does not follow (--follow-flicker "
            "rewrites KF)",
            names(e.flicker_off));
    if (!e.flicker_unknown.empty())
        e.line +=
            fmt::format("; flicker noise of {} is not known to follow", names(e.flicker_unknown));
    return e;
}

}  // namespace deckscale
