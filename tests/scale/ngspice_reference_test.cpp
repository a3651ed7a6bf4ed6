// Checks of the scaling pass against the outside world: textbook laws of series and parallel
// RLC circuits, handbook filter prototypes denormalized by scaling, and the ngspice program
// itself as an independent referee of the rewritten decks.
#include <gtest/gtest.h>

#include <cmath>
#include <complex>
#include <cstdlib>
#include <fstream>
#include <numbers>
#include <sstream>

#include "support/common.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

using std::numbers::pi;

// The value field (4th) of the card whose name is `name` in a scaled deck.
double value_of(const std::string& text, const std::string& name) {
    std::istringstream in(text);
    std::string line;
    while (std::getline(in, line)) {
        std::istringstream f(line);
        std::string first, n1, n2, v;
        f >> first >> n1 >> n2 >> v;
        if (first == name) return test::number_value(v);
    }
    ADD_FAILURE() << "no card " << name;
    return std::nan("");
}

struct Rlc {
    double w0, q, bw;
};

// Series RLC: w0 = 1/sqrt(LC), Q = (1/R) sqrt(L/C), BW = R/L; parallel RLC: Q = R sqrt(C/L),
// BW = 1/(RC) (common practice; reference-values.md §1.5).
Rlc series_rlc(double r, double l, double c) { return {1 / std::sqrt(l * c), std::sqrt(l / c) / r, r / l}; }
Rlc parallel_rlc(double r, double l, double c) { return {1 / std::sqrt(l * c), r * std::sqrt(c / l), 1 / (r * c)}; }

TEST(ScaleReferenceTest, RlcLawsHoldOnTheRewrittenValues) {
    const std::string deck = "rlc\nV1 in 0 ac 1\nR1 in a 2\nL1 a b 0.5\nC1 b 0 0.125\n.end\n";
    struct Row {
        int line;
        double km, kf;
    };
    const Row rows[] = {{__LINE__, 100, 1}, {__LINE__, 1, 1000}, {__LINE__, 1000, 2 * pi * 1000},
                        {__LINE__, 0.02, 3.5e6}};
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "ngspice_reference_test.cpp:" << r.line);
        auto s = test::scale_text(deck, r.km, r.kf);
        double R = value_of(s.text(), "R1"), L = value_of(s.text(), "L1"), C = value_of(s.text(), "C1");
        for (bool parallel : {false, true}) {
            Rlc before = parallel ? parallel_rlc(2, 0.5, 0.125) : series_rlc(2, 0.5, 0.125);
            Rlc after = parallel ? parallel_rlc(R, L, C) : series_rlc(R, L, C);
            // Magnitude scaling leaves w0, Q, BW; frequency scaling moves w0 and BW by Kf.
            EXPECT_TRUE(test::close_to(after.w0, before.w0 * r.kf, 1e-6)) << parallel;
            EXPECT_TRUE(test::close_to(after.q, before.q, 1e-6)) << parallel;
            EXPECT_TRUE(test::close_to(after.bw, before.bw * r.kf, 1e-6)) << parallel;
        }
    }
}

// Chebyshev low-pass prototype element values, g0 = 1, ripple band edge 1 rad/s (Matthaei,
// Young & Jones 1964, §4.05: beta = ln coth(Lr/17.37), gamma = sinh(beta/2n), a_k =
// sin((2k-1)pi/2n), b_k = gamma^2 + sin^2(k pi/n), g1 = 2 a1/gamma, g_k = 4 a_{k-1} a_k /
// (b_{k-1} g_{k-1})).
std::vector<double> chebyshev_g(double ripple_db, int n) {
    double beta = std::log(1 / std::tanh(ripple_db / (40 / std::log(10.0))));
    double gamma = std::sinh(beta / (2 * n));
    std::vector<double> a(n + 1), b(n + 1), g(n + 1);
    for (int k = 1; k <= n; ++k) {
        a[k] = std::sin((2 * k - 1) * pi / (2 * n));
        b[k] = gamma * gamma + std::pow(std::sin(k * pi / n), 2);
    }
    g[1] = 2 * a[1] / gamma;
    for (int k = 2; k <= n; ++k) g[k] = 4 * a[k - 1] * a[k] / (b[k - 1] * g[k - 1]);
    return g;
}

// A doubly terminated shunt-C-first ladder, 1 ohm / 1 rad/s, with g values to 12 digits.
std::string ladder(const std::vector<double>& g) {
    std::string d = "prototype ladder\nVs src 0 dc 0 ac 1\nRs src n1 1\n";
    for (std::size_t k = 1; k < g.size(); ++k) {
        if (k % 2 == 1)
            d += fmt::format("C{} n{} 0 {:.12g}\n", k, (k + 1) / 2, g[k]);
        else
            d += fmt::format("L{} n{} n{} {:.12g}\n", k, k / 2, k / 2 + 1, g[k]);
    }
    return d + fmt::format("Rl n{} 0 1\n.end\n", (g.size()) / 2);
}

TEST(ScaleReferenceTest, DenormalizedPrototypesMatchTheHandbook) {
    const double r0 = 50, fc = 10e6, wc = 2 * pi * fc;
    // Butterworth: g_k = 2 sin((2k-1) pi / 2n) (Matthaei, Young & Jones 1964, §4.05).
    std::vector<double> butter(6);
    for (int k = 1; k <= 5; ++k) butter[k] = 2 * std::sin((2 * k - 1) * pi / 10);
    auto cheb = chebyshev_g(0.5, 5);
    // The formula agrees with the handbook table (reference-values.md §2, 0.5 dB, n = 5).
    const double table[] = {0, 1.7058, 1.2296, 2.5408, 1.2296, 1.7058};
    for (int k = 1; k <= 5; ++k) EXPECT_NEAR(cheb[k], table[k], 5e-5) << "g" << k;
    for (const auto* g : {&butter, &cheb}) {
        auto s = test::scale_text(ladder(*g), r0, wc);
        for (int k = 1; k <= 5; ++k) {
            std::string name = (k % 2 ? "C" : "L") + std::to_string(k);
            double want = k % 2 ? (*g)[k] / (wc * r0) : (*g)[k] * r0 / wc;  // C = g/(wR), L = gR/w
            EXPECT_TRUE(test::close_to(value_of(s.text(), name), want, 5e-7)) << name;
        }
        EXPECT_EQ(value_of(s.text(), "Rs"), 50);
    }
    // The published denormalized Chebyshev values (reference-values.md §2, 50 ohm, 10 MHz).
    auto s = test::scale_text(ladder(cheb), r0, wc);
    EXPECT_TRUE(test::close_to(value_of(s.text(), "C1"), 542.9635e-12, 5e-7));
    EXPECT_TRUE(test::close_to(value_of(s.text(), "L2"), 978.5059e-9, 5e-7));
    EXPECT_TRUE(test::close_to(value_of(s.text(), "C3"), 808.7704e-12, 5e-7));
    EXPECT_TRUE(test::close_to(value_of(s.text(), "L4"), 978.5059e-9, 5e-7));
    EXPECT_TRUE(test::close_to(value_of(s.text(), "C5"), 542.9635e-12, 5e-7));
}

// ---- ngspice as referee: V'(Kf f) = V(f) for node voltages, Km I'(Kf f) = I(f) ----

struct AcTable {
    std::vector<std::vector<double>> rows;  // per frequency: f, then (re, im) per vector
};

// Runs `deck` (its ".end" line replaced by a control block) in ngspice batch mode.
AcTable run_ngspice(const std::string& deck, const std::vector<std::string>& vectors,
                    const test::TempDir& dir, const std::string& name) {
    std::string body = deck;
    std::size_t end = body.rfind("\n.end");
    if (end != std::string::npos) body.resize(end + 1);
    std::string out = dir.file(name + ".txt");
    body += ".control\nset wr_singlescale\nrun\nwrdata " + out;
    for (const auto& v : vectors) body += " " + v;
    body += "\nquit 0\n.endc\n.end\n";
    test::write_bytes(dir.file(name + ".cir"), body);
    std::string cmd = test::ngspice_batch() + test::shell_quote(dir.file(name + ".cir")) + " >" +
                      test::shell_quote(dir.file(name + ".log")) + " 2>&1";
    int rc = std::system(cmd.c_str());
    EXPECT_EQ(rc, 0) << test::read_bytes(dir.file(name + ".log"));
    AcTable t;
    std::istringstream in(test::read_bytes(out));
    std::string line;
    while (std::getline(in, line)) {
        std::istringstream f(line);
        std::vector<double> row;
        double x;
        while (f >> x) row.push_back(x);
        if (!row.empty()) t.rows.push_back(row);
    }
    return t;
}

struct RefereeCase {
    int line;
    std::string deck;                  // path under the source dir
    std::vector<std::string> vectors;  // v(...) and i(...) to compare
    double km, kf;
};

TEST(ScaleReferenceTest, NgspiceAgreesAtMappedFrequencies) {
    const RefereeCase cases[] = {
        {__LINE__, "netlists/demo/ladder5_proto.cir", {"v(n1)", "v(n2)", "v(n3)", "i(vsrc)"}, 50,
         2 * pi * 10e6},
        {__LINE__, "netlists/demo/ladder5_proto.cir", {"v(n3)"}, 0.3, 0.02},
        {__LINE__, "netlists/telemetry_linear.cir",
         {"v(n2)", "v(y1)", "v(e2)", "v(g1)", "v(f1)", "v(h2)", "v(t1)", "v(o1)", "v(u1)", "v(b1)",
          "i(vsense)", "i(vin)"},
         75, 2 * pi * 2.5e5},
        // A parameter used as a resistance and (times 1p) as a capacitance: wrapped at its uses.
        {__LINE__, "netlists/corpus/param_shared_value.cir", {"v(a)", "v(out)", "i(v1)"}, 10, 1000},
        // Parameters each with one unit: scaled where they are defined (scale/param_plan).
        {__LINE__, "netlists/corpus/param_one_unit_each.cir", {"v(a)", "v(b)", "v(out)", "i(v1)"}, 10, 1000},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "ngspice_reference_test.cpp:" << c.line << ": " << c.deck);
        std::string original = test::read_bytes(test::source_dir() + "/" + c.deck);
        // 10 digits: the rounding of 7-digit values alone moves sharp responses by ~1e-6.
        auto s = test::scale_text(original, c.km, c.kf, 10);
        ASSERT_TRUE(s.result.unscalable.empty());
        test::TempDir dir;
        AcTable a = run_ngspice(original, c.vectors, dir, "orig");
        AcTable b = run_ngspice(s.text(), c.vectors, dir, "scaled");
        ASSERT_FALSE(a.rows.empty());
        ASSERT_EQ(a.rows.size(), b.rows.size());
        double worst = 0;
        for (std::size_t r = 0; r < a.rows.size(); ++r) {
            ASSERT_EQ(a.rows[r].size(), 1 + 2 * c.vectors.size());
            ASSERT_EQ(b.rows[r].size(), a.rows[r].size());
            EXPECT_TRUE(test::close_to(b.rows[r][0], a.rows[r][0] * c.kf, 1e-6))
                << "f " << a.rows[r][0] << " -> " << b.rows[r][0];
            for (std::size_t v = 0; v < c.vectors.size(); ++v) {
                double k = c.vectors[v][0] == 'i' ? c.km : 1;  // currents are divided by Km
                std::complex<double> x(a.rows[r][1 + 2 * v], a.rows[r][2 + 2 * v]);
                std::complex<double> y(b.rows[r][1 + 2 * v] * k, b.rows[r][2 + 2 * v] * k);
                double err = std::abs(x - y) / std::max(std::abs(x), 1e-12);
                worst = std::max(worst, err);
                EXPECT_LE(err, 1e-6) << c.vectors[v] << " at f=" << a.rows[r][0] << ": " << x
                                     << " vs " << y;
            }
        }
        RecordProperty("worst_" + std::to_string(c.line), std::to_string(worst));
    }
}

}  // namespace
}  // namespace deckscale
