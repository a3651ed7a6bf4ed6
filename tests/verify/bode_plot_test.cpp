// The Bode overlay: the files beside the SVG, an error trace of exact zeros drawn on a range
// of its own (gnuplot would otherwise autoscale an empty range), and phases unwrapped.
#include "verify/bode_plot.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <complex>
#include <filesystem>
#include <sstream>
#include <string>
#include <vector>

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

TEST(BodePlot, PhaseIsUnwrappedAlongTheSweep) {
    // Five coincident real poles at 1 rad/s: the phase is -5 atan(w), from near 0 down to
    // near -450 degrees (common practice: each real pole adds up to -90 degrees). Drawn
    // wrapped, it would jump by 360 degrees where it crosses -180 and again at -540.
    auto fifth = [](double scale) {
        SimPlot p;
        p.name = "ac1";
        SimVector f{"frequency", VectorKind::frequency, {}};
        SimVector out{"out", VectorKind::voltage, {}};
        for (int k = 0; k <= 60; ++k) {
            double w = std::pow(10.0, -2 + k / 15.0);
            f.values.emplace_back(w / (2 * M_PI), 0);
            out.values.push_back(scale / std::pow(std::complex<double>(1, w), 5));
        }
        p.vectors = {f, out};
        return p;
    };
    test::TempDir dir;
    BodePlotRequest r;
    r.svg_path = dir.file("bode.svg");
    r.vectors = {"out"};
    r.title = "test";
    ASSERT_EQ(write_bode_plot(fifth(1), fifth(1 + 1e-9), r), "");
    std::istringstream data(test::read_bytes(dir.file("bode.dat")));
    std::string line;
    std::vector<double> original, scaled;
    while (std::getline(data, line)) {
        if (line.empty() || line[0] == '#') continue;
        std::istringstream row(line);
        double hz, db_o, deg_o, db_s, deg_s;
        row >> hz >> db_o >> deg_o >> db_s >> deg_s;
        double w = 2 * M_PI * hz;
        EXPECT_NEAR(deg_o, -5 * std::atan(w) * 180 / M_PI, 1e-6) << "at " << w << " rad/s";
        original.push_back(deg_o);
        scaled.push_back(deg_s);
    }
    ASSERT_EQ(original.size(), 61u);
    EXPECT_LT(original.back(), -400);
    for (std::size_t k = 0; k < original.size(); ++k) EXPECT_NEAR(scaled[k], original[k], 1e-6);
}

}  // namespace
}  // namespace deckscale
