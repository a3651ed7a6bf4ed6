// Tests of the byte stream between a simulator child and its parent (sim/wire.hpp).
#include "sim/wire.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cstring>
#include <span>
#include <string>
#include <string_view>

namespace deckscale {
namespace {

SimOutcome sample_outcome() {
    SimOutcome o;
    o.status = SimStatus::run_failed;
    o.message = "Error: something\nsecond line";
    o.log = {"first", "", "third \xff"};
    o.plots.push_back({"ac1",
                       "AC Analysis",
                       {{"frequency", VectorKind::frequency, {{1, 0}, {10, 0}}},
                        {"out", VectorKind::voltage, {{0.5, -0.5}, {1e-300, 1e300}}},
                        {"v1#branch", VectorKind::current, {}}}});
    o.plots.push_back({"op1", "", {{"@r1[i]", VectorKind::other, {{-1, 0}}}}});
    return o;
}

std::string encode(const SimOutcome& o) {
    std::string bytes;
    for (const std::string& l : o.log) bytes += wire::log_frame(l);
    for (const SimPlot& p : o.plots) bytes += wire::plot_frame(p);
    return bytes + wire::result_frame(o.status, o.message);
}

TEST(SimWire, RoundTripKeepsEveryField) {
    SimOutcome in = sample_outcome();
    SimOutcome out;
    ASSERT_EQ(wire::decode(encode(in), out), wire::StreamState::complete);
    EXPECT_EQ(out.status, in.status);
    EXPECT_EQ(out.message, in.message);
    EXPECT_EQ(out.log, in.log);
    ASSERT_EQ(out.plots.size(), in.plots.size());
    for (std::size_t p = 0; p < in.plots.size(); ++p) {
        EXPECT_EQ(out.plots[p].name, in.plots[p].name);
        EXPECT_EQ(out.plots[p].analysis, in.plots[p].analysis);
        ASSERT_EQ(out.plots[p].vectors.size(), in.plots[p].vectors.size());
        for (std::size_t v = 0; v < in.plots[p].vectors.size(); ++v) {
            EXPECT_EQ(out.plots[p].vectors[v].name, in.plots[p].vectors[v].name);
            EXPECT_EQ(out.plots[p].vectors[v].kind, in.plots[p].vectors[v].kind);
            EXPECT_EQ(out.plots[p].vectors[v].values, in.plots[p].vectors[v].values);
        }
    }
}

TEST(SimWire, EveryTruncationIsDetected) {
    std::string bytes = encode(sample_outcome());
    for (std::size_t n = 0; n < bytes.size(); ++n) {
        SimOutcome out;
        ASSERT_EQ(wire::decode(std::string_view(bytes).substr(0, n), out),
                  wire::StreamState::truncated)
            << "prefix of " << n << " bytes";
    }
}

TEST(SimWire, GarbledStreamsAreDetected) {
    std::string good = encode(sample_outcome());
    SimOutcome out;
    EXPECT_EQ(wire::decode(good + "x", out), wire::StreamState::garbled);  // bytes after the result
    EXPECT_EQ(wire::decode("Z" + good, out), wire::StreamState::garbled);  // unknown tag
    std::string bad_status = wire::result_frame(SimStatus::ok, "");
    bad_status[5] = 99;
    EXPECT_EQ(wire::decode(bad_status, out), wire::StreamState::garbled);
    std::string plot = wire::plot_frame(sample_outcome().plots[0]);
    plot[plot.size() - 1] ^= 0x7f;  // corrupts the last vector's count
    EXPECT_EQ(wire::decode(plot, out), wire::StreamState::garbled);
}

TEST(SimWire, PiecesOfAnySizeDecodeLikeTheWhole) {
    std::string bytes = encode(sample_outcome());
    for (std::size_t piece : {1, 3, 7, 16, 17, 1000}) {
        wire::StreamDecoder decoder;
        for (std::size_t at = 0; at < bytes.size(); at += piece)
            decoder.feed(std::string_view(bytes).substr(at, piece));
        ASSERT_EQ(decoder.state(), wire::StreamState::complete) << "pieces of " << piece;
        SimOutcome whole;
        wire::decode(bytes, whole);
        const SimOutcome& got = decoder.outcome();
        EXPECT_EQ(got.log, whole.log) << "pieces of " << piece;
        ASSERT_EQ(got.plots.size(), whole.plots.size());
        for (std::size_t p = 0; p < got.plots.size(); ++p) {
            ASSERT_EQ(got.plots[p].vectors.size(), whole.plots[p].vectors.size());
            for (std::size_t v = 0; v < got.plots[p].vectors.size(); ++v)
                EXPECT_EQ(got.plots[p].vectors[v].values, whole.plots[p].vectors[v].values)
                    << "pieces of " << piece << ", plot " << p << ", vector " << v;
        }
    }
}

// What the parent does (sim/simulate.cpp, drain): values straight into the vectors whenever the
// decoder offers room, everything else fed through a buffer, in reads of at most `piece` bytes.
TEST(SimWire, ReadingIntoTheVectorsDecodesLikeFeeding) {
    SimOutcome sample = sample_outcome();
    sample.plots[0].vectors[1].values.assign(700, {0.25, -3e9});  // longer than one read
    std::string bytes = encode(sample);
    for (std::size_t piece : {1, 5, 16, 17, 100, 4096, 100000}) {
        wire::StreamDecoder decoder;
        std::size_t direct = 0;
        for (std::size_t at = 0; at < bytes.size();) {
            std::size_t n = std::min(piece, bytes.size() - at);
            std::span<char> room = decoder.value_room();
            if (room.empty()) {
                decoder.feed(std::string_view(bytes).substr(at, n));
            } else {
                n = std::min(n, room.size());
                std::memcpy(room.data(), bytes.data() + at, n);
                decoder.fill_room(n);
                direct += n;
            }
            at += n;
        }
        ASSERT_EQ(decoder.state(), wire::StreamState::complete) << "reads of " << piece;
        // Once a read ends inside the long vector, the rest of it is read in place.
        if (piece < 4096) EXPECT_GT(direct, 700u * 16 / 2) << "reads of " << piece;
        const SimOutcome& got = decoder.outcome();
        EXPECT_EQ(got.log, sample.log);
        ASSERT_EQ(got.plots.size(), sample.plots.size());
        for (std::size_t p = 0; p < got.plots.size(); ++p) {
            ASSERT_EQ(got.plots[p].vectors.size(), sample.plots[p].vectors.size());
            for (std::size_t v = 0; v < got.plots[p].vectors.size(); ++v)
                EXPECT_EQ(got.plots[p].vectors[v].values, sample.plots[p].vectors[v].values)
                    << "reads of " << piece << ", plot " << p << ", vector " << v;
        }
    }
}

TEST(SimWire, AnEmptyReadIntoTheRoomKeepsTheStream) {
    std::string bytes = wire::plot_header_frame("ac1", "AC Analysis", 1) +
                        wire::vector_frame_start("v(2)", VectorKind::voltage, 2);
    wire::StreamDecoder decoder;
    decoder.feed(bytes);
    std::span<char> room = decoder.value_room();
    ASSERT_EQ(room.size(), 32u);
    decoder.fill_room(0);  // end of stream or EAGAIN
    EXPECT_EQ(decoder.state(), wire::StreamState::truncated);
    EXPECT_TRUE(decoder.outcome().plots[0].vectors[0].values.empty());
    const double raw[] = {1.5, -2.0, 3e-12, 0.0};
    room = decoder.value_room();
    ASSERT_EQ(room.size(), 32u);
    std::memcpy(room.data(), raw, 20);  // a value and a part of the next
    decoder.fill_room(20);
    room = decoder.value_room();  // for the rest of the split value
    ASSERT_EQ(room.size(), 12u);
    std::memcpy(room.data(), reinterpret_cast<const char*>(raw) + 20, 5);
    decoder.fill_room(5);
    decoder.feed(std::string_view(reinterpret_cast<const char*>(raw) + 25, 7));
    decoder.feed(wire::result_frame(SimStatus::ok, ""));
    ASSERT_EQ(decoder.state(), wire::StreamState::complete);
    std::vector<std::complex<double>> want{{1.5, -2.0}, {3e-12, 0.0}};
    EXPECT_EQ(decoder.outcome().plots[0].vectors[0].values, want);
}

TEST(SimWire, VectorFramesMustMatchTheirPlot) {
    SimOutcome sample = sample_outcome();
    const SimPlot& plot = sample.plots[0];
    std::string result = wire::result_frame(SimStatus::ok, "");
    std::string vector = wire::vector_frame_start("out", VectorKind::voltage, 0);
    std::string header = wire::plot_header_frame("ac1", "AC Analysis", 2);
    std::string miscounted = wire::vector_frame_start("out", VectorKind::voltage, 1);
    miscounted[miscounted.size() - 4] = 2;  // the frame has room for one value, the count says 2
    std::string one_value(16, '\0');
    struct Case {
        int line;
        std::string bytes;
        wire::StreamState state;
    };
    const Case cases[] = {
        {__LINE__, wire::plot_frame(plot) + result, wire::StreamState::complete},
        {__LINE__, vector + result, wire::StreamState::garbled},           // no plot
        {__LINE__, header + vector + result, wire::StreamState::garbled},  // one missing
        {__LINE__, header + vector + vector + vector, wire::StreamState::garbled},  // one too many
        {__LINE__, header + vector + vector + result, wire::StreamState::complete},
        {__LINE__, header + vector, wire::StreamState::truncated},
        {__LINE__, header + miscounted + one_value + vector + result, wire::StreamState::garbled},
        {__LINE__, header + wire::vector_frame_start("out", VectorKind::voltage, 1) + one_value +
                       vector + result,
         wire::StreamState::complete},
    };
    for (const Case& c : cases) {
        SimOutcome out;
        EXPECT_EQ(wire::decode(c.bytes, out), c.state) << "line " << c.line;
    }
}

TEST(SimWire, ValuesAreSentAsRealAndImaginaryDoubles) {
    // What the child writes after vector_frame_start, straight from ngspice's memory.
    const double raw[] = {1.5, -2.0, 3e-12, 0.0};
    std::string bytes = wire::plot_header_frame("ac1", "AC Analysis", 1) +
                        wire::vector_frame_start("v(2)", VectorKind::voltage, 2) +
                        std::string(reinterpret_cast<const char*>(raw), sizeof raw) +
                        wire::result_frame(SimStatus::ok, "");
    SimOutcome out;
    ASSERT_EQ(wire::decode(bytes, out), wire::StreamState::complete);
    ASSERT_EQ(out.plots.size(), 1u);
    ASSERT_EQ(out.plots[0].vectors.size(), 1u);
    std::vector<std::complex<double>> want{{1.5, -2.0}, {3e-12, 0.0}};
    EXPECT_EQ(out.plots[0].vectors[0].values, want);
}

}  // namespace
}  // namespace deckscale
