// Tests of verify_pair, the library call behind `verify` (and batch suites): its outcomes as
// data, never printed.
#include "verify/pair.hpp"

#include <algorithm>
#include <set>
#include <string>

#include <fmt/format.h>
#include <gtest/gtest.h>

#include "support/common.hpp"
#include "support/scale.hpp"
#include "support/verify.hpp"

namespace deckscale {
namespace {

// A first-order RC low-pass at 1 kOhm / 159.155 nF (corner 1 kHz) and the same at
// Km = 10, Kf = 100: R x10, C / 1000 (common practice: R' = Km R, C' = C / (Km Kf)).
const char* kOriginal = "rc\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 159.155n\n.ac dec 10 10 100k\n.end\n";
const char* kScaled = "rc\nV1 in 0 DC 0 AC 1\nR1 in out 10k\nC1 out 0 159.155p\n.ac dec 10 1k 10meg\n.end\n";

TEST(VerifyPair, AnEquivalentPairIsComparedAndPasses) {
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"), kOriginal);
    test::write_bytes(dir.file("s.cir"), kScaled);
    PairRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");  // factors inferred from the R and C pairs
    DiskFileSystem disk;
    PairVerification v = verify_pair(r, disk);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    EXPECT_TRUE(v.report.factors_inferred);
    EXPECT_NEAR(v.report.km, 10, 1e-9);
    EXPECT_NEAR(v.report.kf, 100, 1e-9);
    EXPECT_TRUE(v.report.passed());
    ASSERT_NE(v.ac_original(), nullptr);
    ASSERT_NE(v.ac_scaled(), nullptr);
    EXPECT_NE(v.ac_original()->find("out"), nullptr);
}

TEST(VerifyPair, ProblemsAndFailuresComeBackAsData) {
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"), kOriginal);
    test::write_bytes(dir.file("s.cir"), kScaled);
    PairRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");
    r.drive = "V9";
    DiskFileSystem disk;
    PairVerification v = verify_pair(r, disk);
    EXPECT_EQ(v.outcome, PairVerification::Outcome::bad_input);
    ASSERT_EQ(v.problems.size(), 1u);
    EXPECT_EQ(v.problems[0], "--drive V9: no independent source of that name in " + r.original);

    test::write_bytes(dir.file("bad.cir"), "bad\nV1 in 0 DC 0 AC 1\nD1 in 0 nosuch\n.ac dec 5 10 1k\n.end\n");
    r.drive.clear();
    r.original = r.scaled = dir.file("bad.cir");
    r.factors_given = true;
    v = verify_pair(r, disk);
    EXPECT_EQ(v.outcome, PairVerification::Outcome::sim_failed);
    ASSERT_EQ(v.failures.size(), 2u);
    EXPECT_EQ(v.failures[0].analysis, "ac");
    EXPECT_EQ(v.failures[0].status, SimStatus::load_failed);
    EXPECT_NE(v.failures[0].message.find("nosuch"), std::string::npos) << v.failures[0].message;
    EXPECT_EQ(v.problems, (std::vector<std::string>{
                              "the original deck fails in ngspice 39 too (ac run): the problem is "
                              "in the deck as written, not in the rewrite"}));
    // Only the scaled deck failing: no such sentence.
    r.original = dir.file("o.cir");
    v = verify_pair(r, disk);
    EXPECT_EQ(v.outcome, PairVerification::Outcome::sim_failed);
    EXPECT_EQ(v.failures.size(), 1u);
    EXPECT_TRUE(v.problems.empty());
}

// A CMOS inverter (BSIM3, ngspice's level 49 with its defaults but VTH0 and TOX; invented
// demo sizes) driven from an ideal 50 ps pulse, moved to Km = 3 as scale writes it (m = 1/3 on
// each MOSFET, the load / 3). The input current is C dv/dt of the gates and rings under
// trapezoidal integration; the two runs step apart, so point by point it differed by 0.9 %
// of its peak; compared by local averages where it rings, the pair passes.
TEST(VerifyPair, AGateCurrentThatRingsPasses) {
    const char* original =
        "inv\nVDD vdd 0 1.8\nVIN in 0 PULSE(0 1.8 1n 50p 50p 2n 4n) AC 1\n"
        "M1 out in vdd vdd pch W=4u L=0.18u\nM2 out in 0 0 nch W=2u L=0.18u\nCL out 0 10f\n"
        ".model nch nmos level=49 version=3.3 tox=4e-9 vth0=0.4\n"
        ".model pch pmos level=49 version=3.3 tox=4e-9 vth0=-0.4\n.tran 10p 8n\n.end\n";
    const char* scaled =
        "inv\nVDD vdd 0 1.8\nVIN in 0 PULSE(0 1.8 1n 50p 50p 2n 4n) AC 1\n"
        "M1 out in vdd vdd pch W=4u L=0.18u m=0.333333333\n"
        "M2 out in 0 0 nch W=2u L=0.18u m=0.333333333\nCL out 0 3.33333333f\n"
        ".model nch nmos level=49 version=3.3 tox=4e-9 vth0=0.4\n"
        ".model pch pmos level=49 version=3.3 tox=4e-9 vth0=-0.4\n.tran 10p 8n\n"
        ".options abstol=3.33333333e-13 chgtol=3.33333333e-15\n.end\n";
    PairVerification v = test::verify_texts(original, scaled, 3, 1);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    EXPECT_TRUE(v.report.passed()) << report_text(v.report);
    ASSERT_FALSE(v.report.comparisons.empty());
    const Comparison& tran = v.report.comparisons.back();
    ASSERT_EQ(tran.notes.size(), 1u);
    EXPECT_NE(tran.notes[0].find("vin#branch: trapezoidal ringing"), std::string::npos);
}

// A level-crossing detector (invented demo): a 3 kHz sine into an adc_bridge and back out
// through a dac_bridge into an RC. Scaled here by hand at Kf = 2.5 by the laws (common
// practice: delays and rise times / Kf, C / (Km Kf), the sine's frequency x Kf). ngspice
// evaluates the bridges only at its time points, and with Kf = 2.5 the runs' grids round
// apart: point by point the 2 V edges would differ by a step (verify/event_timing.hpp). The
// pair passes at 1e-6 with a note; a delay left unscaled still fails; and a capacitor 1 % off,
// a time shift within two steps of 0.25 us here, passes at 1e-3 but fails once --max-step
// resolves the timing finely.
TEST(VerifyPair, EventDrivenEdgesAStepApartPassAndWrongTimingFails) {
    auto deck = [](const char* f, const char* rise, const char* fall, const char* t_edge,
                   const char* c2, const char* tran) {
        return fmt::format(
            "level crossing\nVin ain 0 dc 0 sin(0.5 0.5 {})\nabr [ain] [d1] adc1\n"
            ".model adc1 adc_bridge(in_low=0.45 in_high=0.55 rise_delay={} fall_delay={})\n"
            "adac [d1] [ad1] dac1\n"
            ".model dac1 dac_bridge(out_low=0 out_high=2 t_rise={} t_fall={})\n"
            "R1 ad1 0 2.2k\nR2 ad1 f 4.7k\nC2 f 0 {}\n{}\n.end\n",
            f, rise, fall, t_edge, t_edge, c2, tran);
    };
    std::string original = deck("3k", "1u", "1.5u", "0.3u", "3.3n", ".tran 0.25u 1.5m 0 0.25u");
    std::string scaled =
        deck("7.5k", "0.4u", "0.6u", "0.12u", "1.32n", ".tran 0.1u 0.6m 0 0.1u");
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"), original);
    auto verify = [&](const std::string& text, double tolerance, double max_step) {
        test::write_bytes(dir.file("s.cir"), text);
        PairRequest r;
        r.original = dir.file("o.cir");
        r.scaled = dir.file("s.cir");
        r.factors_given = true;
        r.kf = 2.5;
        r.tolerances.transient = tolerance;
        r.max_step = max_step;
        DiskFileSystem disk;
        PairVerification v = verify_pair(r, disk);
        EXPECT_EQ(v.outcome, PairVerification::Outcome::compared);
        return v;
    };
    PairVerification v = verify(scaled, 1e-6, 0);
    EXPECT_TRUE(v.report.tolerances.event_driven);
    EXPECT_TRUE(v.report.passed()) << report_text(v.report);
    ASSERT_FALSE(v.report.comparisons.empty());
    const auto& notes = v.report.comparisons.back().notes;
    EXPECT_TRUE(std::any_of(notes.begin(), notes.end(), [](const std::string& n) {
        return n.starts_with("ad1: agrees at ");
    })) << report_text(v.report);

    std::string unscaled_delay =
        deck("7.5k", "0.4u", "1.5u", "0.12u", "1.32n", ".tran 0.1u 0.6m 0 0.1u");
    v = verify(unscaled_delay, 1e-3, 0);
    EXPECT_FALSE(v.report.passed());

    std::string c_off = deck("7.5k", "0.4u", "0.6u", "0.12u", "1.3332n", ".tran 0.1u 0.6m 0 0.1u");
    EXPECT_TRUE(verify(c_off, 1e-3, 0).report.passed());
    v = verify(c_off, 1e-3, 50e-9);
    EXPECT_FALSE(v.report.passed());
    EXPECT_EQ(v.report.notes,
              std::vector<std::string>{"transient: both runs with a largest time step of 5e-08 s "
                                       "of the original's time (the scaled run's 2e-08 s), not "
                                       "the .tran card's"});
    EXPECT_TRUE(verify(scaled, 1e-6, 50e-9).report.passed());
}

// A transformer on a nonlinear XSPICE core (lcouple + core, invented values) as scale writes
// it: num_turns x Km, core area / Km, so the mmf nodes keep their voltage and the loop's
// current, its flux, scales by 1/(Km Kf) (shared notes "codemodel-rules.md" §5). Compared
// as a current (x Km) the flux source failed at 0.999 on a right rewrite; mapped back by
// Km Kf it agrees, and the report says which factor it used.
TEST(VerifyPair, TheFluxOfAMagneticLoopIsMappedBackByKmKf) {
    const std::string original =
        "small transformer on an iron core\n"
        "Vs in 0 dc 0 sin(0 2 2k)\nRp in p 22\n"
        "a1 (p 0) (m1 0) prim\n.model prim lcouple(num_turns=120)\n"
        "a2 (m1 m2) iron\n"
        ".model iron core(H_array=[-800 -400 -100 0 100 400 800] "
        "B_array=[-2.2e-3 -1.8e-3 -6e-4 0 6e-4 1.8e-3 2.2e-3] area=0.02 length=0.02)\n"
        "a3 (s 0) (m2 m3) sec\n.model sec lcouple(num_turns=240)\n"
        "Vflux m3 0 0\nRl s 0 470\n"
        ".options reltol=1e-6\n.tran 2u 1.5m 0 2u\n.end\n";
    const double km = 5, kf = 200;
    auto scaled = test::scale_text(original, km, kf, 12);
    ASSERT_TRUE(scaled.result.unscalable.empty());
    PairVerification v = test::verify_texts(original, scaled.text(), km, kf);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    EXPECT_EQ(v.report.tolerances.flux_currents, std::set<std::string>{"vflux#branch"});
    EXPECT_TRUE(v.report.passed()) << report_text(v.report);
    EXPECT_NE(report_text(v.report).find("vflux#branch (x Km Kf)"), std::string::npos);
    EXPECT_NE(report_text(v.report).find("vs#branch (x Km) "), std::string::npos);
}

// A diode clamp fed by a current source, swept over the current and the load, and its
// transresistance; scaled here by hand at Km = 10 by the laws (common practice: R x Km,
// currents / Km; a junction by area 1/Km, shared notes "scaling-rules.md"). The deck's own .dc
// card does not matter: verify sweeps the scaled deck over the mapped values.
const char* kClamp =
    "clamp\n.model DC1 D(IS=1e-14 N=1.5 RS=2)\nI1 0 a 1m\nR1 a b 1k\nD1 b 0 DC1\nRl b 0 4.7k\n"
    ".dc I1 0 2m 0.1m Rl 1k 5k 2k\n.tf v(b) I1\n.end\n";
const char* kClampKm10 =
    "clamp\n.model DC1 D(IS=1e-14 N=1.5 RS=2)\nI1 0 a 100u\nR1 a b 10k\nD1 b 0 DC1 area=0.1\n"
    "Rl b 0 47k\n.dc I1 0 2m 0.1m Rl 1k 5k 2k\n.tf v(b) I1\n.end\n";

TEST(VerifyPair, DcSweepsAndTransferFunctionsAreCompared) {
    test::TempDir dir;
    test::write_bytes(dir.file("o.cir"), kClamp);
    test::write_bytes(dir.file("s.cir"), kClampKm10);
    PairRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");
    r.km = 10;
    r.kf = 1;
    r.factors_given = true;
    DiskFileSystem disk;
    PairVerification v = verify_pair(r, disk);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    const Comparison* dc = nullptr;
    const Comparison* tf = nullptr;
    for (const auto& c : v.report.comparisons) {
        if (c.analysis == "dc") dc = &c;
        if (c.analysis == "tf") tf = &c;
    }
    ASSERT_NE(dc, nullptr);
    ASSERT_NE(tf, nullptr);
    EXPECT_TRUE(dc->problems.empty()) << dc->problems.front();
    EXPECT_EQ(dc->points, 21u * 3u);  // 0 .. 2 mA in 0.1 mA, for 1k, 3k and 5k
    EXPECT_EQ(dc->axis_unit, "A");
    EXPECT_NEAR(dc->last, 2e-3, 1e-15);  // twenty steps of 0.1m added up
    EXPECT_TRUE(dc->passed()) << dc->worst()->name << " " << dc->worst()->worst;
    EXPECT_EQ(tf->vectors.size(), 3u);
    EXPECT_TRUE(tf->passed()) << tf->worst()->name << " " << tf->worst()->worst;
    EXPECT_TRUE(v.report.passed());
    for (const auto& n : v.report.notes) EXPECT_EQ(n.find("not compared"), std::string::npos) << n;

    // R1 left at 1k (the load would not do: the sweep sets it): both analyses show it.
    std::string wrong = kClampKm10;
    wrong.replace(wrong.find("R1 a b 10k"), 10, "R1 a b 1k");
    test::write_bytes(dir.file("w.cir"), wrong);
    r.scaled = dir.file("w.cir");
    v = verify_pair(r, disk);
    ASSERT_EQ(v.outcome, PairVerification::Outcome::compared);
    EXPECT_FALSE(v.report.passed());
    for (const auto& c : v.report.comparisons)
        if (c.analysis == "dc" || c.analysis == "tf") EXPECT_FALSE(c.passed()) << c.analysis;
}

}  // namespace
}  // namespace deckscale
