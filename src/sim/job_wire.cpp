#include "sim/job_wire.hpp"

#include <algorithm>
#include <cstdint>
#include <cstring>

namespace deckscale::wire {
namespace {

void put_u32(std::string& out, std::size_t value) {
    auto v = static_cast<std::uint32_t>(value);
    char raw[sizeof v];
    std::memcpy(raw, &v, sizeof v);
    out.append(raw, sizeof v);
}

void put_string(std::string& out, std::string_view s) {
    put_u32(out, s.size());
    out.append(s);
}

bool get_u32(std::string_view& bytes, std::uint32_t& value) {
    if (bytes.size() < sizeof value) return false;
    std::memcpy(&value, bytes.data(), sizeof value);
    bytes.remove_prefix(sizeof value);
    return true;
}

bool get_string(std::string_view& bytes, std::string& s) {
    std::uint32_t n = 0;
    if (!get_u32(bytes, n) || bytes.size() < n) return false;
    s.assign(bytes.substr(0, n));
    bytes.remove_prefix(n);
    return true;
}

}  // namespace

std::string job_message(const SimJob& job) {
    std::size_t size = 12 + job.work_dir.size();
    for (const std::string& card : job.cards) size += 4 + card.size();
    std::string out;
    out.reserve(size);
    put_string(out, job.work_dir);
    put_u32(out, static_cast<std::size_t>(std::min<std::uint64_t>(job.memory_limit_mb, UINT32_MAX)));
    put_u32(out, job.cards.size());
    for (const std::string& card : job.cards) put_string(out, card);
    return out;
}

std::optional<SimJob> read_job_message(std::string_view bytes) {
    SimJob job;
    std::uint32_t count = 0, memory = 0;
    if (!get_string(bytes, job.work_dir) || !get_u32(bytes, memory) || !get_u32(bytes, count))
        return std::nullopt;
    job.memory_limit_mb = memory;
    if (count > bytes.size() / 4) return std::nullopt;  // each card needs its length at least
    job.cards.resize(count);
    for (std::string& card : job.cards)
        if (!get_string(bytes, card)) return std::nullopt;
    if (!bytes.empty()) return std::nullopt;
    return job;
}

}  // namespace deckscale::wire
