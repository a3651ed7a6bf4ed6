#include "batch/report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <nlohmann/json.hpp>
#include <set>
#include <stdexcept>

namespace deckscale {

std::size_t BatchReport::unmet() const {
    return static_cast<std::size_t>(
        std::count_if(cases.begin(), cases.end(), [](const CaseResult& c) { return !c.met(); }));
}

std::string batch_json(const BatchReport& r) {
    nlohmann::json cases = nlohmann::json::array();
    std::size_t counts[4] = {};
    for (const auto& c : r.cases) {
        cases.push_back(to_json(c));
        ++counts[static_cast<int>(c.outcome)];
    }
    nlohmann::json j = {
        {"format", "deckscale-batch"},
        {"version", 1},
        {"suite", r.suite},
        {"name", r.name},
        {"survey", r.survey},
        {"shard", {{"k", r.shard.k}, {"n", r.shard.n}}},
        {"suite_cases", r.suite_cases},
        {"seconds", r.seconds},
        {"totals",
         {{"cases", r.cases.size()},
          {"unmet", r.unmet()},
          {"pass", counts[0]},
          {"fail", counts[1]},
          {"refused", counts[2]},
          {"error", counts[3]}}},
        {"cases", cases},
    };
    return j.dump(2) + "\n";
}

BatchReport batch_from_json(const std::string& text) {
    nlohmann::json j;
    try {
        j = nlohmann::json::parse(text);
    } catch (const nlohmann::json::exception& e) {
        throw std::runtime_error(std::string("not JSON: ") + e.what());
    }
    if (!j.is_object() || j.value("format", "") != "deckscale-batch")
        throw std::runtime_error("not a batch report (no \"format\": \"deckscale-batch\")");
    try {
        if (j.at("version").get<int>() != 1)
            throw std::runtime_error(
                fmt::format("report version {} is not known", j.at("version").dump()));
        BatchReport r;
        r.suite = j.at("suite").get<std::string>();
        r.name = j.at("name").get<std::string>();
        r.survey = j.at("survey").get<bool>();
        r.shard.k = j.at("shard").at("k").get<unsigned>();
        r.shard.n = j.at("shard").at("n").get<unsigned>();
        r.suite_cases = j.at("suite_cases").get<std::size_t>();
        r.seconds = j.at("seconds").get<double>();
        for (const auto& c : j.at("cases")) r.cases.push_back(case_result_from_json(c));
        return r;
    } catch (const nlohmann::json::exception& e) {
        throw std::runtime_error(std::string("not a batch report: ") + e.what());
    }
}

BatchReport merge_reports(const std::vector<BatchReport>& shards) {
    if (shards.empty()) throw std::runtime_error("no reports to merge");
    BatchReport m;
    const BatchReport& first = shards.front();
    m.suite = first.suite;
    m.name = first.name;
    m.survey = first.survey;
    m.suite_cases = first.suite_cases;
    std::set<unsigned> seen_shards;
    std::set<std::size_t> seen_cases;
    for (const auto& s : shards) {
        if (s.name != first.name || s.suite_cases != first.suite_cases ||
            s.shard.n != first.shard.n)
            throw std::runtime_error(fmt::format(
                "the reports are not shards of one run: suite '{}' ({} cases, {} shards) and suite "
                "'{}' "
                "({} cases, {} shards)",
                first.name, first.suite_cases, first.shard.n, s.name, s.suite_cases, s.shard.n));
        if (!seen_shards.insert(s.shard.k).second)
            throw std::runtime_error(
                fmt::format("shard {}/{} is given twice", s.shard.k, s.shard.n));
        for (const auto& c : s.cases) {
            if (!seen_cases.insert(c.index).second)
                throw std::runtime_error(fmt::format("case '{}' is in two reports", c.name));
            m.cases.push_back(c);
        }
        m.seconds = std::max(m.seconds, s.seconds);
    }
    if (m.cases.size() != m.suite_cases)
        throw std::runtime_error(
            fmt::format("the reports hold {} of the suite's {} cases: a shard's report "
                        "is missing",
                        m.cases.size(), m.suite_cases));
    std::sort(m.cases.begin(), m.cases.end(),
              [](const CaseResult& a, const CaseResult& b) { return a.index < b.index; });
    return m;
}

}  // namespace deckscale
