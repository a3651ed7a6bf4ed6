// End-to-end tests of held parts (scale --hold, then verify) through the real binary, on the
// invented decks of netlists/held/. The deviation verify reports is checked against ngspice
// run as an independent referee on both decks; the ideal-buffer filter against the
// Sallen-Key formulas for the corner and Q.
#include <gtest/gtest.h>

#include <cmath>
#include <complex>
#include <nlohmann/json.hpp>
#include <numbers>
#include <sstream>

#include "support/common.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

using test::read_bytes;
using test::run_binary;
using test::RunResult;
using test::TempDir;
using test::write_bytes;

std::string held_deck(const std::string& name) {
    return test::source_dir() + "/netlists/held/" + name;
}

// The AC vector `name` of a verify JSON report.
nlohmann::json ac_vector(const nlohmann::json& report, const std::string& name) {
    for (const auto& a : report["analyses"])
        if (a["analysis"] == "ac")
            for (const auto& v : a["vectors"])
                if (v["name"] == name) return v;
    ADD_FAILURE() << "no AC vector " << name;
    return {};
}

// A referee run: the deck's own analyses, output cards and .end replaced by one `ac` command
// whose v(out) is written with wrdata (frequency, real, imaginary per row). The op-amp's
// bias point is found to reltol 1e-7, as verify asks for decks with junctions.
std::vector<std::pair<double, std::complex<double>>> referee_ac(const std::string& deck,
                                                                const std::string& ac,
                                                                const TempDir& dir,
                                                                const std::string& name) {
    std::istringstream in(read_bytes(deck));
    std::string body, line;
    while (std::getline(in, line)) {
        if (line.rfind(".ac", 0) == 0 || line.rfind(".op", 0) == 0 || line == ".end") continue;
        body += line + "\n";
    }
    std::string data = dir.file(name + ".txt");
    body += ".options reltol=1e-7\n.control\nset wr_singlescale\n" + ac + "\nwrdata " + data +
            " v(out)\nquit 0\n.endc\n.end\n";
    write_bytes(dir.file(name + ".cir"), body);
    std::string cmd = "cd " + test::shell_quote(dir.path().string()) + " && " +
                      test::ngspice_batch() + test::shell_quote(dir.file(name + ".cir")) + " >" +
                      test::shell_quote(dir.file(name + ".log")) + " 2>&1";
    EXPECT_EQ(std::system(cmd.c_str()), 0) << read_bytes(dir.file(name + ".log"));
    std::vector<std::pair<double, std::complex<double>>> rows;
    std::istringstream rows_in(read_bytes(data));
    for (double f, re, im; rows_in >> f >> re >> im;) rows.push_back({f, {re, im}});
    return rows;
}

// The unity-gain Sallen-Key low-pass around the invented bipolar op-amp macromodel, moved
// down 100 times in frequency with the op-amp held: the response moves because the op-amp's
// gain-bandwidth does not. The largest |dB| and |deg| verify reports for v(out), and where,
// must be what two independent ngspice runs of the decks give (ngspice 39 as referee).
TEST(HoldCommand, SallenKeyDeviationMatchesTheReferee) {
    TempDir dir;
    std::string original = held_deck("sallen_key_opamp.cir");
    RunResult s = run_binary(
        {"scale", original, "--km", "1", "--kf", "0.01", "--hold", "XU1", "-o", "sk.cir"},
        dir.path());
    ASSERT_EQ(s.exit_code, 0) << s.err;
    EXPECT_NE(s.err.find("XU1  held (instance): asked: --hold XU1"), std::string::npos) << s.err;
    EXPECT_NE(s.err.find("Held parts were not rescaled"), std::string::npos) << s.err;
    EXPECT_NE(s.err.find("local codes and licensed practice govern"), std::string::npos);
    RunResult v = run_binary({"verify", original, "sk.cir", "--json", "v.json"}, dir.path());
    ASSERT_EQ(v.exit_code, 0) << v.out << v.err;
    EXPECT_NE(v.out.find("\nINFO: with held parts"), std::string::npos) << v.out;
    EXPECT_NE(v.out.find("this is information, not a verdict (exit 0)"), std::string::npos);
    auto report = nlohmann::json::parse(read_bytes(dir.file("v.json")));
    EXPECT_EQ(report["held"], nlohmann::json::array({"XU1"}));
    auto out = ac_vector(report, "out");

    auto a = referee_ac(original, "ac dec 20 1k 1meg", dir, "original");
    auto b = referee_ac(dir.file("sk.cir"), "ac dec 20 10 10k", dir, "scaled");
    ASSERT_EQ(a.size(), 61u);
    ASSERT_EQ(b.size(), a.size());
    double peak = 0;
    for (const auto& [f, x] : a) peak = std::max(peak, std::abs(x));
    double max_db = 0, db_at = 0, max_deg = 0, deg_at = 0;
    for (std::size_t k = 0; k < a.size(); ++k) {
        ASSERT_TRUE(test::close_to(b[k].first, a[k].first * 0.01, 1e-9));
        std::complex<double> x = a[k].second, y = b[k].second;
        if (std::abs(x) <= 1e-3 * peak) continue;  // the rule verify states in its report
        double db = std::fabs(20 * std::log10(std::abs(y) / std::abs(x)));
        double deg = std::fabs(std::remainder(std::arg(y / x) * 180 / std::numbers::pi, 360.0));
        if (db > max_db) max_db = db, db_at = b[k].first;
        if (deg > max_deg) max_deg = deg, deg_at = b[k].first;
    }
    // Measured: the held op-amp moves v(out) by 1.33 dB and 35 degrees near the old band's
    // top (its gain-bandwidth was only 20 times the original corner).
    EXPECT_GT(max_db, 0.1);
    EXPECT_NEAR(out["max_db"].get<double>(), max_db, 1e-4);
    EXPECT_NEAR(out["max_deg"].get<double>(), max_deg, 1e-3);
    EXPECT_TRUE(test::close_to(out["max_db_at"].get<double>() * 0.01, db_at, 1e-9));
    EXPECT_TRUE(test::close_to(out["max_deg_at"].get<double>() * 0.01, deg_at, 1e-9));

    // Judged against tolerances when they are given.
    RunResult tight =
        run_binary({"verify", original, "sk.cir", "--tolerance-db", "0.1"}, dir.path());
    EXPECT_EQ(tight.exit_code, 1) << tight.out;
    EXPECT_NE(tight.out.find("\nFAIL: the held parts moved the response by up to "),
              std::string::npos)
        << tight.out;
    RunResult loose =
        run_binary({"verify", original, "sk.cir", "--tolerance-db", "50", "--tolerance-deg", "90"},
                   dir.path());
    EXPECT_EQ(loose.exit_code, 0) << loose.out;
    EXPECT_NE(loose.out.find("within --tolerance-db 50 and --tolerance-deg 90\n"),
              std::string::npos)
        << loose.out;
}

// The same filter around an ideal buffer (E, gain 1): held or not, it follows any scaling,
// so the corner and Q worked out from the rewritten values are the targets (Sallen & Key,
// IRE Trans. Circuit Theory CT-2, 1955: w0 = 1/sqrt(R1 R2 C1 C2), Q = sqrt(R1 R2 C1 C2) /
// (C2 (R1 + R2)) at unity gain) and verify finds no deviation.
TEST(HoldCommand, IdealBufferKeepsCornerAndQ) {
    TempDir dir;
    std::string original = held_deck("sallen_key_ideal.cir");
    RunResult s = run_binary({"scale", original, "--km", "10", "--kf", "0.01", "--hold", "E1",
                              "--digits", "12", "-o", "ideal.cir"},
                             dir.path());
    ASSERT_EQ(s.exit_code, 0) << s.err;
    EXPECT_EQ(s.err.find("meets scaled parts"), std::string::npos) << s.err;  // E: an ideal output
    auto values = [](const std::string& text) {
        std::map<std::string, double> v;
        std::istringstream in(text);
        for (std::string line; std::getline(in, line);) {
            std::istringstream f(line);
            std::string name, a, b, value;
            if (f >> name >> a >> b >> value && (name[0] == 'R' || name[0] == 'C'))
                v[name] = test::number_value(value);
        }
        return v;
    };
    auto o = values(read_bytes(original)), n = values(read_bytes(dir.file("ideal.cir")));
    auto w0 = [](std::map<std::string, double>& v) {
        return 1 / std::sqrt(v["R1"] * v["R2"] * v["C1"] * v["C2"]);
    };
    auto q = [](std::map<std::string, double>& v) {
        return std::sqrt(v["R1"] * v["R2"] * v["C1"] * v["C2"]) / (v["C2"] * (v["R1"] + v["R2"]));
    };
    EXPECT_TRUE(test::close_to(w0(n), 0.01 * w0(o), 1e-11)) << w0(o) << " " << w0(n);
    EXPECT_TRUE(test::close_to(q(n), q(o), 1e-11)) << q(o) << " " << q(n);
    EXPECT_TRUE(test::close_to(w0(o) / (2 * std::numbers::pi), 102308, 1e-5));  // 102.3 kHz
    EXPECT_TRUE(test::close_to(q(o), std::sqrt(2.0) / 2, 1e-12));
    RunResult v =
        run_binary({"verify", original, "ideal.cir", "--tolerance-db", "1e-6", "--json", "v.json"},
                   dir.path());
    EXPECT_EQ(v.exit_code, 0) << v.out;
    auto out = ac_vector(nlohmann::json::parse(read_bytes(dir.file("v.json"))), "out");
    EXPECT_LT(out["max_db"].get<double>(), 1e-6);
    EXPECT_LT(out["max_deg"].get<double>(), 1e-5);
}

// BSIM3 cannot follow a frequency change: refused with its reason; with Kf = 1 it scales
// exactly by m and verifies; held, the deck is written and verify reports the deviation.
TEST(HoldCommand, BsimStageRefusedScaledByMOrHeld) {
    TempDir dir;
    std::string original = held_deck("bsim_cs_amp.cir");
    RunResult refused =
        run_binary({"scale", original, "--km", "1", "--kf", "1000", "-o", "x.cir"}, dir.path());
    EXPECT_EQ(refused.exit_code, 4);
    EXPECT_NE(refused.err.find("MOSFET 'M1' uses model 'nb3' (level 8, BSIM3): its intrinsic "
                               "charge and its DC current both come from the oxide capacitance"),
              std::string::npos)
        << refused.err;
    EXPECT_NE(refused.err.find("--hold keeps a part"), std::string::npos) << refused.err;
    EXPECT_FALSE(std::filesystem::exists(dir.file("x.cir")));

    RunResult by_m = run_binary(
        {"scale", original, "--km", "10", "--kf", "1", "-o", "m.cir", "--verify"}, dir.path());
    EXPECT_EQ(by_m.exit_code, 0) << by_m.out << by_m.err;
    EXPECT_NE(read_bytes(dir.file("m.cir")).find("ps=12u m=0.1\n"), std::string::npos);
    EXPECT_NE(by_m.out.find("\nPASS: "), std::string::npos) << by_m.out;

    RunResult held = run_binary({"scale", original, "--km", "1", "--kf", "1000", "--hold",
                                 "model:nb3", "-o", "h.cir", "--changes"},
                                dir.path());
    ASSERT_EQ(held.exit_code, 0) << held.err;
    EXPECT_NE(held.out.find("nb3  held (model): asked: --hold model:nb3; every instance (M1)\n"
                            "    could not have followed anyway: "),
              std::string::npos)
        << held.out;
    RunResult v = run_binary({"verify", original, "h.cir", "--json", "v.json"}, dir.path());
    EXPECT_EQ(v.exit_code, 0) << v.out << v.err;
    auto out = ac_vector(nlohmann::json::parse(read_bytes(dir.file("v.json"))), "out");
    // The held transistor's capacitances do not move down with the rest: the stage's upper
    // roll-off stays where it was, a finite, clearly visible deviation.
    double db = out["max_db"].get<double>();
    EXPECT_TRUE(std::isfinite(db));
    EXPECT_GT(db, 0.5);
    EXPECT_TRUE(std::isfinite(out["max_deg"].get<double>()));
}

TEST(HoldCommand, UnknownNamesAndBoundaries) {
    TempDir dir;
    std::string original = held_deck("sallen_key_opamp.cir");
    RunResult r = run_binary(
        {"scale", original, "--km", "10", "--kf", "1", "--hold", "XU9,Q1", "-o", "o.cir"},
        dir.path());
    EXPECT_EQ(r.exit_code, 2);
    EXPECT_EQ(r.err, original + ": error: --hold names what " + original +
                         " does not have: 'XU9' (nothing of that name), 'Q1' (Q1 is inside "
                         ".subckt bipamp at " +
                         original + ":14: hold an X line that uses it, or subckt:bipamp)\n");
    EXPECT_FALSE(std::filesystem::exists(dir.file("o.cir")));
    RunResult bad = run_binary({"scale", original, "--hold", "chip:U1"}, dir.path());
    EXPECT_EQ(bad.exit_code, 2);

    // At Km = 10 the held op-amp's pins meet scaled resistors and capacitors.
    RunResult b = run_binary(
        {"scale", original, "--km", "10", "--kf", "1", "--hold", "XU1", "-o", "b.cir"}, dir.path());
    EXPECT_EQ(b.exit_code, 0) << b.err;
    EXPECT_NE(b.err.find("warning: held part 'XU1' meets scaled parts at node 'n2' (R2, C2), "
                         "node 'out' (C1): their impedance changed by Km = 10"),
              std::string::npos)
        << b.err;
}

// A suite case scales with held parts and verify judges the deviation by its tolerances.
TEST(HoldCommand, BatchCasesHoldParts) {
    TempDir dir;
    write_bytes(dir.file("sk.cir"), read_bytes(held_deck("sallen_key_opamp.cir")));
    write_bytes(dir.file("s.toml"),
                "[[case]]\nname = \"info\"\ndeck = \"sk.cir\"\nkm = 1\nkf = 0.01\nhold = \"XU1\"\n"
                "[[case]]\nname = \"judged\"\ndeck = \"sk.cir\"\nkm = 1\nkf = 0.01\n"
                "hold = [\"XU1\"]\ntolerance = { db = 0.1 }\nexpect = \"fail\"\n");
    RunResult r = run_binary({"batch", "s.toml", "--json", "b.json"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    auto j = nlohmann::json::parse(read_bytes(dir.file("b.json")));
    std::string text = j.dump();
    EXPECT_NE(text.find("held parts moved it by up to 1.33 dB"), std::string::npos) << text;
}

}  // namespace
}  // namespace deckscale
