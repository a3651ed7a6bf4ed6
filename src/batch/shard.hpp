// Sharding a suite over machines with no coordinator: shard K of N takes the cases whose
// name hashes to K-1 modulo N. The hash (64-bit FNV-1a of the name's bytes) is the same on
// every machine and does not depend on the order in which cases were found.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "batch/suite.hpp"

namespace deckscale {

struct Shard {
    unsigned k = 1, n = 1;  // 1 <= k <= n
};

// "K/N" with 1 <= K <= N; nullopt for anything else.
std::optional<Shard> parse_shard(std::string_view text);

std::uint64_t case_hash(std::string_view name);

bool in_shard(const std::string& case_name, Shard shard);

// The suite's cases that belong to `shard`, in suite order.
std::vector<SuiteCase> shard_cases(const std::vector<SuiteCase>& cases, Shard shard);

}  // namespace deckscale
