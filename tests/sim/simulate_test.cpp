// Tests of the simulator layer: real ngspice (libngspice 39) runs in child processes. The pure
// parts have their own files: sim/wire_test.cpp (pipe encoding), sim/verdict_test.cpp.
#include "sim/simulate.hpp"
#include "support/sim.hpp"

#include <fmt/format.h>
#include <gtest/gtest.h>
#include <sys/wait.h>

#include <algorithm>
#include <cerrno>
#include <chrono>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <numbers>
#include <string>
#include <thread>
#include <vector>

namespace deckscale {
namespace {

using namespace std::chrono_literals;
constexpr double pi = std::numbers::pi;

using test::make_job;

const SimPlot* plot_named(const SimOutcome& out, const std::string& name) {
    for (const SimPlot& p : out.plots)
        if (p.name == name) return &p;
    return nullptr;
}

double db(double x) { return 20.0 * std::log10(x); }

using test::no_children_left;
using test::ScratchDir;

// ---- RC low-pass: H(f) = 1/(1 + j f/fc), fc = 1/(2 pi R C) (analytic first-order response,
// common practice in any circuit-analysis text).
constexpr double rc_r = 1e3;
constexpr double rc_c = 159.155e-9;
const std::vector<std::string> rc_cards = {"RC low-pass",       "V1 in 0 DC 0 AC 1", "R1 in out 1k",
                                           "C1 out 0 159.155n", ".ac dec 10 1 1meg", ".end"};

::testing::AssertionResult rc_is_correct(const SimOutcome& out) {
    if (out.status != SimStatus::ok)
        return ::testing::AssertionFailure() << to_string(out.status) << ": " << out.message;
    const SimPlot* ac = plot_named(out, "ac1");
    if (out.plots.size() != 1 || !ac) return ::testing::AssertionFailure() << "want one plot ac1";
    const SimVector* f = ac->find("frequency");
    const SimVector* v = ac->find("out");
    const SimVector* i = ac->find("v1#branch");
    if (!f || !v || !i)
        return ::testing::AssertionFailure() << "frequency, out or v1#branch missing";
    // ngspice notes §5: "dec 10 1 1meg" gives 61 points.
    if (f->values.size() != 61 || v->values.size() != 61 || i->values.size() != 61)
        return ::testing::AssertionFailure() << "want 61 points, got " << f->values.size();
    const double fc = 1.0 / (2 * pi * rc_r * rc_c);
    for (std::size_t k = 0; k < 61; ++k) {
        double x = f->values[k].real() / fc;
        double want_mag = 1.0 / std::sqrt(1.0 + x * x);
        double want_phase = -std::atan(x);
        std::complex<double> h = v->values[k];
        if (std::abs(std::abs(h) - want_mag) > 1e-6 * want_mag ||
            std::abs(std::arg(h) - want_phase) > 1e-6)
            return ::testing::AssertionFailure()
                   << "wrong response at " << f->values[k].real() << " Hz";
        // The branch current of a voltage source flows from its + node through it to its - node
        // (SPICE convention, ngspice manual ch. 4.1): here -(v(in) - v(out))/R1 with v(in) = 1.
        std::complex<double> want_i = -(1.0 - h) / rc_r;
        if (std::abs(i->values[k] - want_i) > 1e-9 * std::abs(want_i) + 1e-15)
            return ::testing::AssertionFailure()
                   << "wrong v1#branch at " << f->values[k].real() << " Hz";
    }
    return ::testing::AssertionSuccess();
}

TEST(SimRc, FirstOrderLowPassMatchesTheAnalyticResponse) {
    SimOutcome out = simulate(make_job("rc", rc_cards));
    ASSERT_TRUE(rc_is_correct(out));
    const SimPlot& ac = out.plots[0];
    EXPECT_EQ(ac.analysis, "AC Analysis");
    // Vector kinds follow ngspice's v_type (sim.h enum vector_types).
    EXPECT_EQ(ac.find("frequency")->kind, VectorKind::frequency);
    EXPECT_EQ(ac.find("out")->kind, VectorKind::voltage);
    EXPECT_EQ(ac.find("in")->kind, VectorKind::voltage);
    EXPECT_EQ(ac.find("v1#branch")->kind, VectorKind::current);
    EXPECT_EQ(ac.find("OUT"), ac.find("out"));  // find() ignores case
    EXPECT_EQ(ac.find("v(out)"), nullptr);      // names are ngspice's, not expressions
    // ngspice stores the frequency scale as complex numbers with imaginary part 0 (notes §5).
    for (const auto& x : ac.find("frequency")->values) EXPECT_EQ(x.imag(), 0.0);
    EXPECT_EQ(ac.find("frequency")->values.front().real(), 1.0);
    EXPECT_NEAR(ac.find("frequency")->values.back().real(), 1e6, 1e-6);
    EXPECT_TRUE(out.message.empty());
    EXPECT_NE(std::find(out.log.begin(), out.log.end(), "Circuit: rc low-pass"), out.log.end());
}

// ---- Doubly terminated LC ladders at R0 = 50 ohm, fc = 10 MHz, shunt C first. Source V1
// (AC 1) behind Rs = R0, load R0: the flat loss is 20 log10(2) = 6.0206 dB, so the filter's
// own attenuation is -20 log10(2 |v(n3)|). Decks as in /work/shared/notes/reference-values.md §5.
std::vector<std::string> ladder(const std::string& title, const double (&g)[5],
                                const std::string& sweep) {
    const double r0 = 50.0, wc = 2 * pi * 10e6;
    // Denormalisation: C = g/(wc R0), L = g R0/wc (Matthaei, Young & Jones 1964, §4.04).
    auto c = [&](double gk) { return fmt::format("{:.12g}", gk / (wc * r0)); };
    auto l = [&](double gk) { return fmt::format("{:.12g}", gk * r0 / wc); };
    return {title,
            "V1 src 0 dc 0 ac 1",
            "Rs src n1 50",
            "C1 n1 0 " + c(g[0]),
            "L2 n1 n2 " + l(g[1]),
            "C3 n2 0 " + c(g[2]),
            "L4 n2 n3 " + l(g[3]),
            "C5 n3 0 " + c(g[4]),
            "RL n3 0 50",
            sweep,
            ".end"};
}

TEST(SimFilter, ButterworthFifthOrderLadder) {
    // g_k = 2 sin((2k-1) pi / 2n) (Matthaei, Young & Jones 1964, §4.05, eq. 4.05-1).
    double g[5];
    for (int k = 1; k <= 5; ++k) g[k - 1] = 2 * std::sin((2 * k - 1) * pi / 10);
    SimOutcome out =
        simulate(make_job("butterworth", ladder("Butterworth n=5", g, ".ac dec 50 1meg 100meg")));
    ASSERT_EQ(out.status, SimStatus::ok) << out.message;
    const SimPlot& ac = out.plots.at(0);
    const SimVector& f = *ac.find("frequency");
    const SimVector& v = *ac.find("n3");
    ASSERT_EQ(f.values.size(), v.values.size());
    // Two whole decades: 101 points, 10 MHz among them. (With a stop frequency that is not a
    // whole number of decades, ngspice 39 stretches the step so that the last point is the
    // stop frequency, and 10 MHz would be missed; measured.)
    ASSERT_EQ(f.values.size(), 101u);
    bool saw_fc = false;
    for (std::size_t k = 0; k < f.values.size(); ++k) {
        double x = f.values[k].real() / 10e6;
        // |H| = 1/sqrt(1 + (f/fc)^2n), halved by the terminations (maximally flat response).
        double want = 0.5 / std::sqrt(1 + std::pow(x, 10));
        EXPECT_NEAR(db(std::abs(v.values[k])), db(want), 0.01)
            << "at " << f.values[k].real() << " Hz";
        if (std::abs(x - 1) < 1e-9) {
            saw_fc = true;
            // 10 log10 2 = 3.0103 dB at fc for every order (reference-values.md §1.1).
            EXPECT_NEAR(-db(2 * std::abs(v.values[k])), 3.0103, 0.01);
        }
    }
    EXPECT_TRUE(saw_fc) << "the sweep should contain 10 MHz";
}

// 0.5 dB Chebyshev n=5 prototype g = 1.7058, 1.2296, 2.5408, 1.2296, 1.7058 (values of
// reference-values.md §2, "Denormalised example"; Matthaei, Young & Jones 1964, Table 4.05-2).
const double chebyshev_g[5] = {1.70577, 1.22963, 2.54083, 1.22963, 1.70577};

double attenuation_db(const SimVector& v, std::size_t k) { return -db(2 * std::abs(v.values[k])); }

::testing::AssertionResult ripple_is_half_db(const SimOutcome& out) {
    if (out.status != SimStatus::ok) return ::testing::AssertionFailure() << out.message;
    const SimVector& v = *out.plots.at(0).find("n3");
    double lo = 1e9, hi = -1e9;
    for (std::size_t k = 0; k < v.values.size(); ++k) {
        lo = std::min(lo, attenuation_db(v, k));
        hi = std::max(hi, attenuation_db(v, k));
    }
    // Equal ripple L_Ar = 0.5 dB in the passband (Chebyshev response |S21|^2 = 1/(1+eps^2 T_n^2)).
    if (std::abs((hi - lo) - 0.5) > 0.005 || v.values.size() != 2000)
        return ::testing::AssertionFailure()
               << "ripple " << hi - lo << " dB over " << v.values.size();
    return ::testing::AssertionSuccess();
}

TEST(SimFilter, ChebyshevHalfDecibelRipple) {
    SimOutcome out = simulate(make_job(
        "chebyshev", ladder("Chebyshev 0.5 dB n=5", chebyshev_g, ".ac lin 2000 5k 10meg")));
    EXPECT_TRUE(ripple_is_half_db(out));
}

// ---- .op and .tran: plots in creation order, scale and branch kinds.
TEST(SimKinds, OperatingPointAndTransientPlots) {
    // op: the capacitor is open, out = 10 V * 3k/(1k + 3k) = 7.5 V, i(V1) = -10 V/4k (divider).
    // tran: the pulse steps 0 -> 1 V, out = 0.75 (1 - exp(-t/tau)), tau = (1k || 3k) * 1u = 750 us
    // (first-order step response, Thevenin equivalent).
    SimOutcome out = simulate(
        make_job("op+tran", {"op and tran", "V1 in 0 DC 10 PULSE(0 1 0 1n 1n 1 2)", "R1 in out 1k",
                             "R2 out 0 3k", "C1 out 0 1u", ".op", ".tran 1u 3m 0 1u", ".end"}));
    ASSERT_EQ(out.status, SimStatus::ok) << out.message;
    ASSERT_EQ(out.plots.size(), 2u);
    const SimPlot& op = out.plots[0];
    const SimPlot& tran = out.plots[1];
    EXPECT_EQ(op.name, "op1");
    EXPECT_EQ(op.analysis, "Operating Point");
    EXPECT_EQ(tran.name, "tran1");
    EXPECT_EQ(tran.analysis, "Transient Analysis");

    ASSERT_NE(op.find("out"), nullptr);
    ASSERT_NE(op.find("v1#branch"), nullptr);
    EXPECT_EQ(op.find("out")->kind, VectorKind::voltage);
    EXPECT_EQ(op.find("v1#branch")->kind, VectorKind::current);
    EXPECT_NEAR(op.find("out")->values.at(0).real(), 7.5, 1e-9);
    EXPECT_NEAR(op.find("v1#branch")->values.at(0).real(), -2.5e-3, 1e-12);

    const SimVector* t = tran.find("time");
    const SimVector* v = tran.find("out");
    const SimVector* i = tran.find("v1#branch");
    ASSERT_TRUE(t && v && i);
    EXPECT_EQ(t->kind, VectorKind::time);
    EXPECT_EQ(v->kind, VectorKind::voltage);
    EXPECT_EQ(i->kind, VectorKind::current);
    ASSERT_GT(t->values.size(), 1000u);
    EXPECT_EQ(t->values.front().real(), 0.0);
    EXPECT_NEAR(t->values.back().real(), 3e-3, 1e-12);
    const SimVector* in = tran.find("in");
    for (std::size_t k = 0; k < t->values.size(); ++k) {
        double time = t->values[k].real();
        EXPECT_EQ(t->values[k].imag(), 0.0);  // transient data are real
        if (k > 0) {
            EXPECT_GT(time, t->values[k - 1].real());
        }
        double want = time < 1e-9 ? 0.0 : 0.75 * (1 - std::exp(-(time - 1e-9) / 750e-6));
        EXPECT_NEAR(v->values[k].real(), want, 1e-5) << "at t = " << time;
        double want_i = -(in->values[k].real() - v->values[k].real()) / 1e3;
        EXPECT_NEAR(i->values[k].real(), want_i, 1e-12) << "at t = " << time;
    }
}

// ---- Failure classes. Each must come back as data (never crash the test process), quote
// ngspice's own words, and leave the next simulation unaffected. Statuses and words were
// measured with libngspice 39 (see also /work/shared/notes/ngspice-embedding.md §7).
struct FailureCase {
    const char* name;
    std::vector<std::string> cards;
    SimStatus status;
    const char* words;  // must appear in message
};

const std::vector<FailureCase> failure_cases = {
    {"unknown model",
     {"t", "V1 in 0 AC 1", "R1 in out 1k", "D1 out 0 nosuchmodel", ".ac dec 10 1 1meg", ".end"},
     SimStatus::load_failed,
     "could not find a valid modelname"},
    // A numparam error makes ngspice call ControlledExit (it then cannot recover).
    {"undefined param",
     {"t", "V1 in 0 AC 1", "R1 in out {rval}", "C1 out 0 1n", ".ac dec 10 1 1meg", ".end"},
     SimStatus::controlled_exit,
     "Undefined parameter [rval]"},
    {"missing .ends",
     {"t", ".subckt blk a b", "R1 a b 1k", "V1 in 0 AC 1", "X1 in out blk", "C1 out 0 1n",
      ".ac dec 10 1 1meg", ".end"},
     SimStatus::controlled_exit,
     "Mismatch of .subckt ... .ends statements!"},
    {"quit in .control",
     {"t", "V1 in 0 AC 1", "R1 in out 1k", "C1 out 0 1n", ".ac dec 10 1 1meg", ".control", "quit",
      ".endc", ".end"},
     SimStatus::controlled_exit,
     "'quit' asks for detaching"},
    // Two sources in parallel: singular matrix, the operating point fails, no plot.
    {"voltage source loop",
     {"t", "V1 a 0 DC 1 AC 1", "V2 a 0 DC 2", "R1 a 0 1k", ".ac dec 10 1 1meg", ".end"},
     SimStatus::run_failed,
     "run simulation(s) aborted"},
    // Accepted by ngspice with a 1 mOhm resistor: the simulated circuit is not the deck.
    {"resistor without value",
     {"t", "V1 in 0 AC 1", "R1 in out", "C1 out 0 1n", ".ac dec 10 1 1meg", ".end"},
     SimStatus::load_failed,
     "set to 1 mOhm"},
    {"missing .end",
     {"t", "V1 in 0 AC 1", "R1 in out 1k", "C1 out 0 1n", ".ac dec 10 1 1meg"},
     SimStatus::load_failed,
     ".end statement is missing"},
    {"unknown dot card",
     {"t", "V1 in 0 AC 1", "R1 in out 1k", "C1 out 0 1n", ".foo bar", ".ac dec 10 1 1meg", ".end"},
     SimStatus::load_failed,
     "unimplemented control card"},
    {"missing include",
     {"t", ".include no-such-file.inc", "V1 in 0 AC 1", "R1 in 0 1k", ".ac dec 10 1 1meg", ".end"},
     SimStatus::load_failed,
     "no-such-file.inc"},
    {"coupling to missing inductor",
     {"t", "V1 in 0 AC 1", "R1 in a 1k", "L1 a 0 1m", "K1 L1 L2 0.5", ".ac dec 10 1 1meg", ".end"},
     SimStatus::run_failed,
     "coupling to non-existant inductor l2"},
    {"no analysis",
     {"t", "V1 in 0 DC 1", "R1 in 0 1k", ".end"},
     SimStatus::run_failed,
     "No job (tran, ac, op etc.) defined"},
    // Refused before ngspice sees it: ngspice would silently drop the text after '\n'.
    {"line break in a card",
     {"t", "V1 in 0 AC 1\nR1 in 0 1k", ".ac dec 10 1 1meg", ".end"},
     SimStatus::load_failed,
     "card 2 contains a line break"},
};

TEST(SimFailure, EachClassGivesItsStatusAndTheNextDeckStillWorks) {
    for (const FailureCase& c : failure_cases) {
        SCOPED_TRACE(c.name);
        SimOutcome out = simulate(make_job(c.name, c.cards));
        EXPECT_EQ(to_string(out.status), std::string(to_string(c.status))) << out.message;
        EXPECT_NE(out.message.find(c.words), std::string::npos) << out.message;
        EXPECT_EQ(out.message.find("stderr "), std::string::npos) << out.message;
        if (out.status != SimStatus::run_failed) {
            EXPECT_TRUE(out.plots.empty());
        }
        EXPECT_TRUE(rc_is_correct(simulate(make_job("rc", rc_cards))));  // isolation
    }
    EXPECT_TRUE(no_children_left());
}

TEST(SimFailure, ChildKilledBySignalIsReportedAsCrash) {
    // The deck's .control block makes ngspice run a shell that sends SIGSEGV to the child.
    ScratchDir dir;
    dir.write("crash.sh", "kill -SEGV $PPID\n");
    SimJob job = make_job("crash.cir", {"t", "V1 in 0 AC 1", "R1 in 0 1k", ".ac dec 10 1 1meg",
                                        ".control", "shell exec sh crash.sh", ".endc", ".end"});
    job.work_dir = dir.path.string();
    SimOutcome out = simulate(job);
    EXPECT_EQ(out.status, SimStatus::crashed) << out.message;
    EXPECT_NE(out.message.find("signal 11"), std::string::npos) << out.message;
    EXPECT_NE(out.message.find("crash.cir"), std::string::npos) << out.message;
    EXPECT_TRUE(rc_is_correct(simulate(make_job("rc", rc_cards))));
}

TEST(SimFailure, HangingRunIsKilledAtTheDeadline) {
    // 10 s of a 1 kHz sine with a 1 ns step: far longer than the 300 ms allowed.
    auto begin = std::chrono::steady_clock::now();
    SimOutcome out = simulate(make_job("slow",
                                       {"slow transient", "V1 in 0 SIN(0 1 1k)", "R1 in out 1k",
                                        "C1 out 0 1u", ".tran 1n 10", ".end"},
                                       300ms));
    auto elapsed = std::chrono::steady_clock::now() - begin;
    EXPECT_EQ(out.status, SimStatus::timed_out) << out.message;
    EXPECT_LT(elapsed, 3s);
    EXPECT_GE(elapsed, 300ms);
    EXPECT_NE(out.message.find("300 ms"), std::string::npos) << out.message;
    EXPECT_TRUE(out.plots.empty());
    // The log streams while ngspice runs, so what it printed before the kill is kept.
    EXPECT_NE(std::find(out.log.begin(), out.log.end(), "Circuit: slow transient"), out.log.end());
    EXPECT_TRUE(no_children_left());
    EXPECT_TRUE(rc_is_correct(simulate(make_job("rc", rc_cards))));
}

// Dead: gone, or a zombie waiting for its new parent to reap it.
bool process_is_dead(pid_t pid) {
    std::ifstream stat("/proc/" + std::to_string(pid) + "/stat");
    std::string text((std::istreambuf_iterator<char>(stat)), std::istreambuf_iterator<char>());
    auto close_paren = text.rfind(')');
    return text.empty() ||
           (close_paren != std::string::npos && text.substr(close_paren + 2, 1) == "Z");
}

TEST(SimFailure, TimeoutAlsoStopsProgramsNgspiceStarted) {
    ScratchDir dir;
    dir.write("hang.sh", "echo $$ > hang.pid\nexec sleep 30\n");
    SimJob job = make_job("hang",
                          {"t", "V1 in 0 AC 1", "R1 in 0 1k", ".ac dec 10 1 1meg", ".control",
                           "shell sh hang.sh", ".endc", ".end"},
                          300ms);
    job.work_dir = dir.path.string();
    SimOutcome out = simulate(job);
    EXPECT_EQ(out.status, SimStatus::timed_out) << out.message;
    pid_t sleeper = 0;
    std::ifstream(dir.path / "hang.pid") >> sleeper;
    ASSERT_GT(sleeper, 0);
    bool dead = false;
    for (int i = 0; i < 100 && !dead; ++i) {
        dead = process_is_dead(sleeper);
        if (!dead) std::this_thread::sleep_for(10ms);
    }
    EXPECT_TRUE(dead) << "pid " << sleeper << " survived the timeout";
}

// ---- Environment: the deck's directory is used for .include, its .spiceinit is not run.
TEST(SimEnv, IncludeResolvesInWorkDirAndSpiceinitIsIgnored) {
    ScratchDir dir;
    dir.write(".spiceinit", "echo spiceinit-was-read\nset ngbehavior=lt\n");
    dir.write("parts.inc", "R1 in out 1k\nC1 out 0 159.155n\n");
    SimJob job = make_job("rc-include", {"RC low-pass", "V1 in 0 DC 0 AC 1", ".include parts.inc",
                                         ".ac dec 10 1 1meg", ".end"});
    job.work_dir = dir.path.string();
    SimOutcome out = simulate(job);
    EXPECT_TRUE(rc_is_correct(out));
    for (const std::string& line : out.log)
        EXPECT_EQ(line.find("spiceinit-was-read"), std::string::npos);

    job.work_dir = (dir.path / "missing").string();
    out = simulate(job);
    EXPECT_EQ(out.status, SimStatus::load_failed);
    EXPECT_NE(out.message.find("cannot enter directory"), std::string::npos) << out.message;
}

// ---- simulate_all: parallel children, outcomes in job order.
TEST(SimAll, TwoJobsSideBySideComeBackInJobOrder) {
    // The first job is the slower one, so the children finish in the opposite order.
    std::vector<SimJob> jobs = {
        make_job("chebyshev", ladder("Chebyshev 0.5 dB n=5", chebyshev_g, ".ac lin 2000 5k 10meg")),
        make_job("rc", rc_cards)};
    for (unsigned parallel : {2u, 1u, 0u}) {
        SCOPED_TRACE(parallel);
        std::vector<SimOutcome> outs = simulate_all(jobs, parallel);
        ASSERT_EQ(outs.size(), 2u);
        EXPECT_TRUE(ripple_is_half_db(outs[0]));
        EXPECT_TRUE(rc_is_correct(outs[1]));
    }
    EXPECT_TRUE(simulate_all({}, 2).empty());
    EXPECT_TRUE(no_children_left());
}

TEST(SimAll, FailuresStayWithTheirJob) {
    std::vector<SimJob> jobs = {make_job("rc", rc_cards), make_job("bad", failure_cases[1].cards),
                                make_job("rc", rc_cards)};
    std::vector<SimOutcome> outs = simulate_all(jobs, 2);
    ASSERT_EQ(outs.size(), 3u);
    EXPECT_TRUE(rc_is_correct(outs[0]));
    EXPECT_EQ(outs[1].status, SimStatus::controlled_exit);
    EXPECT_TRUE(rc_is_correct(outs[2]));
}

}  // namespace
}  // namespace deckscale
