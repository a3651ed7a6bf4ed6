#include "verify/disto_compare.hpp"

#include <fmt/format.h>

#include "base/text_util.hpp"

namespace deckscale {

std::string disto_part(const std::string& plot_name) {
    static constexpr std::string_view kPrefix = "distortion - ";
    if (istarts_with(plot_name, kPrefix)) return plot_name.substr(kPrefix.size());
    return plot_name;
}

std::vector<Comparison> compare_disto(const std::vector<SimPlot>& original,
                                      const std::vector<SimPlot>& scaled, double km, double kf,
                                      const Tolerances& tol, std::string& problem) {
    auto distortion = [](const std::vector<SimPlot>& plots) {
        std::vector<const SimPlot*> out;
        for (const auto& p : plots)
            if (istarts_with(p.name, "disto")) out.push_back(&p);
        return out;
    };
    auto po = distortion(original), ps = distortion(scaled);
    if (po.empty() || po.size() != ps.size()) {
        problem = fmt::format("the simulator produced {} distortion plot(s) for the original "
                              "and {} for the scaled deck",
                              po.size(), ps.size());
        return {};
    }
    std::vector<Comparison> out;
    for (const SimPlot* o : po) {
        const SimPlot* s = nullptr;
        for (const SimPlot* c : ps)
            if (iequals(c->name, o->name)) s = c;
        if (!s) {
            problem = fmt::format("the scaled deck's run has no distortion plot '{}'", o->name);
            return {};
        }
        Comparison c = compare_ac(*o, *s, km, kf, tol);
        c.analysis = "disto";
        c.part = disto_part(o->analysis.empty() ? o->name : o->analysis);
        out.push_back(std::move(c));
    }
    return out;
}

}  // namespace deckscale
