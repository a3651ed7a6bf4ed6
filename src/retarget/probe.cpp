#include "retarget/probe.hpp"

#include <fmt/format.h>

#include <cmath>
#include <filesystem>

#include "base/text_util.hpp"
#include "sim/simulate.hpp"
#include "verify/sim_cards.hpp"

namespace deckscale {
namespace {

// "v(out)" and "V(out)" name the node "out"; anything else is taken as the node's name.
std::string node_name(const std::string& node) {
    std::string n = to_lower(node);
    if (n.size() > 3 && n.rfind("v(", 0) == 0 && n.back() == ')') return n.substr(2, n.size() - 3);
    return n;
}

}  // namespace

const SimVector* node_vector(const SimPlot& plot, const std::string& node) {
    const SimVector* v = plot.find(node_name(node));
    if (!v) v = plot.find("v(" + node_name(node) + ")");
    return v && v->kind == VectorKind::voltage ? v : nullptr;
}

SweepResult node_response(const SimPlot& plot, const std::string& node) {
    SweepResult r;
    const SimVector* f = plot.find("frequency");
    const SimVector* v = node_vector(plot, node);
    if (!f || !v) {
        std::string nodes;
        int listed = 0;
        for (const auto& x : plot.vectors) {
            if (x.kind != VectorKind::voltage) continue;
            if (++listed > 8) {
                nodes += ", ...";
                break;
            }
            nodes += (nodes.empty() ? "" : ", ") + x.name;
        }
        r.problem = fmt::format("the deck has no node '{}' (its nodes: {})", node,
                                nodes.empty() ? "none" : nodes);
        return r;
    }
    r.response.freq.reserve(f->values.size());
    r.response.db.reserve(f->values.size());
    for (std::size_t i = 0; i < f->values.size() && i < v->values.size(); ++i) {
        r.response.freq.push_back(f->values[i].real());
        r.response.db.push_back(20 * std::log10(std::abs(v->values[i])));
    }
    return r;
}

SweepRunner node_sweeps(const Deck& deck, const std::string& path, const ProbeSettings& settings) {
    SimJob job;
    job.label = path;
    job.cards = simulation_cards(deck, SimDeckOptions{".op", settings.drive, settings.drive_ac});
    job.work_dir = std::filesystem::absolute(path).parent_path().string();
    job.timeout = settings.timeout;
    job.memory_limit_mb = settings.memory_mb;
    return [job, settings](const AcSweep& sweep) {
        SimJob j = job;
        j.cards[j.cards.size() - 2] = ac_card(sweep);  // the analysis, before ".end"
        SimOutcome o = simulate(j);
        SweepResult r;
        if (o.status != SimStatus::ok) {
            r.problem = fmt::format("simulating {} ({}) failed: {}: {}", j.label,
                                    j.cards[j.cards.size() - 2], to_string(o.status), o.message);
            return r;
        }
        for (const auto& p : o.plots)
            if (istarts_with(p.name, "ac")) return node_response(p, settings.node);
        r.problem = fmt::format("simulating {} gave no AC plot", j.label);
        return r;
    };
}

}  // namespace deckscale
