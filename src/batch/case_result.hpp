// The result of one case, as data: what happened, whether that met the case's expectation,
// the worst vector, and every figure of the verification (the verify report's JSON). The same
// record travels from a worker process to the parent and into the JSON report, so shard
// reports can be merged without losing anything.
#pragma once

#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "batch/suite.hpp"

namespace deckscale {

enum class CaseOutcome {
    pass,     // compared and equivalent within the tolerances
    fail,     // compared and not equivalent
    refused,  // the deck holds items that cannot be scaled exactly (nothing simulated)
    error,    // a deck could not be read, a simulation failed, crashed or hung
};
const char* to_string(CaseOutcome o);

struct CaseResult {
    std::size_t index = 0;  // in the suite
    std::string name;
    std::string deck, scaled;  // scaled: the rescaled deck's path, or "" when made for the run
    double km = 1, kf = 1;
    Expect expect = Expect::pass;
    CaseOutcome outcome = CaseOutcome::error;
    double seconds = 0;
    // The worst compared vector: "ac v(n2): relative error 3.1e-3 at 1.6e7 (tolerance 1e-6)".
    std::string worst;
    std::vector<std::string> problems;  // why the case failed or erred, one sentence each
    std::vector<std::string> refusals;  // messages of the items that cannot be scaled
    nlohmann::json report;              // the verify report (null when nothing was compared)

    bool met() const;  // the outcome is what the case expected (always true in a survey)
};

nlohmann::json to_json(const CaseResult& r);
// Throws std::runtime_error for a record that is not one.
CaseResult case_result_from_json(const nlohmann::json& j);

}  // namespace deckscale
