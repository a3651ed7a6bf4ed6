// Tests of `deckscale retarget` through the real binary (options, report, errors, exit
// codes) and of turning its options into a request.
#include "cli/retarget_command.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <numbers>
#include <regex>

#include "cli/options.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

using test::run_binary;
using test::RunResult;
using test::TempDir;
using test::write_bytes;

// A first-order RC low-pass with its corner at 1 kHz (1 kOhm, 159.155 nF: common practice
// f = 1/(2 pi R C)).
const char* kRc =
    "rc\nV1 in 0 dc 0 ac 1\nR1 in out 1k\nC1 out 0 159.1549431n\n.ac dec 20 10 100k\n.end\n";

TEST(RetargetOptions, TextsBecomeTargets) {
    constexpr double pi = std::numbers::pi;
    struct {
        int line;
        std::vector<std::string> args;
        double km_to, km_from, f_from, f_to;
        const char* error;  // a usage error (from parsing or the request)
    } rows[] = {
        {__LINE__,
         {"retarget", "d.cir", "-o", "o.cir", "--impedance", "R1=600", "--corner", "out=3.4k"},
         600,
         1,
         0,
         3400,
         ""},
        {__LINE__,
         {"retarget", "d.cir", "-o", "o.cir", "--impedance-map", "1:600Ohm", "--frequency-map",
          "1rad/s:3.4kHz"},
         600,
         1,
         1 / (2 * pi),
         3400,
         ""},
        {__LINE__, {"retarget", "d.cir", "-o", "o.cir", "--notch", "v(out)=50"}, 1, 1, 0, 50, ""},
        {__LINE__,
         {"retarget", "d.cir", "-o", "o.cir"},
         1,
         1,
         0,
         0,
         "retarget needs a target: --impedance, --impedance-map or --impedance-range, and/or one "
         "of "
         "--corner, --center, --notch, --frequency-map"},
        {__LINE__,
         {"retarget", "d.cir", "-o", "o.cir", "--corner", "out"},
         1,
         1,
         0,
         0,
         "--corner out: write NODE=FREQ with a positive frequency (out=3.4k)"},
        {__LINE__,
         {"retarget", "d.cir", "-o", "o.cir", "--impedance", "R1=-5"},
         1,
         1,
         0,
         0,
         "--impedance R1=-5: write NAME=VALUE with a positive value (R1=600)"},
        {__LINE__,
         {"retarget", "d.cir", "-o", "o.cir", "--frequency-map", "1:x"},
         1,
         1,
         0,
         0,
         "--frequency-map 1:x: write OLD:NEW with positive frequencies in Hz or rad/s "
         "(1rad/s:3.4k)"},
        {__LINE__,
         {"retarget", "d.cir", "-o", "o.cir", "--corner", "a=1", "--notch", "a=2"},
         1,
         1,
         0,
         0,
         "--corner excludes --notch"},
    };
    for (const auto& r : rows) {
        Invocation inv = parse_command_line(r.args);
        std::string error;
        std::optional<RetargetRequest> q;
        if (inv.what == Invocation::What::retarget)
            q = retarget_request(inv.retarget, error);
        else
            error = inv.text;
        if (*r.error) {
            EXPECT_EQ(error, r.error) << "line " << r.line;
            continue;
        }
        ASSERT_TRUE(q) << "line " << r.line << ": " << error;
        if (q->impedance) {
            EXPECT_NEAR(q->impedance->to, r.km_to, 1e-12) << "line " << r.line;
            EXPECT_NEAR(q->impedance->from, r.km_from, 1e-12) << "line " << r.line;
        }
        ASSERT_TRUE(q->frequency) << "line " << r.line;
        EXPECT_NEAR(q->frequency->to, r.f_to, 1e-9) << "line " << r.line;
        EXPECT_NEAR(q->frequency->from, r.f_from, 1e-12) << "line " << r.line;
    }
}

TEST(RetargetCommand, ReportsFactorsAchievedCornerAndVerification) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kRc);
    RunResult r = run_binary({"retarget", "rc.cir", "--impedance", "R1=50", "--corner", "out=10meg",
                              "-o", "o.cir", "--plot", "o.svg"},
                             dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    // The passband level is the sweep's highest point, here at 10 Hz (-0.0004343 dB), so the
    // corner measured from it lies 0.01 % above the analytic 1 kHz.
    EXPECT_NE(
        r.out.find(
            "retarget rc.cir -> o.cir\n  impedance  R1 = 1000 Ohm becomes 50 Ohm  Km = 0.05\n"
            "  frequency  corner of out: measured 1.0001 kHz (level -0.0004343 dB, 3 sweeps), "
            "target 10 MHz  Kf = 9999.0001"),
        std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("  achieved   corner of out in o.cir: 10 MHz (error "), std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("\nPASS: "), std::string::npos) << r.out;
    EXPECT_NE(r.err.find("deckscale: caution: the values written are nominal."), std::string::npos)
        << r.err;
    // The overlay marks the target on the new band's axis.
    EXPECT_NE(r.out.find("plot written to o.svg"), std::string::npos) << r.out;
    EXPECT_NE(test::read_bytes(dir.file("o.svg")).find("target corner 10 MHz"), std::string::npos);
}

TEST(RetargetCommand, BestFitListsEachPartAtBothEndsAndAtTheChoice) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kRc);
    RunResult r = run_binary({"retarget", "rc.cir", "--impedance-range", "R1=500:2k", "--series",
                              "R=E24,C=E6", "--corner", "out=10meg", "-o", "o.cir"},
                             dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    std::smatch m;
    ASSERT_TRUE(std::regex_search(
        r.out, m,
        std::regex("best fit   R1 in 500 Ohm \\.\\.\\. 2000 Ohm: ([0-9.]+) Ohm "
                   "rounds best \\([0-9]+ levels tried; worst part error "
                   "([0-9.e-]+) %, at the ends ([0-9.e-]+) % and ([0-9.e-]+) %\\)")))
        << r.out;
    double chosen = std::stod(m[1]), worst = std::stod(m[2]);
    EXPECT_GE(chosen, 500);
    EXPECT_LE(chosen, 2000);
    EXPECT_LE(worst, std::stod(m[3]));
    EXPECT_LE(worst, std::stod(m[4]));
    EXPECT_NE(r.out.find("    r1   "), std::string::npos) << r.out;
    EXPECT_NE(r.out.find("    c1   "), std::string::npos) << r.out;
}

TEST(RetargetCommand, ErrorsExitWithTwoAndWriteNothing) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kRc);
    struct {
        int line;
        std::vector<std::string> args;
        const char* err;
    } rows[] = {
        {__LINE__,
         {"--impedance", "C1=50"},
         "deckscale: error: C1 is not a resistor, nor a line or port with a Z0, so it has no "
         "impedance level of its own; name one or state the mapping (--impedance-map OLD:NEW)\n"},
        {__LINE__,
         {"--center", "out=1k"},
         "deckscale: error: measuring the centre of out in rc.cir: the response's highest point "
         "lies "
         "at the lower end of the sweep (10 Hz, searched 10 Hz to 100 kHz), so there is no centre "
         "inside it; widen it with --sweep dec 50 F1 F2\n"},
        {__LINE__,
         {"--corner", "in=1k", "--drive", "V7"},
         "deckscale: error: --drive V7: no independent source of that name in rc.cir\n"},
    };
    for (const auto& row : rows) {
        std::vector<std::string> args{"retarget", "rc.cir", "-o", "o.cir"};
        args.insert(args.end(), row.args.begin(), row.args.end());
        RunResult r = run_binary(args, dir.path());
        EXPECT_EQ(r.exit_code, 2) << "line " << row.line;
        EXPECT_EQ(r.err, row.err) << "line " << row.line;
        EXPECT_FALSE(std::filesystem::exists(dir.file("o.cir"))) << "line " << row.line;
    }
}

}  // namespace
}  // namespace deckscale
