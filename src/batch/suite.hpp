// A regression suite: the cases of a suite file (TOML, read by toml++), or of a survey over a
// folder of decks. Reading a suite never simulates anything; bad suites throw DeckError with
// the suite file's line and column.
#pragma once

#include <chrono>
#include <cstdint>
#include <optional>
#include <string>
#include <variant>
#include <vector>

#include "base/file_system.hpp"
#include "verify/compare.hpp"

namespace deckscale {

// What a case compares the deck with. One alternative per kind of target: a new kind (e.g.
// retarget targets) is one more struct here, one more branch in read_setting and read_case
// (batch/suite.cpp) and one in run_case (batch/case_run.cpp).
struct FactorTarget {
    double km = 1, kf = 1;
    std::string km_text = "1", kf_text = "1";  // as written in the suite
    std::vector<std::string> hold;  // parts kept as written (scale --hold items)
};
struct ScaledTarget {
    std::string path;  // an existing rescaled deck, verified against the case's deck
    std::optional<FactorTarget> factors;  // given in the suite; else inferred as verify does
};
using CaseTarget = std::variant<ScaledTarget, FactorTarget>;

enum class Expect {
    pass,  // the pair must verify as equivalent
    fail,  // the comparison must find a difference (a crash or a refusal does not count)
    none,  // survey: no expectation, every outcome is recorded
};
const char* to_string(Expect e);

struct SuiteCase {
    std::string name;       // unique in the suite; shards are chosen by it
    std::size_t index = 0;  // position in the suite (reports keep this order)
    std::string deck;       // path (relative to the suite file as written, resolved)
    CaseTarget target;
    Expect expect = Expect::pass;
    Tolerances tolerances;
    std::vector<std::string> sweep;  // "dec N F1 F2" split; empty: the deck's own .ac
    std::string drive;
    std::chrono::milliseconds timeout{60000};  // per simulation
    std::uint64_t memory_mb = 8192;            // per simulation; 0 = no limit
};

struct Suite {
    std::string path;  // the suite file, or the surveyed folder
    std::string name;  // the file's stem, or the folder's name
    bool survey = false;
    std::vector<SuiteCase> cases;
};

// Reads a suite file. Throws DeckError for bad TOML, unknown keys, wrong types, missing decks,
// globs that match nothing and duplicate case names, each at its place in the file.
Suite load_suite(const std::string& path, const FileSystem& fs);

// Every deck under `folder` (*.cir, *.sp, *.spi, *.spice, *.net, *.ckt, recursively, in name
// order) as a case without expectation, scaled by `factors`. Throws DeckError for a folder
// that does not exist or holds no deck.
Suite survey_suite(const std::string& folder, const FactorTarget& factors);

}  // namespace deckscale
