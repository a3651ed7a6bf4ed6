// Tests of the feature search on analytic responses (no simulator): the sweeps are computed
// from closed-form transfer functions at exactly the frequencies ngspice would step.
#include "retarget/measure.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <complex>
#include <functional>

namespace deckscale {
namespace {

using Transfer = std::function<std::complex<double>(double)>;

// The frequencies of a sweep, as ngspice 39 steps them (dec/oct: geometric, lin: N points
// from start to stop inclusive).
std::vector<double> sweep_points(const AcSweep& s) {
    std::vector<double> f;
    if (s.type == "lin") {
        for (long i = 0; i < s.points; ++i)
            f.push_back(s.fstart + (s.fstop - s.fstart) * i / (s.points - 1));
        return f;
    }
    double per = s.type == "dec" ? std::log(10.0) : std::log(2.0);
    double ratio = std::exp(per / s.points);
    for (double x = s.fstart; x <= s.fstop * (1 + 1e-9); x *= ratio) f.push_back(x);
    return f;
}

SweepRunner analytic(Transfer h) {
    return [h](const AcSweep& s) {
        SweepResult r;
        for (double f : sweep_points(s)) {
            r.response.freq.push_back(f);
            r.response.db.push_back(20 * std::log10(std::abs(h(f))));
        }
        return r;
    };
}

AcSweep dec(long n, double f1, double f2) {
    AcSweep s;
    s.type = "dec";
    s.points = n;
    s.fstart = f1;
    s.fstop = f2;
    return s;
}

// Butterworth responses (common practice: |H|^2 = 1/(1+(f/fc)^2n), half power at fc).
Transfer butterworth3_low(double fc, double gain) {
    return [=](double f) {
        std::complex<double> s(0, f / fc);
        return gain / ((s + 1.0) * (s * s + s + 1.0));
    };
}
Transfer butterworth2_high(double fc) {
    return [=](double f) {
        std::complex<double> s(0, f / fc);
        return s * s / (s * s + std::sqrt(2.0) * s + 1.0);
    };
}
// Second-order band-pass and notch (common practice: peak and zero exactly at f0).
Transfer bandpass(double f0, double q) {
    return [=](double f) {
        std::complex<double> s(0, f / f0);
        return (s / q) / (s * s + s / q + 1.0);
    };
}
Transfer notch(double f0, double q) {
    return [=](double f) {
        std::complex<double> s(0, f / f0);
        return (s * s + 1.0) / (s * s + s / q + 1.0);
    };
}

TEST(Measure, FindsEachFeatureOfAnalyticResponses) {
    struct {
        int line;
        Feature feature;
        Transfer h;
        AcSweep sweep;
        double expected_hz;
        double level_db;
    } rows[] = {
        // A doubly terminated ladder's passband sits at -6.02 dB: the corner is measured from it.
        {__LINE__, Feature::corner, butterworth3_low(1234, 0.5), dec(20, 10, 100e3), 1234,
         20 * std::log10(0.5)},
        {__LINE__, Feature::corner, butterworth3_low(0.159155, 1), dec(10, 1e-3, 10), 0.159155, 0},
        {__LINE__, Feature::corner, butterworth2_high(3.4e3), dec(7, 10, 1e6), 3.4e3, 0},
        {__LINE__, Feature::center, bandpass(10.7e6, 20), dec(30, 1e6, 100e6), 10.7e6, 0},
        {__LINE__, Feature::notch, notch(50, 5), dec(10, 1, 1e3), 50, -1},
    };
    for (const auto& r : rows) {
        Measurement m = measure(r.feature, r.sweep, analytic(r.h));
        ASSERT_TRUE(m.ok()) << "line " << r.line << ": " << m.problem;
        EXPECT_NEAR(m.freq / r.expected_hz, 1, 2e-6) << "line " << r.line;
        if (r.feature != Feature::notch) {
            EXPECT_NEAR(m.level_db, r.level_db, 1e-4) << "line " << r.line;
        }
        EXPECT_LE(m.sweeps, 5) << "line " << r.line;
    }
}

TEST(Measure, SaysWhatWasSearchedWhenTheFeatureIsMissing) {
    struct {
        int line;
        Feature feature;
        Transfer h;
        const char* problem;
    } rows[] = {
        {__LINE__, Feature::corner, butterworth3_low(1e6, 0.5),
         "the response never falls 3.01 dB below its passband level (-6.021 dB) in the sweep "
         "searched (10 Hz to 100 kHz); widen it with --sweep dec 50 F1 F2"},
        {__LINE__, Feature::center, butterworth2_high(1e6),
         "the response's highest point lies at the upper end of the sweep (100 kHz, searched 10 Hz "
         "to 100 kHz), so there is no centre inside it; widen it with --sweep dec 50 F1 F2"},
        {__LINE__, Feature::notch, butterworth3_low(1e3, 1),
         "the response's lowest point lies at the upper end of the sweep (100 kHz, searched 10 Hz "
         "to 100 kHz), so there is no notch inside it; widen it with --sweep dec 50 F1 F2"},
        {__LINE__, Feature::corner, [](double) { return std::complex<double>(0, 0); },
         "the node has no response from 10 Hz to 100 kHz (its magnitude is 0 throughout): is it "
         "connected to the driven part of the circuit?"},
    };
    for (const auto& r : rows) {
        Measurement m = measure(r.feature, dec(10, 10, 100e3), analytic(r.h));
        EXPECT_EQ(m.problem, r.problem) << "line " << r.line;
    }
}

TEST(Measure, AFailedSweepIsPassedOn) {
    SweepRunner failing = [](const AcSweep&) { return SweepResult{{}, "simulating d.cir failed"}; };
    EXPECT_EQ(measure(Feature::corner, dec(10, 10, 100e3), failing).problem,
              "simulating d.cir failed");
}

}  // namespace
}  // namespace deckscale
