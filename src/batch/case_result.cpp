#include "batch/case_result.hpp"

#include <stdexcept>

namespace deckscale {
namespace {

template <class E, std::size_t N>
E enum_from(const std::string& text, const E (&all)[N], const char* what) {
    for (E e : all)
        if (text == to_string(e)) return e;
    throw std::runtime_error(std::string("unknown ") + what + " '" + text + "'");
}

}  // namespace

const char* to_string(CaseOutcome o) {
    switch (o) {
        case CaseOutcome::pass:
            return "pass";
        case CaseOutcome::fail:
            return "fail";
        case CaseOutcome::refused:
            return "refused";
        case CaseOutcome::error:
            return "error";
    }
    return "error";
}

bool CaseResult::met() const {
    switch (expect) {
        case Expect::pass:
            return outcome == CaseOutcome::pass;
        case Expect::fail:
            return outcome == CaseOutcome::fail;
        case Expect::none:
            return true;
    }
    return false;
}

nlohmann::json to_json(const CaseResult& r) {
    return {{"index", r.index},
            {"name", r.name},
            {"deck", r.deck},
            {"scaled", r.scaled},
            {"km", r.km},
            {"kf", r.kf},
            {"expect", to_string(r.expect)},
            {"outcome", to_string(r.outcome)},
            {"met", r.met()},
            {"seconds", r.seconds},
            {"worst", r.worst},
            {"problems", r.problems},
            {"refusals", r.refusals},
            {"report", r.report}};
}

CaseResult case_result_from_json(const nlohmann::json& j) {
    try {
        CaseResult r;
        r.index = j.at("index").get<std::size_t>();
        r.name = j.at("name").get<std::string>();
        r.deck = j.at("deck").get<std::string>();
        r.scaled = j.at("scaled").get<std::string>();
        r.km = j.at("km").get<double>();
        r.kf = j.at("kf").get<double>();
        constexpr Expect kExpects[] = {Expect::pass, Expect::fail, Expect::none};
        r.expect = enum_from(j.at("expect").get<std::string>(), kExpects, "expectation");
        constexpr CaseOutcome kOutcomes[] = {CaseOutcome::pass, CaseOutcome::fail,
                                             CaseOutcome::refused, CaseOutcome::error};
        r.outcome = enum_from(j.at("outcome").get<std::string>(), kOutcomes, "outcome");
        r.seconds = j.at("seconds").get<double>();
        r.worst = j.at("worst").get<std::string>();
        r.problems = j.at("problems").get<std::vector<std::string>>();
        r.refusals = j.at("refusals").get<std::vector<std::string>>();
        r.report = j.at("report");
        return r;
    } catch (const nlohmann::json::exception& e) {
        throw std::runtime_error(std::string("not a case record: ") + e.what());
    }
}

}  // namespace deckscale
