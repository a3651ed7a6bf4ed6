#include "sim/wire.hpp"

#include <sys/mman.h>
#include <unistd.h>

#include <algorithm>
#include <cstdint>
#include <cstring>
#include <optional>

namespace deckscale::wire {
namespace {

template <typename T>
void put(std::string& out, T value) {
    char raw[sizeof(T)];
    std::memcpy(raw, &value, sizeof(T));
    out.append(raw, sizeof(T));
}

void put_string(std::string& out, std::string_view s) {
    put<std::uint32_t>(out, static_cast<std::uint32_t>(s.size()));
    out.append(s);
}

std::string frame(Tag tag, std::string_view payload) {
    std::string out;
    out.reserve(payload.size() + 5);
    put<std::uint8_t>(out, static_cast<std::uint8_t>(tag));
    put<std::uint32_t>(out, static_cast<std::uint32_t>(payload.size()));
    out.append(payload);
    return out;
}

// Bounds-checked reading of one payload; every getter fails (nullopt) past the end.
class Reader {
  public:
    explicit Reader(std::string_view bytes) : bytes_(bytes) {}

    template <typename T>
    std::optional<T> get() {
        if (bytes_.size() - pos_ < sizeof(T)) return std::nullopt;
        T value;
        std::memcpy(&value, bytes_.data() + pos_, sizeof(T));
        pos_ += sizeof(T);
        return value;
    }

    std::optional<std::string_view> get_bytes(std::size_t n) {
        if (bytes_.size() - pos_ < n) return std::nullopt;
        std::string_view s = bytes_.substr(pos_, n);
        pos_ += n;
        return s;
    }

    std::optional<std::string> get_string() {
        auto n = get<std::uint32_t>();
        if (!n) return std::nullopt;
        auto s = get_bytes(*n);
        if (!s) return std::nullopt;
        return std::string(*s);
    }

    bool at_end() const { return pos_ == bytes_.size(); }

  private:
    std::string_view bytes_;
    std::size_t pos_ = 0;
};

constexpr std::uint8_t last_kind = static_cast<std::uint8_t>(VectorKind::other);
constexpr std::uint8_t last_status = static_cast<std::uint8_t>(SimStatus::timed_out);
constexpr std::size_t header_size = 5;        // tag + payload length
constexpr std::size_t value_size = 2 * sizeof(double);
constexpr std::uint32_t reserve_limit = 1u << 20;  // values reserved ahead of their arrival

bool known_tag(std::uint8_t tag) {
    for (Tag t : {Tag::log, Tag::plot, Tag::vector, Tag::result})
        if (tag == static_cast<std::uint8_t>(t)) return true;
    return false;
}

std::string frame_header(Tag tag, std::size_t payload_size) {
    std::string out;
    put<std::uint8_t>(out, static_cast<std::uint8_t>(tag));
    put<std::uint32_t>(out, static_cast<std::uint32_t>(payload_size));
    return out;
}

// Maps the whole pages inside [p, p + size) in one call instead of one page fault each
// (MADV_POPULATE_WRITE, Linux 5.14; without it the pages fault in as they are written).
// The memory must be this process's own and writable; its contents do not change.
void populate(void* p, std::size_t size) {
#ifdef MADV_POPULATE_WRITE
    static const std::uintptr_t page = static_cast<std::uintptr_t>(::sysconf(_SC_PAGESIZE));
    auto first = (reinterpret_cast<std::uintptr_t>(p) + page - 1) & ~(page - 1);
    auto last = (reinterpret_cast<std::uintptr_t>(p) + size) & ~(page - 1);
    if (last > first) ::madvise(reinterpret_cast<void*>(first), last - first, MADV_POPULATE_WRITE);
#else
    (void)p;
    (void)size;
#endif
}

std::complex<double> value_at(const char* bytes) {
    double re, im;
    std::memcpy(&re, bytes, sizeof(double));
    std::memcpy(&im, bytes + sizeof(double), sizeof(double));
    return {re, im};
}

}  // namespace

std::string log_frame(std::string_view line) { return frame(Tag::log, line); }

std::string plot_header_frame(std::string_view name, std::string_view analysis,
                              std::uint32_t vectors) {
    std::string payload;
    put_string(payload, name);
    put_string(payload, analysis);
    put<std::uint32_t>(payload, vectors);
    return frame(Tag::plot, payload);
}

std::string vector_frame_start(std::string_view name, VectorKind kind, std::uint32_t count) {
    std::string head;
    put_string(head, name);
    put<std::uint8_t>(head, static_cast<std::uint8_t>(kind));
    put<std::uint32_t>(head, count);
    return frame_header(Tag::vector, head.size() + std::size_t{count} * value_size) + head;
}

std::string plot_frame(const SimPlot& plot) {
    std::string out =
        plot_header_frame(plot.name, plot.analysis, static_cast<std::uint32_t>(plot.vectors.size()));
    for (const SimVector& v : plot.vectors) {
        out += vector_frame_start(v.name, v.kind, static_cast<std::uint32_t>(v.values.size()));
        for (const std::complex<double>& x : v.values) {
            put<double>(out, x.real());
            put<double>(out, x.imag());
        }
    }
    return out;
}

std::string result_frame(SimStatus status, std::string_view message) {
    std::string payload;
    put<std::uint8_t>(payload, static_cast<std::uint8_t>(status));
    put_string(payload, message);
    return frame(Tag::result, payload);
}

void StreamDecoder::feed(std::string_view bytes) {
    while (state_ == StreamState::truncated && !bytes.empty()) {
        switch (phase_) {
            case Phase::header: {
                std::size_t n = std::min(header_size - pending_.size(), bytes.size());
                pending_.append(bytes.substr(0, n));
                bytes.remove_prefix(n);
                if (pending_.size() == header_size) start_frame();
                break;
            }
            case Phase::payload: {
                std::size_t n = std::min(left_, bytes.size());
                pending_.append(bytes.substr(0, n));
                bytes.remove_prefix(n);
                left_ -= n;
                if (left_ == 0) finish_frame();
                break;
            }
            case Phase::vector_head: {
                // Name length first, then name, kind and count.
                std::size_t need = 4;
                if (pending_.size() >= 4) {
                    std::uint32_t name_size;
                    std::memcpy(&name_size, pending_.data(), 4);
                    need = 4 + std::size_t{name_size} + 1 + 4;
                }
                if (need - pending_.size() > left_) {
                    state_ = StreamState::garbled;
                    break;
                }
                std::size_t n = std::min(need - pending_.size(), bytes.size());
                pending_.append(bytes.substr(0, n));
                bytes.remove_prefix(n);
                left_ -= n;
                if (pending_.size() == need && need > 4 && !start_vector())
                    state_ = StreamState::garbled;
                break;
            }
            case Phase::vector_values:
                take_values(bytes);
                break;
        }
    }
    if (state_ == StreamState::complete && !bytes.empty()) state_ = StreamState::garbled;
}

void StreamDecoder::start_frame() {
    auto tag = static_cast<std::uint8_t>(pending_[0]);
    std::uint32_t length;
    std::memcpy(&length, pending_.data() + 1, sizeof length);
    pending_.clear();
    bool vector = tag == static_cast<std::uint8_t>(Tag::vector);
    // Unknown tags, and vectors where no plot expects one (or the other way round).
    if (!known_tag(tag) || vector != plot_is_open()) {
        state_ = StreamState::garbled;
        return;
    }
    tag_ = static_cast<Tag>(tag);
    left_ = length;
    phase_ = vector ? Phase::vector_head : Phase::payload;
    if (!vector && left_ == 0) finish_frame();
}

void StreamDecoder::finish_frame() {
    Reader r(pending_);
    switch (tag_) {
        case Tag::log:
            out_.log.push_back(pending_);
            break;
        case Tag::plot: {
            SimPlot plot;
            auto name = r.get_string();
            auto analysis = r.get_string();
            auto count = r.get<std::uint32_t>();
            if (!name || !analysis || !count || !r.at_end()) {
                state_ = StreamState::garbled;
                return;
            }
            plot.name = std::move(*name);
            plot.analysis = std::move(*analysis);
            out_.plots.push_back(std::move(plot));
            vectors_left_ = *count;
            break;
        }
        case Tag::result: {
            auto status = r.get<std::uint8_t>();
            auto message = r.get_string();
            if (!status || *status > last_status || !message || !r.at_end()) {
                state_ = StreamState::garbled;
                return;
            }
            out_.status = static_cast<SimStatus>(*status);
            out_.message = std::move(*message);
            state_ = StreamState::complete;
            break;
        }
        case Tag::vector:  // read by take_values
            break;
    }
    pending_.clear();
    phase_ = Phase::header;
}

bool StreamDecoder::start_vector() {
    Reader r(pending_);
    auto name = r.get_string();
    auto kind = r.get<std::uint8_t>();
    auto count = r.get<std::uint32_t>();
    if (!name || !kind || *kind > last_kind || !count || left_ != std::size_t{*count} * value_size)
        return false;
    SimVector v;
    v.name = std::move(*name);
    v.kind = static_cast<VectorKind>(*kind);
    v.values.reserve(std::min(*count, reserve_limit));
    populate(v.values.data(), v.values.capacity() * value_size);
    out_.plots.back().vectors.push_back(std::move(v));
    --vectors_left_;
    values_left_ = *count;
    pending_.clear();
    phase_ = Phase::vector_values;
    if (values_left_ == 0) phase_ = Phase::header;
    return true;
}

void StreamDecoder::take_values(std::string_view& bytes) {
    std::vector<std::complex<double>>& values = out_.plots.back().vectors.back().values;
    if (!pending_.empty() || bytes.size() < value_size) {  // a value split between reads
        std::size_t n = std::min(value_size - pending_.size(), bytes.size());
        pending_.append(bytes.substr(0, n));
        bytes.remove_prefix(n);
        if (pending_.size() < value_size) return;
        values.push_back(value_at(pending_.data()));
        pending_.clear();
        --values_left_;
    } else {
        std::size_t n = std::min<std::size_t>(values_left_, bytes.size() / value_size);
        std::size_t old = values.size();
        values.resize(old + n);
        std::memcpy(static_cast<void*>(values.data() + old), bytes.data(), n * value_size);
        bytes.remove_prefix(n * value_size);
        values_left_ -= static_cast<std::uint32_t>(n);
    }
    left_ = std::size_t{values_left_} * value_size;
    if (values_left_ == 0) phase_ = Phase::header;
}

std::span<char> StreamDecoder::value_room() {
    if (state_ != StreamState::truncated || phase_ != Phase::vector_values) return {};
    std::vector<std::complex<double>>& values = out_.plots.back().vectors.back().values;
    std::size_t n = std::min<std::size_t>(values_left_, values.capacity() - values.size());
    if (n == 0) return {};
    room_from_ = values.size();
    values.resize(room_from_ + n);
    char* room = reinterpret_cast<char*>(values.data() + room_from_);
    // The first bytes of a value split between reads go where that value belongs.
    room_skip_ = pending_.size();
    std::memcpy(room, pending_.data(), room_skip_);
    pending_.clear();
    return {room + room_skip_, n * value_size - room_skip_};
}

void StreamDecoder::fill_room(std::size_t filled) {
    std::vector<std::complex<double>>& values = out_.plots.back().vectors.back().values;
    std::size_t bytes = room_skip_ + filled;
    std::size_t whole = bytes / value_size;
    const char* tail = reinterpret_cast<const char*>(values.data() + room_from_ + whole);
    pending_.assign(tail, bytes % value_size);  // a value split between reads
    values.resize(room_from_ + whole);
    values_left_ -= static_cast<std::uint32_t>(whole);
    left_ = std::size_t{values_left_} * value_size;
    if (values_left_ == 0) phase_ = Phase::header;
}

StreamState decode(std::string_view bytes, SimOutcome& out) {
    StreamDecoder decoder;
    decoder.feed(bytes);
    SimOutcome& got = decoder.outcome();
    for (std::string& line : got.log) out.log.push_back(std::move(line));
    for (SimPlot& plot : got.plots) out.plots.push_back(std::move(plot));
    if (decoder.state() == StreamState::complete) {
        out.status = got.status;
        out.message = std::move(got.message);
    }
    return decoder.state();
}

}  // namespace deckscale::wire
