// End-to-end tests of `deckscale yield` and `deckscale stress` through the real binary.
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

const char* kLowPass =
    "rc low-pass\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 159.155n\n"
    ".ac dec 20 10 100k\n.end\n";

TEST(YieldCommand, WritesTheReportJsonAndBothPlots) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kLowPass);
    RunResult r =
        run_binary({"yield", "rc.cir", "--trials", "60", "--seed", "5", "--tolerance", "R=1%,C=2%",
                    "--mask", "0.5dB", "--json", "y.json", "--plot", "y.svg"},
                   dir.path());
    ASSERT_EQ(r.exit_code, 0) << r.err;
    EXPECT_NE(r.out.find("60 trials, seed 5, uniform spread; 2 of 2 parts varied; output out;"),
              std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("95 % Wilson score interval"), std::string::npos) << r.out;
    EXPECT_NE(r.err.find("deckscale: caution:"), std::string::npos) << r.err;
    // Standard error is no terminal here: no progress line.
    EXPECT_EQ(r.err.find("trials, yield so far"), std::string::npos) << r.err;
    auto j = nlohmann::json::parse(read_bytes(dir.file("y.json")));
    EXPECT_EQ(j["seed"], 5);
    EXPECT_EQ(j["per_trial"].size(), 60u);
    EXPECT_EQ(j["interval"]["method"], "Wilson score");
    EXPECT_EQ(j["parts"].size(), 2u);
    for (const char* f : {"y.svg", "y-histogram.svg", "y.dat", "y.gp", "y-histogram.dat"}) {
        std::string text = read_bytes(dir.file(f));
        EXPECT_FALSE(text.empty()) << f;
        if (std::string(f).ends_with(".svg")) {
            EXPECT_NE(text.find("<svg"), std::string::npos) << f;
        }
    }
}

TEST(YieldCommand, UsageErrorsNameTheOption) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kLowPass);
    write_bytes(dir.file("bad.txt"), "1k 0\n");
    struct Case {
        int line;
        std::vector<std::string> args;
        const char* err;
    };
    const Case cases[] = {
        {__LINE__,
         {"--mask", "wide"},
         "deckscale: error: --mask 'wide': give the window in dB, e.g. 0.5dB\n"},
        {__LINE__,
         {"--tolerance", "Q=1%"},
         "deckscale: error: --tolerance 'Q=1%': a kind is R, C or L\n"},
        {__LINE__,
         {"--mask-file", "bad.txt"},
         "deckscale: error: bad.txt:1: a mask row is: frequency min_dB max_dB\n"},
        {__LINE__,
         {"--corner", "2k:1k"},
         "deckscale: error: --corner '2k:1k' is not F1:F2 with 0 <= F1 < F2\n"},
    };
    for (const Case& c : cases) {
        std::vector<std::string> args{"yield", "rc.cir"};
        args.insert(args.end(), c.args.begin(), c.args.end());
        RunResult r = run_binary(args, dir.path());
        EXPECT_EQ(r.exit_code, 2) << c.line;
        EXPECT_EQ(r.err, c.err) << c.line;
        EXPECT_EQ(r.out, "") << c.line;
    }
}

TEST(YieldCommand, TheJudgedNodeIsNamedByNodeOrByItsOlderNameOutput) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kLowPass);
    for (const char* option : {"--node", "--output"}) {
        RunResult r = run_binary({"yield", "rc.cir", "--trials", "5", option, "in"}, dir.path());
        ASSERT_EQ(r.exit_code, 0) << option << r.err;
        EXPECT_NE(r.out.find("output in;"), std::string::npos) << option << r.out;
    }
    RunResult help = run_binary({"yield", "--help"}, dir.path());
    EXPECT_NE(help.out.find("--node"), std::string::npos) << help.out;
    EXPECT_EQ(help.out.find("--output"), std::string::npos) << help.out;  // hidden
}

// A resistor given a rating below its new dissipation is flagged, and the command says so by
// its exit code. 10 V across 1 kOhm: 0.1 W (P = V^2 / R); across 100 Ohm at Km = 0.1: 1 W.
TEST(StressCommand, APartOverItsRatingIsFlagged) {
    TempDir dir;
    write_bytes(dir.file("o.cir"), "load\nV1 in 0 DC 10\nR1 in 0 1k\n.end\n");
    write_bytes(dir.file("s.cir"), "load\nV1 in 0 DC 10\nR1 in 0 100\n.end\n");
    RunResult ok = run_binary({"stress", "o.cir", "o.cir", "--rating", "R=0.25W"}, dir.path());
    EXPECT_EQ(ok.exit_code, 0) << ok.out << ok.err;
    EXPECT_NE(ok.out.find("0 of 1 parts flagged"), std::string::npos) << ok.out;
    RunResult hot = run_binary({"stress", "o.cir", "s.cir", "--rating", "R=0.25W", "--ratio", "20"},
                               dir.path());
    EXPECT_EQ(hot.exit_code, 1) << hot.out << hot.err;
    EXPECT_NE(hot.out.find("1 W over its 0.25 W rating"), std::string::npos) << hot.out;
    EXPECT_EQ(hot.out.find("power x10 (limit"), std::string::npos) << hot.out;  // x10 is within x20
    EXPECT_NE(hot.err.find("self-heating"), std::string::npos) << hot.err;
}

}  // namespace
}  // namespace deckscale
