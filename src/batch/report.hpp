// A batch run as data (the suite, the shard, every case's record) and its JSON form, which
// is also what shard reports are merged from.
#pragma once

#include <string>
#include <vector>

#include "batch/case_result.hpp"
#include "batch/shard.hpp"

namespace deckscale {

struct BatchReport {
    std::string suite;  // the suite file or surveyed folder, as given
    std::string name;   // the suite's name (the file's stem)
    bool survey = false;
    Shard shard;                    // the shard this report covers (1/1: all)
    std::size_t suite_cases = 0;    // cases in the whole suite, before sharding
    std::vector<CaseResult> cases;  // in suite order
    double seconds = 0;             // wall time of the run (merged: the longest shard)

    std::size_t unmet() const;  // cases whose outcome was not the expected one
};

std::string batch_json(const BatchReport& r);
// Throws std::runtime_error naming what is wrong with the text.
BatchReport batch_from_json(const std::string& text);

// One report from the reports of the shards of one suite: the cases of all, in suite order.
// Throws std::runtime_error when they are of different suites or shard counts, when a case
// appears twice, or when cases of the suite are missing (a shard's report not given).
BatchReport merge_reports(const std::vector<BatchReport>& shards);

}  // namespace deckscale
