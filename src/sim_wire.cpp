#include "sim_wire.hpp"

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

std::optional<SimVector> read_vector(Reader& r) {
    SimVector v;
    auto name = r.get_string();
    auto kind = r.get<std::uint8_t>();
    auto count = r.get<std::uint32_t>();
    if (!name || !kind || *kind > last_kind || !count) return std::nullopt;
    auto raw = r.get_bytes(std::size_t{*count} * 2 * sizeof(double));
    if (!raw) return std::nullopt;
    v.name = std::move(*name);
    v.kind = static_cast<VectorKind>(*kind);
    v.values.resize(*count);
    for (std::uint32_t i = 0; i < *count; ++i) {
        double re, im;
        std::memcpy(&re, raw->data() + (2 * i) * sizeof(double), sizeof(double));
        std::memcpy(&im, raw->data() + (2 * i + 1) * sizeof(double), sizeof(double));
        v.values[i] = {re, im};
    }
    return v;
}

std::optional<SimPlot> read_plot(std::string_view payload) {
    Reader r(payload);
    SimPlot plot;
    auto name = r.get_string();
    auto analysis = r.get_string();
    auto count = r.get<std::uint32_t>();
    if (!name || !analysis || !count) return std::nullopt;
    plot.name = std::move(*name);
    plot.analysis = std::move(*analysis);
    for (std::uint32_t i = 0; i < *count; ++i) {
        auto v = read_vector(r);
        if (!v) return std::nullopt;
        plot.vectors.push_back(std::move(*v));
    }
    if (!r.at_end()) return std::nullopt;
    return plot;
}

bool read_result(std::string_view payload, SimOutcome& out) {
    Reader r(payload);
    auto status = r.get<std::uint8_t>();
    auto message = r.get_string();
    if (!status || *status > last_status || !message || !r.at_end()) return false;
    out.status = static_cast<SimStatus>(*status);
    out.message = std::move(*message);
    return true;
}

}  // namespace

std::string log_frame(std::string_view line) { return frame(Tag::log, line); }

std::string plot_frame(const SimPlot& plot) {
    std::string payload;
    put_string(payload, plot.name);
    put_string(payload, plot.analysis);
    put<std::uint32_t>(payload, static_cast<std::uint32_t>(plot.vectors.size()));
    for (const SimVector& v : plot.vectors) {
        put_string(payload, v.name);
        put<std::uint8_t>(payload, static_cast<std::uint8_t>(v.kind));
        put<std::uint32_t>(payload, static_cast<std::uint32_t>(v.values.size()));
        for (const std::complex<double>& x : v.values) {
            put<double>(payload, x.real());
            put<double>(payload, x.imag());
        }
    }
    return frame(Tag::plot, payload);
}

std::string result_frame(SimStatus status, std::string_view message) {
    std::string payload;
    put<std::uint8_t>(payload, static_cast<std::uint8_t>(status));
    put_string(payload, message);
    return frame(Tag::result, payload);
}

StreamState decode(std::string_view bytes, SimOutcome& out) {
    Reader r(bytes);
    while (!r.at_end()) {
        auto tag = r.get<std::uint8_t>();
        if (!tag) return StreamState::truncated;
        if (*tag != static_cast<std::uint8_t>(Tag::log) &&
            *tag != static_cast<std::uint8_t>(Tag::plot) &&
            *tag != static_cast<std::uint8_t>(Tag::result))
            return StreamState::garbled;
        auto length = r.get<std::uint32_t>();
        if (!length) return StreamState::truncated;
        auto payload = r.get_bytes(*length);
        if (!payload) return StreamState::truncated;
        switch (static_cast<Tag>(*tag)) {
            case Tag::log:
                out.log.emplace_back(*payload);
                break;
            case Tag::plot: {
                auto plot = read_plot(*payload);
                if (!plot) return StreamState::garbled;
                out.plots.push_back(std::move(*plot));
                break;
            }
            case Tag::result:
                if (!read_result(*payload, out)) return StreamState::garbled;
                return r.at_end() ? StreamState::complete : StreamState::garbled;
        }
    }
    return StreamState::truncated;
}

}  // namespace deckscale::wire
