#include "retarget/response_change.hpp"

#include <fmt/format.h>

#include <cmath>
#include <complex>
#include <filesystem>
#include <numbers>

#include "base/text_util.hpp"
#include "sim/simulate.hpp"
#include "verify/sim_cards.hpp"

namespace deckscale {
namespace {

constexpr long kPointsPerDecade = 200;

const SimPlot* ac_plot(const SimOutcome& o) {
    for (const auto& p : o.plots)
        if (istarts_with(p.name, "ac")) return &p;
    return nullptr;
}

}  // namespace

Ripple passband_ripple(const Sampled& s) {
    Ripple r;
    if (s.db.size() < 3) return r;
    std::size_t top = 0;
    for (std::size_t i = 1; i < s.db.size(); ++i)
        if (s.db[i] > s.db[top]) top = i;
    std::size_t end = top;
    while (end < s.db.size() && s.db[end] >= s.db[top] - kHalfPowerDb) ++end;
    for (std::size_t i = 1; i + 1 < end; ++i) {
        bool valley = s.db[i] <= s.db[i - 1] && s.db[i] < s.db[i + 1];
        if (valley && s.db[top] - s.db[i] > r.db) r = {s.db[top] - s.db[i], s.freq[i]};
    }
    return r;
}

ResponseChange response_change(const Deck& ideal, const std::string& ideal_path,
                               const Deck& rounded, const std::string& rounded_path,
                               const ProbeSettings& probe, const AcSweep& sweep) {
    ResponseChange c;
    AcSweep dense;
    dense.type = "dec";
    dense.points = kPointsPerDecade;
    dense.fstart = sweep.fstart;
    dense.fstop = sweep.fstop;
    std::vector<SimJob> jobs;
    for (auto [deck, path] : {std::pair{&ideal, &ideal_path}, std::pair{&rounded, &rounded_path}}) {
        SimJob j;
        j.label = *path;
        j.cards =
            simulation_cards(*deck, SimDeckOptions{ac_card(dense), probe.drive, probe.drive_ac});
        j.work_dir = std::filesystem::absolute(*path).parent_path().string();
        j.timeout = probe.timeout;
        j.memory_limit_mb = probe.memory_mb;
        jobs.push_back(std::move(j));
    }
    std::vector<SimOutcome> out = simulate_all(jobs);
    const SimVector* v[2] = {nullptr, nullptr};
    const SimVector* freq = nullptr;
    for (int k = 0; k < 2; ++k) {
        if (out[k].status != SimStatus::ok) {
            c.problem = fmt::format("simulating {} failed: {}: {}", jobs[k].label,
                                    to_string(out[k].status), out[k].message);
            return c;
        }
        const SimPlot* p = ac_plot(out[k]);
        if (p) v[k] = node_vector(*p, probe.node);
        if (p && k == 0) freq = p->find("frequency");
        if (!v[k] || !freq) {
            c.problem =
                fmt::format("{} has no node '{}' in its AC results", jobs[k].label, probe.node);
            c.missing_node = true;
            return c;
        }
    }
    Sampled a, b;
    std::size_t n = std::min({freq->values.size(), v[0]->values.size(), v[1]->values.size()});
    c.points = static_cast<long>(n);
    for (std::size_t i = 0; i < n; ++i) {
        double f = freq->values[i].real();
        auto x = v[0]->values[i], y = v[1]->values[i];
        a.freq.push_back(f);
        b.freq.push_back(f);
        a.db.push_back(20 * std::log10(std::abs(x)));
        b.db.push_back(20 * std::log10(std::abs(y)));
        double ddb = std::abs(b.db.back() - a.db.back());
        if (std::isfinite(ddb) && ddb > c.max_db) {
            c.max_db = ddb;
            c.max_db_hz = f;
        }
        double ddeg = std::abs(std::arg(y / x)) * 180 / std::numbers::pi;
        if (std::isfinite(ddeg) && ddeg > c.max_deg) {
            c.max_deg = ddeg;
            c.max_deg_hz = f;
        }
    }
    for (int k = 0; k < 2; ++k) (k ? c.rounded_ac : c.ideal_ac) = *ac_plot(out[k]);
    c.ripple_ideal = passband_ripple(a);
    c.ripple_rounded = passband_ripple(b);
    Measurement ci = measure(Feature::corner, sweep, node_sweeps(ideal, ideal_path, probe));
    Measurement cr = measure(Feature::corner, sweep, node_sweeps(rounded, rounded_path, probe));
    if (ci.ok()) c.corner_ideal = ci.freq;
    if (cr.ok()) c.corner_rounded = cr.freq;
    return c;
}

}  // namespace deckscale
