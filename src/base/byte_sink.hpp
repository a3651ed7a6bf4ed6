// Where produced output goes: bytes gather in one block that is handed on when full, so a
// writer that emits millions of small pieces pays one virtual call per block, not per piece.
#pragma once

#include <cstdint>
#include <algorithm>
#include <cstring>
#include <memory>
#include <ostream>
#include <string>
#include <stdexcept>
#include <string_view>

#include "base/big_buffer.hpp"

namespace deckscale {

class ByteSink {
public:
    explicit ByteSink(std::size_t block_bytes = std::size_t{2} << 20)
        : block_(new_block(block_bytes)), pos_(block_.get()), end_(block_.get() + block_bytes) {}
    virtual ~ByteSink() = default;
    ByteSink(const ByteSink&) = delete;
    ByteSink& operator=(const ByteSink&) = delete;

    void write(std::string_view s) {
        if (s.size() <= static_cast<std::size_t>(end_ - pos_)) {
            copy(pos_, s.data(), s.size());
            pos_ += s.size();
        } else {
            spill(s);
        }
    }
    // Hands on what has gathered; call once at the end.
    void flush() {
        if (pos_ != block_.get())
            take(std::string_view(block_.get(), static_cast<std::size_t>(pos_ - block_.get())));
        pos_ = block_.get();
    }

protected:
    // Receives the bytes in order, a block at a time.
    virtual void take(std::string_view bytes) = 0;

private:
    // Most pieces are a few bytes (a rewritten value, the rest of a line): copy those with
    // two overlapping fixed-size moves instead of a call to memcpy.
    static void copy(char* to, const char* from, std::size_t n) {
        if (n >= 8 && n <= 16) {
            std::uint64_t a, b;
            std::memcpy(&a, from, 8);
            std::memcpy(&b, from + n - 8, 8);
            std::memcpy(to, &a, 8);
            std::memcpy(to + n - 8, &b, 8);
        } else if (n >= 4 && n < 8) {
            std::uint32_t a, b;
            std::memcpy(&a, from, 4);
            std::memcpy(&b, from + n - 4, 4);
            std::memcpy(to, &a, 4);
            std::memcpy(to + n - 4, &b, 4);
        } else if (n < 4) {
            for (std::size_t i = 0; i < n; ++i) to[i] = from[i];
        } else {
            std::memcpy(to, from, n);
        }
    }

    void spill(std::string_view s) {
        flush();
        if (s.size() >= static_cast<std::size_t>(end_ - pos_)) {
            take(s);  // larger than a block: straight through
        } else {
            std::memcpy(pos_, s.data(), s.size());
            pos_ += s.size();
        }
    }

    // The block comes from BigAllocator: huge pages when it is large (see base/big_buffer.hpp).
    struct Release {
        std::size_t bytes;
        void operator()(char* p) const { BigAllocator<char>{}.deallocate(p, bytes); }
    };
    static std::unique_ptr<char[], Release> new_block(std::size_t bytes) {
        char* p = BigAllocator<char>{}.allocate(bytes);
        return std::unique_ptr<char[], Release>(p, Release{bytes});
    }
    friend class MemorySink;

    std::unique_ptr<char[], Release> block_;
    char* pos_;
    char* end_;
};

// Writes into a buffer of exactly the size that will be written (huge pages where
// available): one copy, no blocks handed on until the end.
class MemorySink : public ByteSink {
public:
    explicit MemorySink(std::size_t bytes) : ByteSink(std::max<std::size_t>(bytes, 1)) {}
    // The bytes written (never flush() this sink: they stay in its block).
    std::string_view bytes() const {
        return {block_.get(), static_cast<std::size_t>(pos_ - block_.get())};
    }

protected:
    void take(std::string_view) override {
        throw std::logic_error("MemorySink: more bytes than planned");
    }
};

// Gathers everything in a string.
class StringSink : public ByteSink {
public:
    explicit StringSink(std::string& out) : ByteSink(1 << 16), out_(out) {}

protected:
    void take(std::string_view bytes) override { out_.append(bytes); }

private:
    std::string& out_;
};

// Writes to a stream.
class StreamSink : public ByteSink {
public:
    explicit StreamSink(std::ostream& out) : ByteSink(1 << 16), out_(out) {}

protected:
    void take(std::string_view bytes) override {
        out_.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
    }

private:
    std::ostream& out_;
};

}  // namespace deckscale
