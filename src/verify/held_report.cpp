#include "verify/held_report.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "scale/expression.hpp"

namespace deckscale {
namespace {

const Comparison* ac_of(const VerifyReport& r) {
    for (const auto& c : r.comparisons)
        if (c.analysis == "ac") return &c;
    return nullptr;
}

// "1.23 dB (out at 1234.5 Hz)": the largest of one kind.
std::string largest(const Comparison& c, double kf, bool degrees) {
    const VectorResult* best = most_moved(c, degrees);
    if (!best) return "nothing";
    return fmt::format("{:.4g} {} ({} at {:.6g} Hz)", degrees ? best->max_deg : best->max_db,
                       degrees ? "deg" : "dB", best->name,
                       (degrees ? best->max_deg_at : best->max_db_at) * kf);
}

std::string tolerances_text(const Tolerances& t) {
    std::string s;
    if (t.db > 0) s += fmt::format("--tolerance-db {:.4g}", t.db);
    if (t.degrees > 0)
        s += fmt::format("{}--tolerance-deg {:.4g}", s.empty() ? "" : " and ", t.degrees);
    return s;
}

}  // namespace

const VectorResult* most_moved(const Comparison& c, bool degrees) {
    const VectorResult* best = nullptr;
    bool top_level = std::any_of(c.vectors.begin(), c.vectors.end(), [](const VectorResult& v) {
        return v.name.find('.') == std::string::npos;
    });
    for (const auto& v : c.vectors) {
        if (top_level && v.name.find('.') != std::string::npos) continue;
        if (!best || (degrees ? v.max_deg > best->max_deg : v.max_db > best->max_db)) best = &v;
    }
    return best;
}

bool held_judged(const VerifyReport& r) { return r.tolerances.db > 0 || r.tolerances.degrees > 0; }

std::string held_ac_table(const Comparison& c, const VerifyReport& r) {
    std::string s =
        "    how far the held parts moved the response (points more than 60 dB below a "
        "vector's peak left out):\n";
    std::vector<const VectorResult*> order;
    for (const auto& v : c.vectors) order.push_back(&v);
    std::stable_sort(order.begin(), order.end(), [](const VectorResult* a, const VectorResult* b) {
        return a->max_db > b->max_db;
    });
    std::size_t width = 22;
    for (const auto* v : order) width = std::max(width, v->name.size() + 8);
    s += fmt::format("    {:<{}} {:>10} {:>16} {:>10} {:>16}\n", "vector", width, "max |dB|",
                     "at Hz (scaled)", "max |deg|", "at Hz (scaled)");
    bool judged = held_judged(r);
    std::size_t shown = 0;
    for (const auto* v : order) {
        if (shown == 8 && v->passed) break;
        ++shown;
        std::string name = v->kind == VectorKind::current ? v->name + " (x Km)" : v->name;
        s += fmt::format("    {:<{}} {:>10.4g} {:>16.6g} {:>10.4g} {:>16.6g}  {}\n", name, width,
                         v->max_db, v->max_db_at * r.kf, v->max_deg, v->max_deg_at * r.kf,
                         !judged     ? "info"
                         : v->passed ? "ok"
                                     : "FAIL");
    }
    if (shown < order.size())
        s += fmt::format("    ... and {} more vectors{}\n", order.size() - shown,
                         judged ? " within tolerance" : "");
    return s;
}

std::string held_verdict(const VerifyReport& r) {
    std::string s;
    s += "caution: held parts were not rescaled; the circuit around them changed, so check "
         "their ratings and stability in it before building. For mains-connected or "
         "high-voltage circuits, local codes and licensed practice govern.\n";
    bool problems = std::any_of(r.comparisons.begin(), r.comparisons.end(),
                                [](const Comparison& c) { return !c.problems.empty(); });
    const Comparison* ac = ac_of(r);
    if (problems) return s + "FAIL: the decks could not be compared (see the problems above)\n";
    if (!ac) {
        std::string worst;
        for (const auto& c : r.comparisons)
            worst += fmt::format("{}{} {:.3g}", worst.empty() ? "" : ", ", c.label(),
                                 c.worst() ? c.worst()->worst : 0.0);
        return s + fmt::format(
                       "INFO: with held parts the scaled deck is not expected to equal "
                       "the original; no AC sweep compared, largest relative change: "
                       "{}. This is information, not a verdict (exit 0)\n",
                       worst.empty() ? "nothing compared" : worst);
    }
    std::string moved = fmt::format(
        "by up to {} and {}{}", largest(*ac, r.kf, false), largest(*ac, r.kf, true),
        std::any_of(ac->vectors.begin(), ac->vectors.end(),
                    [](const VectorResult& v) { return v.name.find('.') != std::string::npos; })
            ? " at the deck's own nodes (inside subcircuits: the "
              "table above)"
            : "");
    if (!held_judged(r))
        return s + fmt::format(
                       "INFO: with held parts the scaled deck is not expected to equal the "
                       "original; they moved the response {}. No --tolerance-db or "
                       "--tolerance-deg given: this is information, not a verdict (exit 0)\n",
                       moved);
    if (r.passed())
        return s + fmt::format("PASS: the held parts moved the response {}, within {}\n", moved,
                               tolerances_text(r.tolerances));
    return s + fmt::format("FAIL: the held parts moved the response {}, beyond {}\n", moved,
                           tolerances_text(r.tolerances));
}

}  // namespace deckscale
