#include "base/big_buffer.hpp"

#include <cstdint>
#include <fstream>
#include <string>

#include <sys/mman.h>

namespace deckscale {
namespace {

constexpr std::size_t kHuge = std::size_t{2} << 20;

std::size_t round_up(std::size_t bytes) { return (bytes + kHuge - 1) & ~(kHuge - 1); }

}  // namespace

bool huge_pages_available() {
    static const bool available = [] {
        std::ifstream in("/sys/kernel/mm/transparent_hugepage/enabled");
        std::string s;
        std::getline(in, s);
        return s.find("[always]") != std::string::npos || s.find("[madvise]") != std::string::npos;
    }();
    return available;
}

void* allocate_big(std::size_t bytes) {
    if (!huge_pages_available()) return nullptr;
    std::size_t len = round_up(bytes);
    // Map one huge page more than needed, then cut the unaligned ends off.
    void* raw =
        ::mmap(nullptr, len + kHuge, PROT_READ | PROT_WRITE, MAP_PRIVATE | MAP_ANONYMOUS, -1, 0);
    if (raw == MAP_FAILED) return nullptr;
    auto start = reinterpret_cast<std::uintptr_t>(raw);
    std::uintptr_t aligned = (start + kHuge - 1) & ~(kHuge - 1);
    if (aligned > start) ::munmap(raw, aligned - start);
    std::uintptr_t end = start + len + kHuge;
    if (end > aligned + len)
        ::munmap(reinterpret_cast<void*>(aligned + len), end - (aligned + len));
    void* p = reinterpret_cast<void*>(aligned);
    ::madvise(p, len, MADV_HUGEPAGE);  // a request: 4 KiB pages still work if it is refused
    return p;
}

void release_big(void* p, std::size_t bytes) {
    if (p) ::munmap(p, round_up(bytes));
}

}  // namespace deckscale
