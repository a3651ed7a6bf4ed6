#include "verify/flicker_check.hpp"

#include <cmath>
#include <map>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "scale/flicker.hpp"

namespace deckscale {

std::vector<std::string> flicker_differences(const Deck& original, const Deck& scaled,
                                             ScaleFactors f) {
    // Models of the same name (in different subcircuits) are paired in the order they appear.
    std::map<std::string, std::vector<FlickerModel>> in_scaled;
    for (auto& m : flicker_models(scaled)) in_scaled[to_lower(m.name)].push_back(std::move(m));
    std::map<std::string, std::size_t> seen;
    std::vector<std::string> out;
    for (const auto& m : flicker_models(original)) {
        std::string key = to_lower(m.name);
        std::size_t index = seen[key]++;
        if (!m.has_flicker()) continue;
        std::string why;
        auto k = flicker_kf_factor(m, f, why);
        std::string name = fmt::format("model '{}' ({})", m.name, m.where);
        if (!k) {
            out.push_back(
                fmt::format("{}: its flicker noise is not known to follow: {}", name, why));
            continue;
        }
        if (flicker_follows(*k)) continue;
        const auto& candidates = in_scaled[key];
        const FlickerModel* s = index < candidates.size() ? &candidates[index] : nullptr;
        if (s && s->kf && m.kf && s->plain &&
            std::fabs(*s->kf - *m.kf * *k) <= 1e-6 * std::fabs(*m.kf * *k))
            continue;  // rewritten by the noise-following rule
        out.push_back(
            fmt::format("{}: its flicker noise (KF = {:.6g}, AF = {:.6g}) does not follow: "
                        "KF would have to be x{:.6g} (deckscale scale --follow-flicker "
                        "writes that)",
                        name, m.kf.value_or(0), m.af, *k));
    }
    return out;
}

}  // namespace deckscale
