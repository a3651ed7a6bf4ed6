#include "batch/shard.hpp"

#include <charconv>

namespace deckscale {

std::optional<Shard> parse_shard(std::string_view text) {
    auto slash = text.find('/');
    if (slash == std::string_view::npos) return std::nullopt;
    Shard s;
    auto read = [](std::string_view part, unsigned& out) {
        auto [end, ec] = std::from_chars(part.data(), part.data() + part.size(), out);
        return ec == std::errc() && end == part.data() + part.size() && !part.empty();
    };
    if (!read(text.substr(0, slash), s.k) || !read(text.substr(slash + 1), s.n))
        return std::nullopt;
    if (s.n == 0 || s.k == 0 || s.k > s.n) return std::nullopt;
    return s;
}

std::uint64_t case_hash(std::string_view name) {
    std::uint64_t h = 14695981039346656037ull;  // FNV-1a offset basis
    for (unsigned char c : name) {
        h ^= c;
        h *= 1099511628211ull;  // FNV prime
    }
    return h;
}

bool in_shard(const std::string& case_name, Shard shard) {
    return case_hash(case_name) % shard.n == shard.k - 1;
}

std::vector<SuiteCase> shard_cases(const std::vector<SuiteCase>& cases, Shard shard) {
    std::vector<SuiteCase> out;
    for (const auto& c : cases)
        if (in_shard(c.name, shard)) out.push_back(c);
    return out;
}

}  // namespace deckscale
