// Tests of the byte stream between a simulator child and its parent (sim_wire.hpp).
#include "sim_wire.hpp"

#include <gtest/gtest.h>

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

}  // namespace
}  // namespace deckscale
