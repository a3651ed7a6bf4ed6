// ngspice as referee of the code-model rules: each deck of netlists/codemodels/ (ported from
// the checks of the shared notes "codemodel-rules.md" §7) is scaled by the tool and run by
// ngspice 39 beside the original. With node voltages equal, branch currents divided by Km and
// time divided by Kf (notes §0): AC at f x Kf and DC sweeps point by point must agree to 1e-6;
// transients at t / Kf, relative to the vector's peak, to 1e-3, or to twice the noise of
// ngspice's own time-step control where the notes measured it larger (their "floor").
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <complex>
#include <cstdlib>
#include <functional>
#include <map>
#include <set>
#include <sstream>
#include <vector>

#include "scale/codemodel_rules.hpp"
#include "support/common.hpp"
#include "support/devhelp.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

constexpr double kKm = 7, kKf = 1000;

struct Vector {
    std::string name;
    double factor;  // the original value is this times the scaled one
};

struct Table {
    std::vector<std::vector<double>> rows;
};

// Runs `deck` with `analysis` (a dot card) in ngspice batch mode inside `dir` and reads back
// the vectors written by wrdata (scale, then re/im for AC or one value otherwise).
Table run_ngspice(const std::string& deck, const std::vector<Vector>& vectors,
                  const test::TempDir& dir, const std::string& name) {
    std::string body = deck;
    std::size_t end = body.rfind("\n.end");
    if (end != std::string::npos) body.resize(end + 1);
    body += ".control\nset wr_singlescale\noption numdgt=15\nrun\nwrdata " + name + ".txt";
    for (const auto& v : vectors) body += " " + v.name;
    body += "\nquit 0\n.endc\n.end\n";
    test::write_bytes(dir.file(name + ".cir"), body);
    // ngspice resolves data files against its working directory; its exit status is not read
    // (notes pitfall 13: it may be 1 after a good run), the output file is.
    std::string cmd = "cd " + test::shell_quote(dir.path().string()) + " && " + test::ngspice_batch() + name +
                      ".cir >" + name + ".log 2>&1";
    (void)std::system(cmd.c_str());
    Table t;
    std::istringstream in(test::read_bytes(dir.file(name + ".txt")));
    std::string line;
    while (std::getline(in, line)) {
        std::istringstream f(line);
        std::vector<double> row;
        double x;
        while (f >> x) row.push_back(x);
        if (!row.empty()) t.rows.push_back(row);
    }
    EXPECT_FALSE(t.rows.empty()) << test::read_bytes(dir.file(name + ".log"));
    return t;
}

// The worst error of vector v of the scaled run against the original, as described at the top.
double worst_error(const Table& a, const Table& b, const std::vector<Vector>& vectors, char kind,
                   std::size_t v) {
    double worst = 0;
    if (a.rows.empty() || b.rows.empty()) return INFINITY;
    double peak = 0;
    if (kind == 'a' || kind == 'd') {
        if (a.rows.size() != b.rows.size()) return INFINITY;
        std::size_t width = kind == 'a' ? 2 : 1;
        for (const auto& r : a.rows) peak = std::max(peak, std::abs(r[1 + width * v]));
        for (std::size_t r = 0; r < a.rows.size(); ++r) {
            double x = kind == 'a' ? b.rows[r][0] / kKf : b.rows[r][0];
            if (!test::close_to(x, a.rows[r][0], 1e-9)) return INFINITY;  // the sweep maps
            std::complex<double> u(a.rows[r][1 + width * v], width == 2 ? a.rows[r][2 + 2 * v] : 0);
            std::complex<double> w(b.rows[r][1 + width * v], width == 2 ? b.rows[r][2 + 2 * v] : 0);
            w *= vectors[v].factor;
            worst = std::max(worst, std::abs(u - w) / std::max(std::abs(u), 1e-9 * peak));
        }
        return worst;
    }
    for (const auto& r : a.rows) peak = std::max(peak, std::abs(r[1 + v]));
    if (peak == 0) peak = 1;
    for (const auto& r : a.rows) {
        double t = r[0] / kKf;  // the same instant of the scaled run
        auto it =
            std::lower_bound(b.rows.begin(), b.rows.end(), t,
                             [](const std::vector<double>& row, double x) { return row[0] < x; });
        double w;
        if (it == b.rows.begin()) {
            w = (*it)[1 + v];
        } else if (it == b.rows.end()) {
            w = b.rows.back()[1 + v];
        } else {
            const auto& p = *(it - 1);
            const auto& q = *it;
            double s = q[0] > p[0] ? (t - p[0]) / (q[0] - p[0]) : 0;
            w = p[1 + v] + (q[1 + v] - p[1 + v]) * s;
        }
        worst = std::max(worst, std::abs(r[1 + v] - vectors[v].factor * w) / peak);
    }
    return worst;
}

struct RefereeCase {
    int line;
    std::string deck;      // under netlists/codemodels/, or the text itself when it has '\n'
    std::string analysis;  // a dot card added before .end (the tool scales it too)
    std::vector<Vector> vectors;
    double tolerance;
};

std::vector<Vector> volts(std::initializer_list<const char*> names) {
    std::vector<Vector> v;
    for (auto n : names) v.push_back({n, 1});
    return v;
}

// Scales the case's deck, runs both and returns each vector's worst error. `mutate` may
// change the scaled text first (negative controls).
std::vector<double> errors(const RefereeCase& c, const std::map<std::string, std::string>& data,
                           const std::function<void(std::string&)>& mutate = {}) {
    std::string original =
        c.deck.find('\n') != std::string::npos
            ? c.deck
            : test::read_bytes(test::source_dir() + "/netlists/codemodels/" + c.deck);
    original.insert(original.rfind(".end"), c.analysis + "\n");
    auto s = test::scale_text(original, kKm, kKf, 15);  // a divide sits on its pole
    for (const auto& d : s.result.unscalable) ADD_FAILURE() << "unscalable: " << d.message;
    std::string scaled = s.text();
    if (mutate) mutate(scaled);
    test::TempDir dir;
    for (const auto& [name, text] : data) test::write_bytes(dir.file(name), text);
    Table a = run_ngspice(original, c.vectors, dir, "orig");
    Table b = run_ngspice(scaled, c.vectors, dir, "scaled");
    char kind = c.analysis[1];  // .ac, .dc, .tran
    std::vector<double> out;
    for (std::size_t v = 0; v < c.vectors.size(); ++v)
        out.push_back(worst_error(a, b, c.vectors, kind, v));
    return out;
}

void check(const RefereeCase& c, const std::map<std::string, std::string>& data = {}) {
    SCOPED_TRACE(testing::Message()
                 << "codemodel_ngspice_test.cpp:" << c.line << ": " << c.deck << " " << c.analysis);
    auto e = errors(c, data);
    for (std::size_t v = 0; v < c.vectors.size(); ++v)
        EXPECT_LE(e[v], c.tolerance) << c.vectors[v].name;
}

TEST(CodeModelNgspiceTest, RefereeDetectsAWrongFactor) {
    // Negative controls (notes §7 "mutant" checks): one value put back to its unscaled
    // spelling must show up as an error far above the tolerance.
    struct Row {
        int line;
        RefereeCase c;
        std::string from, to;
        std::size_t vector;
    };
    const Row rows[] = {
        {__LINE__,
         {__LINE__, "gain_ports.cir", ".ac dec 10 10 100k", volts({"v(o2)"}), 0},
         "gain=285.714285714286u",
         "gain=2m",
         0},
        {__LINE__,
         {__LINE__, "sxfer_norm.cir", ".ac dec 20 10 100k", volts({"v(o1)"}), 0},
         "denormalized_freq=6283185.307",
         "denormalized_freq=6283.185307",
         0},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "codemodel_ngspice_test.cpp:" << r.line);
        auto e = errors(r.c, {}, [&](std::string& text) {
            std::size_t at = text.find(r.from);
            ASSERT_NE(at, std::string::npos) << text;
            text.replace(at, r.from.size(), r.to);
        });
        EXPECT_GT(e[r.vector], 1e-2);
    }
}

TEST(CodeModelNgspiceTest, ScaledAnalogBlocksAgreeWithTheOriginals) {
    const Vector i_vm1{"i(vm1)", kKm}, i_vm3{"i(vm3)", kKm}, i_vsense{"i(vsense)", kKm};
    auto gain = volts({"v(o1)", "v(o2)", "v(o3)", "v(o4)", "v(o5)"});
    gain.insert(gain.end(), {i_vm1, i_vm3, i_vsense});
    const RefereeCase cases[] = {
        // gain v->v, v->i, i->v, i->i, vnam->vd (notes §7: 2.2e-15)
        {__LINE__, "gain_ports.cir", ".ac dec 10 10 100k", gain, 1e-6},
        // summer with v/i/vd inputs, mult, divide including its limit region (3.1e-15)
        {__LINE__, "summer_mult_div.cir", ".ac dec 10 10 100k",
         volts({"v(o1)", "v(o2)", "v(o3)", "v(o4)"}), 1e-6},
        {__LINE__, "summer_mult_div.cir", ".dc Vd -1.5 1.5 0.01",
         volts({"v(o4)", "v(o1)", "v(o3)"}), 1e-6},
        // s_xfer: denormalized_freq x Kf, int_ic x Fo Kf^(n-1-k), coefficients kept
        {__LINE__, "sxfer_norm.cir", ".ac dec 20 10 100k", volts({"v(o1)", "v(o2)"}), 1e-6},
        {__LINE__, "sxfer_norm.cir", ".tran 1u 5m 0 1u", volts({"v(o1)", "v(o2)"}), 1e-3},
        {__LINE__, "sxfer_coef.cir", ".ac dec 20 10 100k", volts({"v(o1)", "v(o2)"}), 1e-6},
        {__LINE__, "sxfer_coef.cir", ".tran 1u 5m 0 1u", volts({"v(o1)", "v(o2)"}), 1e-3},
        // int and d_dt inside and at their limits (1.2e-6)
        {__LINE__, "int_ddt.cir", ".ac dec 10 10 100k", volts({"v(o1)", "v(o2)", "v(o3)", "v(o4)"}),
         1e-6},
        {__LINE__, "int_ddt.cir", ".tran 1u 3m 0 1u", volts({"v(o1)", "v(o2)", "v(o3)", "v(o4)"}),
         1e-3},
        {__LINE__, "slew.cir", ".tran 1u 4m 0 1u", volts({"v(o1)", "v(o2)"}), 1e-3},
        // limit (absolute and relative limit_range), climit, pwl, hyst (1.3e-8)
        {__LINE__, "limit_pwl.cir", ".dc Vx -2 2 0.01",
         volts({"v(o1)", "v(o2)", "v(o3)", "v(o4)", "v(o5)", "v(o6)", "v(o7)"}), 1e-6},
        {__LINE__,
         "aswitch.cir",
         ".tran 1u 4m 0 1u",
         {{"v(o1)", 1}, {"v(o2)", 1}, {"i(vdd)", kKm}},
         1e-3},
        {__LINE__, "oscillators.cir", ".tran 1u 2m 0 1u", volts({"v(o1)", "v(o2)", "v(o3)"}), 1e-3},
        {__LINE__,
         "pswitch.cir",
         ".tran 1u 2m 0 1u",
         {{"v(o)", 1}, {"v(cn)", 1}, {"i(vdd)", kKm}, {"i(vc)", kKm}},
         1e-3},
        // int held at its limits: the state is clamped every iteration, so the plateau
        // follows the time grid; the notes measured ngspice's own floor at 6.7e-3 here.
        {__LINE__, "int_limit.cir", ".tran 1u 3m 0 1u", volts({"v(o1)", "v(o2)"}), 1.34e-2},
        {__LINE__, "analog_misc.cir", ".tran 1u 3m 0 1u",
         volts({"v(od1)", "v(od2)", "v(opw)", "v(omp)"}), 1e-3},
        // capacitoric, inductoric, zener, sidiode, potentiometer, ilimit, memristor: sharp
        // corners on time grids that drift apart; the notes measured ngspice's own floor at
        // 3.6e-3 for this deck (twice that is the bound).
        {__LINE__,
         "xtradev_misc.cir",
         ".tran 1u 3m 0 1u",
         {{"v(r2)", 1},
          {"i(vd)", kKm},
          {"v(z)", 1},
          {"v(sd)", 1},
          {"v(w)", 1},
          {"i(vp)", kKm},
          {"v(oil)", 1},
          {"i(vpos)", kKm},
          {"i(vneg)", kKm},
          {"i(vm)", kKm}},
         7.2e-3},
        // lcouple + core: the flux is the current of the mmf loop, scaled by 1/(Km Kf) (§5)
        {__LINE__,
         "magnetic.cir",
         ".tran 1u 3m 0 1u",
         {{"v(p)", 1},
          {"v(s)", 1},
          {"i(vs)", kKm},
          {"v(m1)", 1},
          {"v(m2)", 1},
          {"i(vflux)", kKm * kKf},
          {"v(p2)", 1},
          {"v(s2)", 1},
          {"v(n1)", 1},
          {"i(vflux2)", kKm * kKf}},
         1e-3},
    };
    for (const auto& c : cases) check(c);
}

TEST(CodeModelNgspiceTest, ScaledDigitalAndFileDrivenBlocksAgree) {
    // adc_bridge -> d_inverter -> d_dff clocked by d_osc -> dac_bridge with v and i outputs
    check({__LINE__, "digital_chain.cir", ".tran 0.2u 2m 0 0.2u",
           volts({"v(aout1)", "v(aout2)", "v(ad2)", "v(aclk)"}), 1e-3});
    // d_pwm, d_fdiv and a real path ending in a current: the real values take 1/Km (§4)
    check({__LINE__, "digital_real.cir", ".tran 0.2u 2m 0 0.2u",
           volts({"v(oi)", "v(apw)", "v(apwd)"}), 1e-3});
    // filesource: the file stays, timescale/timeoffset and the amplitudes are rewritten
    const std::string data =
        "# time ch1 ch2\n0 0.0 0.0\n0.1 0.5 0.2\n0.2 1.0 0.8\n0.4 -0.5 1.0\n"
        "0.6 0.3 -0.4\n0.9 0.0 0.6\n1.2 0.7 0.1\n1.5 0.0 0.0\n";
    check({__LINE__, "filesource.cir", ".tran 1u 3.2m 0 1u", volts({"v(o1)", "v(o2)", "v(o3)"}),
           1e-3},
          {{"fsrc_data.txt", data}});
}

TEST(CodeModelNgspiceTest, ScaledOneshotAgrees) {
    // oneshot: v clock, v control, v clear, i out; pw_array and all delays in s.
    const std::string deck =
        "pulse stretcher\n.options reltol=1e-6 abstol=1e-12 chgtol=1e-14\n"
        "Vc c 0 dc 0 pwl(0 0 2m 1)\nVclk clk 0 dc 0 pulse(0 1 0.1m 1u 1u 50u 0.5m)\nVclr clr 0 dc "
        "0\n"
        "a4 %v(clk) %v(c) %v(clr) %i(o4) os1\n"
        ".model os1 oneshot(cntl_array=[0 1] pw_array=[50u 150u] clk_trig=0.5 pos_edge_trig=true\n"
        "+ out_low=0 out_high=1m rise_time=5u fall_time=5u rise_delay=2u fall_delay=3u "
        "retrig=false)\n"
        "R4 o4 0 1k\n.end\n";
    check({__LINE__, deck, ".tran 1u 2m 0 1u", volts({"v(o4)"}), 1e-3});
}

TEST(CodeModelNgspiceTest, ModelCopiesForOtherPortTypesAgree) {
    // One gain model used v->v, v->i and i->v: the tool writes a copy per signature.
    const std::string deck =
        "shared model\n.options reltol=1e-9 abstol=1e-12 chgtol=1e-14\n"
        "Vin in 0 dc 0.3 ac 1\nIin 0 ni dc 0.5m ac 1m\n"
        "a1 %v(in) %v(o1) g\na2 %v(in) %i(o2) g\na3 %i(ni) %v(o3) g\n"
        ".model g gain(in_offset=0.1 gain=2.5 out_offset=-0.2)\n"
        "R1 o1 0 1k\nR2 o2 0 1k\nC2 o2 0 100n\nR3 o3 0 1k\n.end\n";
    check({__LINE__, deck, ".ac dec 10 10 100k", volts({"v(o1)", "v(o2)", "v(o3)"}), 1e-6});
}

TEST(CodeModelNgspiceTest, DefaultsWrittenOutKeepTheResponse) {
    // Every unit-bearing value left to its default: the tool must write it out scaled.
    const std::string deck =
        "defaults\n.options reltol=1e-6 abstol=1e-12 chgtol=1e-14\n"
        "Vin in 0 dc 0 ac 1 pulse(0 1 0.5 10m 10m 8 16)\nIh 0 nh dc 0 pulse(0 2 2 0.5 0.5 5 12)\n"
        "a1 %v(in) %i(o1) lp\n.model lp s_xfer(num_coeff=[1] den_coeff=[1 1.414 1] int_ic=[0 0])\n"
        "R1 o1 0 1\n"
        "a2 %v(in) %i(o2) g\n.model g gain(in_offset=0.1)\nR2 o2 0 1k\n"
        "a3 %v(in) %i(o3) lm\n.model lm limit(gain=3m out_lower_limit=-1m out_upper_limit=1m)\n"
        "R3 o3 0 1k\n"
        "a4 %i(nh) %v(o4) h\n.model h hyst(in_low=0.1m)\nR4 o4 0 1k\n"
        ".end\n";
    check({__LINE__, deck, ".ac dec 20 0.01 10", volts({"v(o1)", "v(o2)", "v(o3)"}), 1e-6});
    check({__LINE__, deck, ".tran 1m 20 0 1m", volts({"v(o1)", "v(o2)", "v(o3)", "v(o4)"}), 1e-3});
}

// ngspice as referee: `devhelp <model>` lists the parameters ngspice 39 knows for each code
// model; the table must hold exactly those (a missing one would be refused as unknown, an
// extra one would let a misspelling through).
TEST(CodeModelNgspiceTest, RuleTableHoldsExactlyTheParametersNgspiceKnows) {
    std::vector<std::string> types;
    for (const auto& t : code_model_types()) types.emplace_back(t.type);
    // "<model> - <description>", then "Model Parameters", a header and "  <id> <name> ..." rows.
    std::istringstream in(test::devhelp_listing(types));
    std::set<std::pair<std::string, std::string>> listed;
    std::string line, model;
    bool params = false;
    while (std::getline(in, line)) {
        std::istringstream f(line);
        std::string first, second;
        f >> first >> second;
        if (second == "-" && find_code_model(first)) model = first;
        if (line.rfind("Model Parameters", 0) == 0) params = true;
        if (line.rfind("Instance Parameters", 0) == 0) params = false;
        if (params && !first.empty() && std::isdigit(static_cast<unsigned char>(first[0])))
            listed.insert({model, second});
    }
    std::set<std::pair<std::string, std::string>> table;
    for (const auto& r : code_model_params())
        table.insert({std::string(r.type), std::string(r.name)});
    EXPECT_EQ(listed.size(), 367u);
    for (const auto& p : listed)
        EXPECT_TRUE(table.count(p)) << "ngspice has " << p.first << " " << p.second;
    for (const auto& p : table)
        EXPECT_TRUE(listed.count(p)) << "ngspice lacks " << p.first << " " << p.second;
}

}  // namespace
}  // namespace deckscale
