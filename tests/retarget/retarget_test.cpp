// Tests of retarget() against the outside world: closed-form denormalized element values of
// a published prototype, and ngspice (run independently, `ngspice -b`) as the referee of the
// corners and centres the output decks reach.
#include "retarget/retarget.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <numbers>
#include <regex>

#include "support/common.hpp"
#include "verify/factor_inference.hpp"

namespace deckscale {
namespace {

constexpr double pi = std::numbers::pi;

// The 3rd-order Butterworth low-pass prototype, 1 Ohm terminations, corner 1 rad/s:
// g1 = 1 F, g2 = 2 H, g3 = 1 F (Matthaei, Young & Jones 1964, sec. 4.05, Table 4.05-1).
const char* kButterworth =
    "butterworth n=3 prototype, 1 ohm, 1 rad/s\n"
    "V1 in 0 dc 0 ac 1\n"
    "R1 in n1 1\n"
    "C1 n1 0 1\n"
    "L2 n1 out 2\n"
    "C3 out 0 1\n"
    "R2 out 0 1\n"
    ".ac dec 20 1m 10\n"
    ".end\n";

// An invented band-pass: two parallel resonators (1 uH, 25.33 nF: 1 MHz) coupled by 1 nF,
// 100 Ohm source and load (loaded Q about 16, below critical coupling: one peak).
const char* kCoupled =
    "two coupled resonators\n"
    "V1 in 0 dc 0 ac 1\n"
    "RS in a 100\n"
    "L1 a 0 1u\n"
    "C1 a 0 25.33n\n"
    "CC a out 1n\n"
    "L2 out 0 1u\n"
    "C2 out 0 25.33n\n"
    "RL out 0 100\n"
    ".ac dec 40 100k 10meg\n"
    ".end\n";

std::map<std::string, double> values_of(const std::string& path) {
    DiskFileSystem disk;
    std::map<std::string, double> m;
    for (const auto& v : element_values(load_deck(path, disk))) m[v.name] = v.value;
    return m;
}

// Runs ngspice on `deck` with `extra` cards before .end and returns the number that follows
// `label` in what it printed ("fc = 3.400000e+03"); NaN when it printed none.
double ngspice_measure(const test::TempDir& dir, const std::string& deck, const std::string& extra,
                       const std::string& label) {
    // The deck's own .ac sweep goes: ngspice would run it too, and .meas reads the first plot.
    std::string text = std::regex_replace(test::read_bytes(deck), std::regex("\n\\.ac [^\n]*"), "");
    text.insert(text.rfind(".end"), extra);
    test::write_bytes(dir.file("referee.cir"), text);
    std::string cmd = test::ngspice_batch() + test::shell_quote(dir.file("referee.cir")) + " 2>&1";
    std::string out;
    if (FILE* p = popen(cmd.c_str(), "r")) {
        char buf[4096];
        while (std::size_t n = fread(buf, 1, sizeof buf, p)) out.append(buf, n);
        pclose(p);
    }
    std::smatch m;
    if (std::regex_search(out, m, std::regex(label + "\\s*([-+0-9.eE]+)"))) return std::stod(m[1]);
    ADD_FAILURE() << out;
    return std::nan("");
}

TEST(Retarget, ButterworthPrototypeTo600OhmAnd3k4) {
    test::TempDir dir;
    test::write_bytes(dir.file("proto.cir"), kButterworth);
    RetargetRequest q;
    q.deck = dir.file("proto.cir");
    q.output = dir.file("out.cir");
    q.impedance = ImpedanceTarget{"R1", 1, 600};
    q.frequency = FrequencyTarget{Feature::corner, "out", 0, 3400};
    DiskFileSystem disk;
    RetargetResult r = retarget(q, disk);
    ASSERT_EQ(r.outcome, RetargetResult::Outcome::done)
        << (r.problems.empty() ? "" : r.problems[0]);
    ASSERT_TRUE(r.before && r.after);
    // The prototype's corner is 1 rad/s = 1/(2 pi) Hz.
    EXPECT_NEAR(r.before->freq * 2 * pi, 1, 1e-6);
    EXPECT_NEAR(r.km, 600, 1e-9);
    EXPECT_NEAR(r.kf / (2 * pi * 3400), 1, 1e-6);
    EXPECT_NEAR(r.target_error(), 0, 1e-6);
    ASSERT_TRUE(r.verification && r.verification->report.passed());

    // Denormalized values (common practice: R' = R0 g, L' = R0 g / wc, C' = g / (R0 wc)).
    double r0 = 600, wc = 2 * pi * 3400;
    auto v = values_of(q.output);
    struct {
        int line;
        const char* name;
        double expected;
    } rows[] = {
        {__LINE__, "r1", r0},
        {__LINE__, "r2", r0},
        {__LINE__, "c1", 1 / (r0 * wc)},
        {__LINE__, "l2", 2 * r0 / wc},
        {__LINE__, "c3", 1 / (r0 * wc)},
    };
    for (const auto& row : rows)
        EXPECT_NEAR(v[row.name] / row.expected, 1, 2e-6) << "line " << row.line;

    // ngspice's own measurement of the half-power point: the passband of a doubly terminated
    // ladder is -6.0206 dB, its corner 3.0103 dB lower (ngspice 39 manual, .meas "WHEN"; the
    // .save all makes ngspice keep the vectors the .meas lines read).
    double fc = ngspice_measure(
        dir, q.output,
        ".save all\n.ac dec 2000 100 100k\n.meas ac fc when vdb(out)=-9.0309 fall=1\n", "fc\\s*=");
    EXPECT_NEAR(fc / 3400, 1, 1e-3);
}

TEST(Retarget, CoupledResonatorsByTheirCentre) {
    test::TempDir dir;
    test::write_bytes(dir.file("bp.cir"), kCoupled);
    RetargetRequest q;
    q.deck = dir.file("bp.cir");
    q.output = dir.file("out.cir");
    q.impedance = ImpedanceTarget{"", 100, 50};
    q.frequency = FrequencyTarget{Feature::center, "out", 0, 10.7e6};
    DiskFileSystem disk;
    RetargetResult r = retarget(q, disk);
    ASSERT_EQ(r.outcome, RetargetResult::Outcome::done)
        << (r.problems.empty() ? "" : r.problems[0]);
    EXPECT_NEAR(r.km, 0.5, 1e-12);
    EXPECT_NEAR(r.target_error(), 0, 1e-3);
    EXPECT_TRUE(r.verification && r.verification->report.passed());
    // ngspice's own search for the peak: ".meas ac pk max vdb(out)" prints the maximum and
    // "at=" its frequency (ngspice 39 manual, .meas MAX), here on a 1 kHz grid.
    double center = ngspice_measure(
        dir, q.output, ".save all\n.ac lin 1401 10meg 11.4meg\n.meas ac pk max vdb(out)\n",
        "pk\\s*=\\s*[-+0-9.eE]+\\s*at\\s*=");
    EXPECT_NEAR(center / 10.7e6, 1, 1e-3);
}

TEST(Retarget, FrequencyMapNeedsNoMeasurement) {
    test::TempDir dir;
    test::write_bytes(dir.file("proto.cir"), kButterworth);
    RetargetRequest q;
    q.deck = dir.file("proto.cir");
    q.output = dir.file("out.cir");
    q.impedance = ImpedanceTarget{"", 1, 600};
    q.frequency = FrequencyTarget{std::nullopt, "", 1 / (2 * pi), 3400};
    DiskFileSystem disk;
    RetargetResult r = retarget(q, disk);
    ASSERT_EQ(r.outcome, RetargetResult::Outcome::done)
        << (r.problems.empty() ? "" : r.problems[0]);
    EXPECT_FALSE(r.before);
    EXPECT_NEAR(r.kf / (2 * pi * 3400), 1, 1e-12);
    EXPECT_NEAR(values_of(q.output)["l2"] / (2 * 600 / (2 * pi * 3400)), 1, 1e-8);
}

// An invented twin-T notch: R = 1 kOhm, C = 159.1549 nF, R/2 and 2C to ground, a light
// load; its null lies at f0 = 1/(2 pi R C) = 1 kHz (common practice). Moved to 60 Hz at 10 kOhm.
TEST(Retarget, TwinTNotchMovedToSixtyHertz) {
    test::TempDir dir;
    test::write_bytes(dir.file("twint.cir"),
                      "twin-T notch\nV1 in 0 dc 0 ac 1\nR1 in m 1k\nR2 m out 1k\nC3 m 0 318.3099n\n"
                      "C1 in n 159.1549n\nC2 n out 159.1549n\nR3 n 0 500\nRL out 0 1meg\n"
                      ".ac dec 50 10 100k\n.end\n");
    RetargetRequest q;
    q.deck = dir.file("twint.cir");
    q.output = dir.file("out.cir");
    q.impedance = ImpedanceTarget{"R1", 1, 10e3};
    q.frequency = FrequencyTarget{Feature::notch, "out", 0, 60};
    DiskFileSystem disk;
    RetargetResult r = retarget(q, disk);
    ASSERT_EQ(r.outcome, RetargetResult::Outcome::done)
        << (r.problems.empty() ? "" : r.problems[0]);
    ASSERT_TRUE(r.before);
    EXPECT_NEAR(r.before->freq / 1000, 1, 1e-3);
    EXPECT_NEAR(r.target_error(), 0, 1e-3);
    // ngspice's own search for the minimum on a 0.01 Hz grid (ngspice 39 manual, .meas MIN).
    double notch =
        ngspice_measure(dir, q.output, ".save all\n.ac lin 4001 40 80\n.meas ac low min vdb(out)\n",
                        "low\\s*=\\s*[-+0-9.eE]+\\s*at\\s*=");
    EXPECT_NEAR(notch / 60, 1, 1e-3);
}

// A matched lossless line (Z0 = 50, TD = 1 us) between 50 Ohm terminations (common
// practice: the input sees 50 Ohm at every frequency, the output is the input delayed).
TEST(Retarget, ALineZ0IsAnImpedanceTarget) {
    test::TempDir dir;
    test::write_bytes(dir.file("line.cir"),
                      "line\nV1 in 0 dc 0 ac 1\nRS in a 50\nT1 a 0 out 0 Z0=50 TD=1u\nRL out 0 50\n"
                      ".ac lin 11 1k 10k\n.end\n");
    RetargetRequest q;
    q.deck = dir.file("line.cir");
    q.output = dir.file("out.cir");
    q.impedance = ImpedanceTarget{"T1", 1, 75};
    DiskFileSystem disk;
    RetargetResult r = retarget(q, disk);
    ASSERT_EQ(r.outcome, RetargetResult::Outcome::done)
        << (r.problems.empty() ? "" : r.problems[0]);
    EXPECT_NEAR(r.km, 1.5, 1e-12);
    EXPECT_NE(test::read_bytes(q.output).find("T1 a 0 out 0 Z0=75 TD=1u"), std::string::npos)
        << test::read_bytes(q.output);
    EXPECT_TRUE(r.verification && r.verification->report.passed());
}

TEST(Retarget, RefusalsSayWhatIsWrong) {
    test::TempDir dir;
    test::write_bytes(dir.file("proto.cir"), kButterworth);
    struct {
        int line;
        std::optional<ImpedanceTarget> impedance;
        std::optional<FrequencyTarget> frequency;
        std::vector<std::string> sweep;
        const char* problem;
    } rows[] = {
        {__LINE__,
         ImpedanceTarget{"R9", 1, 600},
         std::nullopt,
         {},
         "the deck has no part named R9; name a resistor (--impedance R1=600) or state the mapping "
         "(--impedance-map 1:600)"},
        {__LINE__,
         ImpedanceTarget{"C1", 1, 600},
         std::nullopt,
         {},
         "C1 is not a resistor, nor a line or port with a Z0, so it has no impedance level of its "
         "own; name one or state the mapping (--impedance-map OLD:NEW)"},
        {__LINE__,
         std::nullopt,
         FrequencyTarget{Feature::corner, "nowhere", 0, 1e3},
         {},
         "measuring the corner of nowhere in PROTO: the deck has no node 'nowhere' (its nodes: "
         "out, "
         "n1, in)"},
        {__LINE__,
         std::nullopt,
         FrequencyTarget{Feature::corner, "out", 0, 1e3},
         {"dec", "10", "1m", "10m"},
         "measuring the corner of out in PROTO: the response never falls 3.01 dB below its "
         "passband level (-6.021 dB) in the sweep searched (1 mHz to 10 mHz); widen it with "
         "--sweep dec 50 F1 F2"},
    };
    DiskFileSystem disk;
    for (const auto& row : rows) {
        RetargetRequest q;
        q.deck = dir.file("proto.cir");
        q.output = dir.file("out.cir");
        q.impedance = row.impedance;
        q.frequency = row.frequency;
        q.sweep = row.sweep;
        RetargetResult r = retarget(q, disk);
        EXPECT_EQ(r.outcome, RetargetResult::Outcome::bad_input) << "line " << row.line;
        ASSERT_EQ(r.problems.size(), 1u) << "line " << row.line;
        std::string expected = std::regex_replace(row.problem, std::regex("PROTO"), q.deck);
        EXPECT_EQ(r.problems[0], expected) << "line " << row.line;
        EXPECT_FALSE(std::filesystem::exists(q.output)) << "line " << row.line;
    }
}

}  // namespace
}  // namespace deckscale
