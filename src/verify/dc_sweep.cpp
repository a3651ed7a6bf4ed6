#include "verify/dc_sweep.hpp"

#include <fmt/format.h>

#include "deck/sweep_rewrite.hpp"
#include "scale/sweep_unit.hpp"

namespace deckscale {

std::optional<double> dc_item_factor(const DcLevel& level, double km) {
    auto u = swept_unit(level.item);
    if (!u) return std::nullopt;
    return factor_of(*u, ScaleFactors{km, 1});
}

std::string dc_item_unit(const DcLevel& level) {
    auto u = swept_unit(level.item);
    if (!u) return "";
    return *u == Unit::none ? "degC" : std::string(unit_name(*u));
}

std::optional<DcSweep> map_dc(const DcSweep& s, double km, double reltol, std::string& problem) {
    DcSweep m = s;
    for (auto& l : m.levels) {
        auto factor = dc_item_factor(l, km);
        if (!factor) {
            problem = fmt::format("the .dc sweep of '{}': only V and I sources, resistors and "
                                  "TEMP are swept by a known law",
                                  l.item);
            return std::nullopt;
        }
        if (*factor == 1) continue;
        SweepRewrite w = rewrite_sweep(SweepKind::dc, {l.start, l.stop, l.step}, *factor, reltol);
        if (!w.refusal.empty()) {
            problem = fmt::format("the .dc sweep of '{}' cannot be stepped alike after scaling: {}",
                                  l.item, w.refusal);
            return std::nullopt;
        }
        l.start = w.fields[0];
        l.stop = w.fields[1];
        l.step = w.fields[2];
    }
    return m;
}

}  // namespace deckscale
