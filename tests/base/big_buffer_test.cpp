// Large buffers: huge-page blocks where available, ordinary memory otherwise; either way a
// container using BigAllocator and a large deck read from disk behave as usual.
#include "base/big_buffer.hpp"

#include <gtest/gtest.h>

#include <cstdint>
#include <string>
#include <vector>

#include "base/file_system.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

TEST(BigBuffer, BlocksAreAlignedAndUsable) {
    void* p = allocate_big(kBigBufferBytes + 123);
    if (!huge_pages_available()) {
        EXPECT_EQ(p, nullptr);
        return;
    }
    ASSERT_NE(p, nullptr);
    EXPECT_EQ(reinterpret_cast<std::uintptr_t>(p) % (std::uintptr_t{2} << 20), 0u);
    auto* bytes = static_cast<unsigned char*>(p);
    for (std::size_t i = 0; i < kBigBufferBytes + 123; i += 4096)
        bytes[i] = static_cast<unsigned char>(i);
    EXPECT_EQ(bytes[4096 * 3], static_cast<unsigned char>(4096 * 3));
    release_big(p, kBigBufferBytes + 123);
}

TEST(BigBuffer, ContainersGrowThroughTheThreshold) {
    std::vector<std::uint64_t, BigAllocator<std::uint64_t>> v;
    std::basic_string<char, std::char_traits<char>, BigAllocator<char>> s;
    for (std::uint64_t i = 0; i < 3 * kBigBufferBytes / 8; ++i) v.push_back(i * 7);
    for (std::size_t i = 0; i < kBigBufferBytes + 10; ++i) s += static_cast<char>('a' + i % 26);
    for (std::uint64_t i = 0; i < v.size(); i += 9973) ASSERT_EQ(v[i], i * 7);
    EXPECT_EQ(s[kBigBufferBytes + 3], static_cast<char>('a' + (kBigBufferBytes + 3) % 26));
}

TEST(BigBuffer, LargeDeckReadsBackByteForByte) {
    test::TempDir dir;
    std::string text;
    for (int i = 0; text.size() < kBigBufferBytes + 4097; ++i)
        text += "R" + std::to_string(i) + " a b 1k\n";
    test::write_bytes(dir.path() / "big.cir", text);
    DiskFileSystem disk;
    auto got = disk.read(dir.file("big.cir"));
    ASSERT_TRUE(got);
    EXPECT_EQ(got->bytes.size(), text.size());
    EXPECT_TRUE(got->bytes == text);
}

}  // namespace
}  // namespace deckscale
