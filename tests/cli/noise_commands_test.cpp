// `scale` and `verify` on decks with a noise analysis, through the real binary: the noise
// line of the change report, the noise comparison of verify (text and JSON), the flicker
// flag and --follow-flicker. Decks are the invented ones under netlists/noise/ and
// netlists/devices/ (those with junction devices).
#include <string>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "support/common.hpp"

namespace deckscale {
namespace {

using test::read_bytes;
using test::run_binary;
using test::RunResult;
using test::TempDir;
using test::write_bytes;

std::string noise_deck(const std::string& name) {
    return test::source_dir() + "/netlists/noise/" + name;
}
std::string device_deck(const std::string& name) {
    return test::source_dir() + "/netlists/devices/" + name;
}

RunResult scale(const TempDir& dir, const std::string& deck, std::vector<std::string> extra = {}) {
    std::vector<std::string> args{"scale", deck, "--km", "10", "--kf", "1k", "-o", "s.cir"};
    args.insert(args.end(), extra.begin(), extra.end());
    RunResult r = run_binary(args, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.err;
    return r;
}

TEST(NoiseCommands, ScaleStatesTheNoiseConsequence) {
    TempDir dir;
    RunResult r = scale(dir, noise_deck("rc_ladder.cir"), {"--changes-json", "c.json"});
    EXPECT_NE(r.err.find("deckscale: noise (thermal, shot): Km = 10: output noise density x3.16 "
                         "(+10 dB) at Kf f; integrated output noise x100 (+40 dB) over the Kf = "
                         "1000 times wider band\n"),
              std::string::npos)
        << r.err;
    auto j = nlohmann::json::parse(read_bytes(dir.file("c.json")));
    EXPECT_DOUBLE_EQ(j["noise"]["integrated_factor"].get<double>(), 100);
    EXPECT_TRUE(j["noise"]["flicker_not_following"].empty());
}

TEST(NoiseCommands, VerifyComparesNoisePerVectorInTextAndJson) {
    TempDir dir;
    scale(dir, noise_deck("rc_ladder.cir"));
    RunResult v = run_binary({"verify", noise_deck("rc_ladder.cir"), "s.cir", "--json", "r.json"},
                             dir.path());
    EXPECT_EQ(v.exit_code, 0) << v.out << v.err;
    // With points per summary (5 here) ngspice 39 keeps every 5th of the 141 points.
    EXPECT_NE(v.out.find("  Noise: 29 points, 1 Hz .. 1e+07 Hz of the original, 40 vectors\n"),
              std::string::npos)
        << v.out;
    EXPECT_NE(v.out.find("    compared as: noise density x sqrt(Km) = x3.16228 at Kf f, integrated "
                         "noise x sqrt(Km Kf) = x100\n"),
              std::string::npos)
        << v.out;
    EXPECT_NE(v.out.find("\nPASS: "), std::string::npos) << v.out;
    auto j = nlohmann::json::parse(read_bytes(dir.file("r.json")));
    const nlohmann::json* noise = nullptr;
    for (const auto& a : j["analyses"])
        if (a["analysis"] == "noise") noise = &a;
    ASSERT_TRUE(noise);
    EXPECT_TRUE((*noise)["passed"].get<bool>());
    EXPECT_TRUE((*noise)["expected_to_match"].get<bool>());
    EXPECT_EQ((*noise)["vectors"].size(), 40u);
    bool density = false, total = false;
    for (const auto& x : (*noise)["vectors"]) {
        EXPECT_LE(x["worst"].get<double>(), 1e-6) << x["name"];
        if (x["name"] == "onoise_spectrum") density = x["kind"] == "voltage density";
        if (x["name"] == "onoise_total") total = x["kind"] == "voltage";
    }
    EXPECT_TRUE(density && total);
}

// The deck has no AC analysis and its operating point is 0 V everywhere: only the noise can
// tell a wrong resistor, and it must.
TEST(NoiseCommands, AResistorOffByOnePercentFailsTheNoiseComparison) {
    TempDir dir;
    scale(dir, noise_deck("rc_ladder.cir"));
    std::string text = read_bytes(dir.file("s.cir"));
    auto at = text.find("R2 n1 n2 47k");
    ASSERT_NE(at, std::string::npos) << text;
    text.replace(at, 12, "R2 n1 n2 47.47k");
    write_bytes(dir.file("s.cir"), text);
    RunResult v = run_binary(
        {"verify", noise_deck("rc_ladder.cir"), "s.cir", "--km", "10", "--kf", "1k"}, dir.path());
    EXPECT_EQ(v.exit_code, 1) << v.out << v.err;
    EXPECT_NE(v.out.find("onoise_r2"), std::string::npos) << v.out;
    EXPECT_NE(v.out.find("FAIL: "), std::string::npos) << v.out;
}

TEST(NoiseCommands, FlickerIsFlaggedUnlessFollowFlickerRewritesIt) {
    TempDir dir;
    RunResult s = scale(dir, device_deck("diode_flicker.cir"));
    EXPECT_NE(s.err.find("; flicker (1/f) noise of dclamp ("), std::string::npos) << s.err;
    RunResult v = run_binary(
        {"verify", device_deck("diode_flicker.cir"), "s.cir", "--json", "r.json"}, dir.path());
    // The noise differs as it must; it does not decide the outcome, the operating point does.
    EXPECT_EQ(v.exit_code, 0) << v.out << v.err;
    EXPECT_NE(v.out.find("    not expected to match: model 'dclamp' ("), std::string::npos)
        << v.out;
    EXPECT_NE(
        v.out.find("its flicker noise (KF = 1e-14, AF = 1.3) does not follow: KF would have to "
                   "be x1000 (deckscale scale --follow-flicker writes that)"),
        std::string::npos)
        << v.out;
    EXPECT_NE(v.out.find("differs"), std::string::npos) << v.out;
    EXPECT_NE(v.out.find("not judged: flicker noise does not follow"), std::string::npos) << v.out;
    auto j = nlohmann::json::parse(read_bytes(dir.file("r.json")));
    for (const auto& a : j["analyses"])
        if (a["analysis"] == "noise") {
            EXPECT_FALSE(a["expected_to_match"].get<bool>());
            EXPECT_FALSE(a["passed"].get<bool>());
        }

    s = scale(dir, device_deck("diode_flicker.cir"), {"--follow-flicker"});
    EXPECT_NE(s.err.find("; flicker noise follows too: KF rewritten in dclamp ("),
              std::string::npos)
        << s.err;
    EXPECT_NE(read_bytes(dir.file("s.cir")).find("kf=1e-11 af=1.3"), std::string::npos);
    v = run_binary({"verify", device_deck("diode_flicker.cir"), "s.cir"}, dir.path());
    EXPECT_EQ(v.exit_code, 0) << v.out << v.err;
    EXPECT_EQ(v.out.find("not expected to match"), std::string::npos) << v.out;
    EXPECT_NE(v.out.find("  Noise: 81 points"), std::string::npos) << v.out;
    EXPECT_NE(v.out.find("\nPASS: "), std::string::npos) << v.out;
}

// A noise command in .control with a current-source input that has no AC value: ngspice 39
// refuses that ("Noise input source i1 has no AC value"), so verify gives it one (its size
// does not enter noise results); the input-referred noise is A/sqrt(Hz), divided by sqrt(Km).
TEST(NoiseCommands, ControlNoiseWithACurrentInputIsCompared) {
    TempDir dir;
    write_bytes(dir.file("i.cir"),
                "current-driven RC\nI1 0 in DC 0\nR0 in 0 1k\nR1 in out 2k\nC1 out 0 10n\n"
                ".control\nnoise v(out) I1 dec 10 10 1meg\nrun\n.endc\n.end\n");
    RunResult s =
        run_binary({"scale", "i.cir", "--km", "100", "--kf", "10", "-o", "s.cir"}, dir.path());
    ASSERT_EQ(s.exit_code, 0) << s.err;
    RunResult v = run_binary({"verify", "i.cir", "s.cir", "--json", "r.json"}, dir.path());
    EXPECT_EQ(v.exit_code, 0) << v.out << v.err;
    auto j = nlohmann::json::parse(read_bytes(dir.file("r.json")));
    bool seen = false;
    for (const auto& a : j["analyses"])
        if (a["analysis"] == "noise")
            for (const auto& x : a["vectors"])
                if (x["name"] == "inoise_spectrum") {
                    seen = true;
                    EXPECT_EQ(x["kind"], "current density");
                    EXPECT_LE(x["worst"].get<double>(), 1e-6);
                }
    EXPECT_TRUE(seen) << v.out;
}

}  // namespace
}  // namespace deckscale
