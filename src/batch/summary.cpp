#include "batch/summary.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <map>

namespace deckscale {
namespace {

std::string first_line(const std::vector<std::string>& lines) {
    if (lines.empty()) return "";
    std::string s = lines.front();
    if (auto nl = s.find('\n'); nl != std::string::npos) s.resize(nl);
    return s;
}

std::string counts(const BatchReport& r) {
    std::size_t n[4] = {};
    for (const auto& c : r.cases) ++n[static_cast<int>(c.outcome)];
    return fmt::format("{} equivalent, {} not equivalent, {} refused, {} error(s)", n[0], n[1],
                       n[2], n[3]);
}

std::string survey_text(const BatchReport& r) {
    std::string s;
    std::vector<const CaseResult*> by[4];
    for (const auto& c : r.cases) by[static_cast<int>(c.outcome)].push_back(&c);
    s += fmt::format("scaled and verified ({}):\n", by[0].size());
    for (auto* c : by[0]) s += fmt::format("  {}  worst {}\n", c->name, c->worst);
    s += fmt::format("scaled, but the verification found differences ({}):\n", by[1].size());
    for (auto* c : by[1]) s += fmt::format("  {}  worst {}\n", c->name, c->worst);
    // Reasons, each with the decks that gave it; most common first.
    std::map<std::string, std::vector<std::string>> reasons;
    for (auto* c : by[2])
        for (const auto& why : c->refusals) {
            auto& decks = reasons[why];
            if (decks.empty() || decks.back() != c->name) decks.push_back(c->name);
        }
    std::vector<std::pair<std::string, std::vector<std::string>>> sorted(reasons.begin(),
                                                                         reasons.end());
    std::stable_sort(sorted.begin(), sorted.end(), [](const auto& a, const auto& b) {
        return a.second.size() > b.second.size();
    });
    s += fmt::format("refused ({}), by reason:\n", by[2].size());
    for (const auto& [why, decks] : sorted) {
        s += fmt::format("  {} ({} deck(s)):\n", why, decks.size());
        for (const auto& d : decks) s += "    " + d + "\n";
    }
    s += fmt::format("not read or not simulated ({}):\n", by[3].size());
    for (auto* c : by[3]) s += fmt::format("  {}  {}\n", c->name, first_line(c->problems));
    return s;
}

}  // namespace

std::string summary_text(const BatchReport& r) {
    std::string s;
    if (r.survey) {
        s += survey_text(r);
    } else {
        for (const auto& c : r.cases) {
            if (c.met()) continue;
            std::string why = c.outcome == CaseOutcome::pass || c.outcome == CaseOutcome::fail
                                  ? "worst " + c.worst
                                  : first_line(c.problems);
            s += fmt::format("UNEXPECTED {}: expected {}, got {}: {}\n", c.name,
                             to_string(c.expect), to_string(c.outcome), why);
        }
    }
    std::string shard =
        r.shard.n > 1 ? fmt::format(" (shard {}/{} of {})", r.shard.k, r.shard.n, r.suite_cases)
                      : "";
    s += fmt::format("{} case(s){}: {}; {:.1f} s\n", r.cases.size(), shard, counts(r), r.seconds);
    if (!r.survey) {
        std::size_t unmet = r.unmet();
        s += unmet == 0 ? fmt::format("PASS: every case met its expectation\n")
                        : fmt::format("FAIL: {} case(s) did not meet their expectation\n", unmet);
    }
    return s;
}

}  // namespace deckscale
