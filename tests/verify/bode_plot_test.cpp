// The Bode overlay: the files beside the SVG, and an error trace of exact zeros drawn on a
// range of its own (gnuplot would otherwise autoscale an empty range).
#include "verify/bode_plot.hpp"

#include <gtest/gtest.h>

#include <complex>
#include <filesystem>
#include <string>

#include "support/common.hpp"

namespace deckscale {
namespace {

SimPlot sweep(double gain) {
    SimPlot p;
    p.name = "ac1";
    SimVector f{"frequency", VectorKind::frequency, {}};
    SimVector out{"out", VectorKind::voltage, {}};
    for (double hz : {1.0, 10.0, 100.0}) {
        f.values.emplace_back(hz, 0);
        out.values.push_back(gain / std::complex<double>(1, hz / 10));
    }
    p.vectors = {f, out};
    return p;
}

std::string plot(const SimPlot& scaled, test::TempDir& dir) {
    BodePlotRequest r;
    r.svg_path = dir.file("bode.svg");
    r.vectors = {"out"};
    r.title = "test";
    testing::internal::CaptureStderr();
    std::string error = write_bode_plot(sweep(1), scaled, r);
    EXPECT_EQ(testing::internal::GetCapturedStderr(), "");
    EXPECT_EQ(error, "");
    EXPECT_TRUE(std::filesystem::exists(dir.file("bode.svg")));
    EXPECT_TRUE(std::filesystem::exists(dir.file("bode.dat")));
    return test::read_bytes(dir.file("bode.gp"));
}

TEST(BodePlot, AnErrorOfExactZerosGetsARangeAroundTheFloor) {
    test::TempDir dir;
    EXPECT_NE(plot(sweep(1), dir).find("set yrange [1e-19:1e-15]"), std::string::npos);
}

TEST(BodePlot, ANonzeroErrorIsAutoscaled) {
    test::TempDir dir;
    EXPECT_EQ(plot(sweep(1.001), dir).find("set yrange"), std::string::npos);
}

}  // namespace
}  // namespace deckscale
