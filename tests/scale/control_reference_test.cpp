// ngspice as referee of rewritten .control blocks: the original deck and its rewrite are run
// with `ngspice -b`; vectors written by wrdata are compared at mapped frequencies and times
// (f' = Kf f, t' = t / Kf, V' = V, I' = I / Km) and measurement results by their unit (shared
// notes "control-and-sweeps.md" A.2 and A.5; ngspice 39 manual 15.4 for the results).
#include <fmt/format.h>
#include <gtest/gtest.h>

#include <cmath>
#include <complex>
#include <map>
#include <numbers>
#include <regex>
#include <sstream>

#include "support/common.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

struct NgspiceRun {
    std::map<std::string, double> results;  // "name = value" lines of the log
    std::map<std::string, std::vector<std::vector<double>>> tables;  // wrdata files by name
};

// Runs `deck` in its own folder under `dir` and reads the wrdata files it names.
NgspiceRun run_ngspice(const std::string& deck, const test::TempDir& dir, const std::string& name,
                       const std::vector<std::string>& files) {
    std::string folder = dir.file(name);
    test::write_bytes(folder + "/deck.cir", deck);
    std::string cmd = "cd " + test::shell_quote(folder) + " && " + test::ngspice_batch() +
                      "deck.cir >run.log 2>&1";
    // Batch mode with a .control block and no output cards exits 1 ("no simulations run"):
    // the log tells whether the commands ran.
    (void)std::system(cmd.c_str());
    std::string log = test::read_bytes(folder + "/run.log");
    EXPECT_EQ(log.find("rror"), std::string::npos) << log;
    NgspiceRun r;
    // A measurement prints "name = value" (ngspice-39.3 src/frontend/measure.c:138).
    static const std::regex result(R"(^\s*(\w+)\s*=\s*([-+0-9.eE]+))");
    std::istringstream in(log);
    std::string line;
    std::smatch m;
    while (std::getline(in, line))
        if (std::regex_search(line, m, result)) r.results[m[1]] = std::stod(m[2]);
    for (const auto& f : files) {
        std::istringstream t(test::read_bytes(folder + "/" + f));
        auto& rows = r.tables[f];
        while (std::getline(t, line)) {
            std::istringstream fields(line);
            std::vector<double> row;
            double x;
            while (fields >> x) row.push_back(x);
            if (!row.empty()) rows.push_back(row);
        }
        EXPECT_FALSE(rows.empty()) << f << "\n" << log;
    }
    return r;
}

struct Expect {
    std::string name;
    double factor;  // scaled result = factor x original result
};

void compare_results(const NgspiceRun& a, const NgspiceRun& b, const std::vector<Expect>& expected,
                     double tol) {
    for (const auto& e : expected) {
        SCOPED_TRACE(e.name);
        ASSERT_TRUE(a.results.count(e.name) && b.results.count(e.name));
        double want = a.results.at(e.name) * e.factor, got = b.results.at(e.name);
        EXPECT_LE(std::fabs(got - want), tol * std::max(std::fabs(want), 1e-30))
            << a.results.at(e.name) << " x " << e.factor << " vs " << got;
    }
}

// Columns of one wrdata table: scaled column = factor x original column, relative to the
// column's largest magnitude.
void compare_table(const NgspiceRun& a, const NgspiceRun& b, const std::string& file,
                   const std::vector<double>& factors, double tol) {
    SCOPED_TRACE(file);
    const auto& ra = a.tables.at(file);
    const auto& rb = b.tables.at(file);
    ASSERT_EQ(ra.size(), rb.size());
    for (std::size_t c = 0; c < factors.size(); ++c) {
        double peak = 0, worst = 0;
        for (const auto& row : ra) peak = std::max(peak, std::fabs(row.at(c) * factors[c]));
        for (std::size_t r = 0; r < ra.size(); ++r)
            worst = std::max(worst, std::fabs(rb[r].at(c) - ra[r].at(c) * factors[c]));
        EXPECT_LE(worst, tol * peak) << "column " << c;
    }
}

// An RLC low-pass whose only analysis is in .control.
TEST(ControlReference, AcAtMappedFrequenciesAndMeasurements) {
    const std::string deck =
        "tone filter, AC in .control only\n"
        "V1 in 0 DC 0 AC 1\nR1 in a 330\nL1 a out 15m\nC1 out 0 220n\nR2 out 0 2.2k\n"
        ".control\n"
        "set wr_singlescale\n"
        "ac dec 30 20 200k\n"
        "meas ac fpk max_at vm(out)\n"
        "meas ac vpk max vm(out)\n"
        "meas ac f6 when vdb(out)=-6\n"
        "meas ac g2k find vdb(out) at=2k\n"
        "meas ac vav avg vm(out) from=500 to=5k\n"
        "wrdata ac.txt v(out) i(v1)\n"
        // alter by the element rule table (manual 17.5.3): C / (Km Kf), R x Km
        "alter c1 = 330n\n"
        "alter @r2[resistance] = 1.5k\n"
        "ac dec 30 20 200k\n"
        "meas ac fpk2 max_at vm(out)\n"
        "wrdata ac2.txt v(out)\n"
        ".endc\n.end\n";
    const double km = 47, kf = 2500;
    auto s = test::scale_text(deck, km, kf, 15);
    ASSERT_TRUE(s.result.unscalable.empty());
    test::TempDir dir;
    NgspiceRun a = run_ngspice(deck, dir, "orig", {"ac.txt", "ac2.txt"});
    NgspiceRun b = run_ngspice(s.text(), dir, "scaled", {"ac.txt", "ac2.txt"});
    // f, re/im v(out), re/im i(v1): the response at Kf f equals the original's at f.
    // wrdata prints 9 significant digits: 2e-8 is the printing, not the circuit.
    compare_table(a, b, "ac.txt", {kf, 1, 1, 1 / km, 1 / km}, 2e-8);
    // Results carry 7 printed digits (measure.c:88).
    compare_table(a, b, "ac2.txt", {kf, 1, 1}, 2e-8);
    compare_results(a, b,
                    {{"fpk", kf}, {"vpk", 1}, {"f6", kf}, {"g2k", 1}, {"vav", 1}, {"fpk2", kf}},
                    2e-6);
    // The altered circuit peaks elsewhere: the second sweep is not the first one again.
    EXPECT_GT(std::fabs(a.results.at("fpk2") / a.results.at("fpk") - 1), 0.05);
}

// A foreach loop whose variable is the value of `alter` (manual 17.6.4 and 17.5.3): its values
// take that unit (here ohms: x Km), and every pass of the loop measures the corner at Kf f.
TEST(ControlReference, ForeachValuesTakeTheUnitOfTheirAlter) {
    const std::string deck =
        "RC corner over three resistors, a loop in .control\n"
        "V1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 100n\n"
        ".control\n"
        "foreach r 500 1k 2.2k\n"
        "  alter R1 $r\n"
        "  echo resistor $r\n"
        "  ac dec 40 10 100k\n"
        "  meas ac f3 when vdb(out)=-3\n"
        "end\n"
        ".endc\n.end\n";
    const double km = 20, kf = 300;
    auto s = test::scale_text(deck, km, kf, 15);
    ASSERT_TRUE(s.result.unscalable.empty());
    EXPECT_NE(s.text().find("foreach r 10000 20k 44k\n"), std::string::npos) << s.text();
    test::TempDir dir;
    run_ngspice(deck, dir, "orig", {});
    run_ngspice(s.text(), dir, "scaled", {});
    auto corners = [&](const std::string& name) {
        std::vector<double> f;
        std::istringstream in(test::read_bytes(dir.file(name) + "/run.log"));
        static const std::regex result(R"(^\s*f3\s*=\s*([-+0-9.eE]+))");
        std::smatch m;
        for (std::string line; std::getline(in, line);)
            if (std::regex_search(line, m, result)) f.push_back(std::stod(m[1]));
        return f;
    };
    std::vector<double> a = corners("orig"), b = corners("scaled");
    ASSERT_EQ(a.size(), 3u);
    ASSERT_EQ(b.size(), 3u);
    for (std::size_t i = 0; i < 3; ++i) EXPECT_NEAR(b[i], a[i] * kf, 2e-6 * a[i] * kf) << i;
    // 1 / (2 pi R C) at R = 500: the loop did set the resistor (common practice).
    EXPECT_NEAR(a[0], 1 / (2 * std::numbers::pi * 500 * 100e-9), 0.01 * a[0]);
    // Any other use of the variable leaves its unit unknown: refused as before.
    auto other = test::scale_text(
        "t\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 1n\n.control\nforeach r 1k 2k\n"
        "alter R1 $r\nlet x = $r * 2\nend\n.endc\n.end\n",
        km, kf);
    ASSERT_FALSE(other.result.unscalable.empty());
    EXPECT_NE(other.result.unscalable[0].message.find("'1k' in 'foreach'"), std::string::npos)
        << other.result.unscalable[0].message;
    // Two alters of different units: refused too.
    auto mixed = test::scale_text(
        "t\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 1n\n.control\nforeach r 1k 2k\n"
        "alter R1 $r\nalter C1 $r\nend\n.endc\n.end\n",
        km, kf);
    EXPECT_FALSE(mixed.result.unscalable.empty());
}

TEST(ControlReference, TranAtMappedTimesAndMeasurements) {
    const std::string deck =
        "pulse shaper, TRAN in .control only\n"
        "V1 in 0 DC 0 PULSE(0 1 50u 2u 2u 300u 800u)\n"
        "R1 in a 220\nL1 a out 4.7m\nC1 out 0 68n\nR2 out s 1.5k\nVs s 0 DC 0\n"
        ".control\n"
        "set wr_singlescale\n"
        // Absolute tolerances written so that they scale too (notes A.3).
        "option abstol=1e-12 chgtol=1e-14\n"
        "tran 1u 1.2m\n"
        "meas tran trise trig v(out) val=0.1 rise=1 targ v(out) val=0.6 rise=1\n"
        "meas tran vat find v(out) at=0.3m\n"
        "meas tran vavg avg v(out) from=0.1m to=0.5m\n"
        "meas tran tw when v(out)=0.3 td=0.4m\n"
        "meas tran q integ i(vs) from=0.05m to=0.4m\n"
        "meas tran tmx max_at v(out) from=0.05m to=0.4m\n"
        "meas tran imax max i(vs)\n"
        "linearize v(out) i(vs)\n"
        "wrdata tr.txt v(out) i(vs)\n"
        ".endc\n.end\n";
    const double km = 8, kf = 1000;
    auto s = test::scale_text(deck, km, kf, 15);
    ASSERT_TRUE(s.result.unscalable.empty());
    test::TempDir dir;
    NgspiceRun a = run_ngspice(deck, dir, "orig", {"tr.txt"});
    NgspiceRun b = run_ngspice(s.text(), dir, "scaled", {"tr.txt"});
    compare_table(a, b, "tr.txt", {1 / kf, 1, 1 / km}, 1e-6);
    compare_results(a, b,
                    {{"trise", 1 / kf},
                     {"vat", 1},
                     {"vavg", 1},
                     {"tw", 1 / kf},
                     {"q", 1 / (km * kf)},
                     {"tmx", 1 / kf},
                     {"imax", 1 / km}},
                    1e-5);
}

// Expressions in let, if and while (manual 17.2, 17.6): a threshold compared with time or a
// current scales with it, a time constant in exp() too, a loop counter and a coefficient stay. ngspice computes each
// value in both decks; the scaled deck's values are the original's times their unit's
// factor, and the one branch taken on a current threshold is taken in both. (Had 50u stayed,
// no scaled time would pass it and vlate would be 0; had 0.1m stayed, the scaled current,
// 47 times smaller, would not pass it.)
TEST(ControlReference, ExpressionsInLetIfAndWhileKeepTheirMeaning) {
    const std::string deck =
        "pulse into an RC, checks computed in .control\n"
        "V1 in 0 pulse(0 1 10u 1n 1n 1 2)\nR1 in out 1k\nC1 out 0 10n\n"
        ".control\n"
        "set numdgt=12\n"
        "option abstol=1e-12 chgtol=1e-14\n"
        "tran 0.2u 100u\n"
        "let vlate = vecmax(v(out)*(time gt 50u))\n"
        "let ilate = vecmax(-i(v1)*(time gt 30u))\n"
        "let tlast = vecmax(time) - 20u\n"
        "let env = exp(-time/20u)\n"
        "let elast = env[length(env) - 1]\n"
        "let w = 2*pi*1k\n"
        "let n = 0\n"
        "while n < 3\n"
        "  let n = n + 1\n"
        "end\n"
        "let above = 0\n"
        "if ilate > 0.1m\n"
        "  let above = 1\n"
        "end\n"
        "print vlate ilate tlast elast w n above\n"
        ".endc\n.end\n";
    const double km = 47, kf = 1024;
    auto s = test::scale_text(deck, km, kf, 15);
    ASSERT_TRUE(s.result.unscalable.empty());
    test::TempDir dir;
    NgspiceRun a = run_ngspice(deck, dir, "orig", {});
    NgspiceRun b = run_ngspice(s.text(), dir, "scaled", {});
    compare_results(a, b,
                    {{"vlate", 1}, {"ilate", 1 / km}, {"tlast", 1 / kf}, {"elast", 1}, {"w", 1},
                     {"n", 1}, {"above", 1}},
                    1e-6);
    EXPECT_GT(a.results.at("vlate"), 0.99);  // 1 - exp(-4): the late part is there
    EXPECT_EQ(a.results.at("n"), 3);
    EXPECT_EQ(a.results.at("above"), 1);  // 1 mA exp(-2) = 0.135 mA > 0.1 mA
    EXPECT_NEAR(a.results.at("elast"), std::exp(-5.0), 1e-6);  // exp(-100u/20u)
}

// A resistor stepped by a while loop through a let variable that alter reads (manual 17.5.3:
// the value may be a vector): the variable takes the unit of R1 (x Km), so does the bound it
// is compared with, and the factor it is multiplied by stays. Each pass measures the corner;
// ngspice finds the same number of passes and each corner at Kf f. (Before the variable's
// unit was followed, every number of the loop was refused.)
TEST(ControlReference, ALoopVariableThatAlterReadsTakesTheElementsUnit) {
    const std::string deck =
        "rc corner over resistors chosen in a loop\n"
        "V1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 100n\n"
        ".control\n"
        "let rval = 500\n"
        "let passes = 0\n"
        "while rval < 3k\n"
        "  alter r1 = rval\n"
        "  ac dec 20 10 100k\n"
        "  meas ac fc when vdb(out) = -3\n"
        "  let passes = passes + 1\n"
        "  let rval = rval * 2\n"
        "end\n"
        "print passes\n"
        ".endc\n.end\n";
    const double km = 10, kf = 100;
    auto s = test::scale_text(deck, km, kf, 15);
    ASSERT_TRUE(s.result.unscalable.empty());
    EXPECT_NE(s.text().find("let rval = 5000\n"), std::string::npos) << s.text();
    EXPECT_NE(s.text().find("while rval < 30k\n"), std::string::npos) << s.text();
    test::TempDir dir;
    NgspiceRun a = run_ngspice(deck, dir, "orig", {});
    NgspiceRun b = run_ngspice(s.text(), dir, "scaled", {});
    // The last pass (R = 2k): 1 / (2 pi 2k 100n) = 796 Hz.
    compare_results(a, b, {{"passes", 1}, {"fc", kf}}, 1e-6);
    EXPECT_EQ(a.results.at("passes"), 3);
    EXPECT_NEAR(a.results.at("fc"), 1 / (2 * std::numbers::pi * 2e3 * 100e-9), 5);
}

// altermod of a diode model's parameters (manual 17.5.4) as its .model card's rewrite scales
// them: IS stays (the instance's m = 1/Km carries the magnitude), CJO and TT divide by Kf.
// ngspice runs both decks: the DC curve after the first altermod and the AC response after
// the second agree at mapped currents and frequencies.
TEST(ControlReference, AltermodOfADiodeModelFollowsItsCard) {
    const std::string deck =
        "biased varactor-like diode, its model changed in .control\n"
        "I1 0 out DC 0.4m AC 1m\nR1 out 0 2.7k\nD1 out 0 dvar\n"
        ".model dvar D(IS=3e-15 N=1.1 RS=12 CJO=15p TT=20n)\n"
        ".control\n"
        "set wr_singlescale\n"
        // Tight tolerances: both runs' operating points converge alike (the AC response
        // rests on them).
        "option abstol=1e-15 reltol=1e-9 vntol=1e-12\n"
        "altermod dvar is=1e-14\n"
        "dc I1 0 1m 0.05m\n"
        "wrdata dc.txt v(out)\n"
        "altermod dvar cjo=40p\n"
        "altermod dvar tt=5n\n"
        "ac dec 10 10k 100meg\n"
        "wrdata ac.txt v(out)\n"
        ".endc\n.end\n";
    const double km = 6, kf = 250;
    auto s = test::scale_text(deck, km, kf, 15);
    ASSERT_TRUE(s.result.unscalable.empty());
    EXPECT_NE(s.text().find("altermod dvar is=1e-14\n"), std::string::npos) << s.text();
    EXPECT_NE(s.text().find("altermod dvar cjo=160f\n"), std::string::npos) << s.text();
    EXPECT_NE(s.text().find("altermod dvar tt=20p\n"), std::string::npos) << s.text();
    test::TempDir dir;
    NgspiceRun a = run_ngspice(deck, dir, "orig", {"dc.txt", "ac.txt"});
    NgspiceRun b = run_ngspice(s.text(), dir, "scaled", {"dc.txt", "ac.txt"});
    // I1 / Km, v(out); f x Kf, re/im v(out) of a drive of 1m / Km: I1's AC value scales too.
    compare_table(a, b, "dc.txt", {1 / km, 1}, 1e-7);
    compare_table(a, b, "ac.txt", {kf, 1, 1}, 1e-7);
}

// DC sweeps of a current source and of a resistor, in .control and as dot cards: at=, when
// results take the swept quantity's unit.
TEST(ControlReference, DcSweepsAndMeasurementsInTheSweptUnit) {
    const std::string parts = "I1 0 top DC 1m\nR1 top mid 1.2k\nR2 mid 0 3.3k\nR3 top 0 10k\n";
    const std::string in_control = "bias ladder, DC in .control\n" + parts +
                                   ".control\n"
                                   "set wr_singlescale\n"
                                   "dc I1 0 2m 0.1m\n"
                                   "meas dc vmid find v(mid) at=1.3m\n"
                                   "meas dc iat when v(top)=5\n"
                                   "wrdata dc1.txt v(top) v(mid)\n"
                                   "dc R2 1k 5k 250\n"
                                   "meas dc vr find v(mid) at=2.2k\n"
                                   "meas dc rwhen when v(mid)=1.5\n"
                                   "wrdata dc2.txt v(mid)\n"
                                   ".endc\n.end\n";
    const std::string as_cards = "bias ladder, DC cards\n" + parts +
                                 ".meas dc vcard find v(mid) at=1.3m\n"
                                 ".meas dc icard when v(top)=5\n"
                                 ".dc I1 0 2m 0.1m\n.end\n";
    const double km = 8, kf = 1000;
    test::TempDir dir;
    auto s = test::scale_text(in_control, km, kf, 15);
    ASSERT_TRUE(s.result.unscalable.empty());
    NgspiceRun a = run_ngspice(in_control, dir, "orig", {"dc1.txt", "dc2.txt"});
    NgspiceRun b = run_ngspice(s.text(), dir, "scaled", {"dc1.txt", "dc2.txt"});
    compare_table(a, b, "dc1.txt", {1 / km, 1, 1}, 2e-8);
    compare_table(a, b, "dc2.txt", {km, 1}, 2e-8);
    compare_results(a, b, {{"vmid", 1}, {"iat", 1 / km}, {"vr", 1}, {"rwhen", km}}, 2e-6);

    auto t = test::scale_text(as_cards, km, kf, 15);
    ASSERT_TRUE(t.result.unscalable.empty());
    NgspiceRun c = run_ngspice(as_cards, dir, "cards_orig", {});
    NgspiceRun d = run_ngspice(t.text(), dir, "cards_scaled", {});
    compare_results(c, d, {{"vcard", 1}, {"icard", 1 / km}}, 2e-6);
}

// AT= on the first or last point of a sweep: ngspice 39 reads a value only between points it
// stepped through ("find(AT) : out of interval" otherwise, tried). Rounded to the default 9
// digits, at=1m of `.tran 1u 1m` became at=142.857143u at Kf = 7, past the scaled run's last
// point 142.857142857143u, and the measurement was lost; likewise the end of a current sweep
// at Km = 3. Each is now written just inside the scaled sweep.
TEST(ControlReference, MeasurementsAtTheEndsOfASweepAreKept) {
    const std::string tran =
        "rc charge\nV1 in 0 DC 0 PULSE(0 1 0 1n 1n 1 2)\nR1 in a 1k\nC1 a 0 100n\n"
        ".tran 1u 1m\n.meas tran v_first find v(a) at=0\n.meas tran v_end find v(a) at=1m\n.end\n";
    const std::string dc =
        "current divider\nI1 0 a 1m\nRsh a 0 3k\nR1 a b 1k\nR2 b 0 2k\n.dc I1 0.5m 2m 0.5m\n"
        ".meas dc vb_first find v(b) at=0.5m\n.meas dc vb_end find v(b) at=2m\n.end\n";
    const std::string ac =
        "rc corner\nV1 in 0 DC 0 AC 1\nR1 in a 1k\nC1 a 0 100n\n.control\nac lin 11 1k 3k\n"
        "meas ac g_first find vdb(a) at=1k\nmeas ac g_end find vdb(a) at=3k\n.endc\n.end\n";
    const double km = 3, kf = 7;
    test::TempDir dir;
    int k = 0;
    for (const auto& [deck, names] :
         {std::pair{tran, std::vector<std::string>{"v_first", "v_end"}},
          std::pair{dc, std::vector<std::string>{"vb_first", "vb_end"}},
          std::pair{ac, std::vector<std::string>{"g_first", "g_end"}}}) {
        auto s = test::scale_text(deck, km, kf, 9);  // the default digits
        ASSERT_TRUE(s.result.unscalable.empty());
        ++k;
        NgspiceRun a = run_ngspice(deck, dir, fmt::format("orig{}", k), {});
        NgspiceRun b = run_ngspice(s.text(), dir, fmt::format("scaled{}", k), {});
        for (const auto& n : names) {
            ASSERT_TRUE(a.results.count(n)) << n << " in the original";
            ASSERT_TRUE(b.results.count(n)) << n << " lost in the scaled deck:\n" << s.text();
            EXPECT_NEAR(b.results[n], a.results[n], 1e-6 * std::fabs(a.results[n]) + 1e-9) << n;
        }
    }
}

}  // namespace
}  // namespace deckscale
