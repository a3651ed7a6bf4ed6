// Large buffers in transparent huge pages where the system offers them. On virtual machines
// the first touch of each 4 KiB page is expensive: in scripts/bench's setting, writing 16 MB
// of fresh memory took 48 ms in 4 KiB pages and 1.3 ms in 2 MiB pages, and reading a 24 MB
// deck into fresh memory 78 ms against 5.5 ms.
#pragma once

#include <cstddef>
#include <memory>
#include <new>

namespace deckscale {

// Buffers at least this big (one huge page) are worth huge pages.
inline constexpr std::size_t kBigBufferBytes = std::size_t{2} << 20;

// True when the kernel gives huge pages to memory that asks for them (THP "always" or
// "madvise"); read once.
bool huge_pages_available();

// A 2 MiB-aligned anonymous mapping of at least `bytes` that asks for huge pages; nullptr if
// huge pages are not available or the mapping fails. Free with release_big(p, bytes).
void* allocate_big(std::size_t bytes);
void release_big(void* p, std::size_t bytes);

// A standard allocator that takes large blocks from allocate_big (others, and every block
// when huge pages are not available, from operator new).
template <typename T>
struct BigAllocator {
    using value_type = T;
    BigAllocator() = default;
    template <typename U>
    BigAllocator(const BigAllocator<U>&) {}

    T* allocate(std::size_t n) {
        std::size_t bytes = n * sizeof(T);
        if (bytes >= kBigBufferBytes && huge_pages_available()) {
            if (void* p = allocate_big(bytes)) return static_cast<T*>(p);
            throw std::bad_alloc();  // deallocate() must know where a block came from
        }
        return std::allocator<T>{}.allocate(n);
    }
    void deallocate(T* p, std::size_t n) {
        std::size_t bytes = n * sizeof(T);
        if (bytes >= kBigBufferBytes && huge_pages_available())
            release_big(p, bytes);
        else
            std::allocator<T>{}.deallocate(p, n);
    }
    template <typename U>
    bool operator==(const BigAllocator<U>&) const { return true; }
};

}  // namespace deckscale
