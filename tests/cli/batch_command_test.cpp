// End-to-end tests of `deckscale batch` through the real binary, on the demo library
// (netlists/batch/suite.toml: a kept 50 ohm / 10 MHz variant of the ladder, the same with C3
// 1 % high, and three reference designs scaled on the fly). ngspice is the referee.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>
#include <pugixml.hpp>
#include <regex>
#include <string>
#include <vector>

#include "cli/options.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

using test::read_bytes;
using test::run_binary;
using test::RunResult;
using test::TempDir;
using test::write_bytes;

std::string demo_suite() { return test::source_dir() + "/netlists/batch/suite.toml"; }

// The JSON report without wall times (the only figures that differ between two runs).
nlohmann::json without_times(nlohmann::json j) {
    j.erase("seconds");
    for (auto& c : j["cases"]) c.erase("seconds");
    return j;
}

std::string junit_without_times(const std::string& xml) {
    return std::regex_replace(xml, std::regex(R"( time="[0-9.]+")"), "");
}

TEST(BatchCommand, ParsesItsOptions) {
    using W = Invocation::What;
    struct Row {
        int line;
        std::vector<std::string> args;
        W what;
        const char* error;  // the whole usage error
    } rows[] = {
        {__LINE__,
         {"batch", "s.toml", "-j", "3", "--shard", "2/5", "--junit", "r.xml", "--json", "r.json"},
         W::batch,
         ""},
        {__LINE__, {"batch", "--merge", "a.json", "b.json", "--junit", "r.xml"}, W::batch, ""},
        {__LINE__, {"batch", "lib", "--km", "50", "--kf", "2*pi*1k"}, W::batch, ""},
        {__LINE__,
         {"batch", "s.toml", "--shard", "0/5"},
         W::usage_error,
         "--shard: '0/5' is not K/N with 1 <= K <= N"},
        {__LINE__,
         {"batch", "a.json", "--merge", "--shard", "1/2"},
         W::usage_error,
         "--shard and --merge exclude each other"},
        {__LINE__,
         {"batch", "lib", "--km", "x"},
         W::usage_error,
         "--km: 'x' is not a number (write e.g. 1k, 2.2MEG, 2*pi*1k)"},
    };
    for (const auto& row : rows) {
        Invocation inv = parse_command_line(row.args);
        EXPECT_EQ(inv.what, row.what) << "line " << row.line << ": " << inv.text;
        if (row.what == W::usage_error) EXPECT_EQ(inv.text, row.error) << "line " << row.line;
    }
    Invocation inv = parse_command_line(rows[0].args);
    EXPECT_EQ(inv.batch.inputs, std::vector<std::string>{"s.toml"});
    EXPECT_EQ(inv.batch.jobs, 3u);
    EXPECT_EQ(inv.batch.shard_k, 2u);
    EXPECT_EQ(inv.batch.shard_n, 5u);
    EXPECT_EQ(inv.batch.junit, "r.xml");
    EXPECT_EQ(inv.batch.json, "r.json");
    inv = parse_command_line(rows[1].args);
    EXPECT_TRUE(inv.batch.merge);
    EXPECT_EQ(inv.batch.inputs, (std::vector<std::string>{"a.json", "b.json"}));
    inv = parse_command_line(rows[2].args);
    EXPECT_EQ(inv.batch.km, 50);
    EXPECT_NEAR(inv.batch.kf, 2 * M_PI * 1000, 1e-9);
}

TEST(BatchCommand, DemoSuiteMeetsEveryExpectation) {
    TempDir dir;
    RunResult r = run_binary(
        {"batch", demo_suite(), "-j", "2", "--json", "r.json", "--junit", "r.xml"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    EXPECT_NE(r.out.find("5 case(s): 4 equivalent, 1 not equivalent, 0 refused, 0 error(s)"),
              std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("PASS: every case met its expectation\n"), std::string::npos) << r.out;
    EXPECT_EQ(r.err.find('\r'), std::string::npos);  // no progress line: not a terminal
    EXPECT_NE(r.err.find("deckscale: caution:"), std::string::npos) << r.err;
    auto j = nlohmann::json::parse(read_bytes(dir.file("r.json")));
    ASSERT_EQ(j["cases"].size(), 5u);
    // The capacitor 1 % high fails (as the suite expects), and its node is the worst vector.
    const auto& off = j["cases"][1];
    EXPECT_EQ(off["name"], "ladder5 with C3 1 % high");
    EXPECT_EQ(off["outcome"], "fail");
    EXPECT_EQ(off["met"], true);
    EXPECT_EQ(off["worst"].get<std::string>().rfind("ac n2: relative error ", 0), 0u)
        << off["worst"];
    EXPECT_EQ(off["report"]["passed"], false) << off["report"].dump();
    pugi::xml_document doc;
    ASSERT_TRUE(doc.load_file(dir.file("r.xml").c_str()));
    EXPECT_EQ(doc.child("testsuites").child("testsuite").attribute("tests").as_int(), 5);
    EXPECT_EQ(doc.child("testsuites").child("testsuite").attribute("failures").as_int(), 0);
}

TEST(BatchCommand, ACapacitorOnePercentOffFailsTheSuite) {
    TempDir dir;
    const std::string lib = test::source_dir() + "/netlists";
    write_bytes(dir.file("s.toml"), "[[case]]\nname = \"off\"\ndeck = \"" + lib +
                                        "/demo/ladder5_proto.cir\"\nscaled = \"" + lib +
                                        "/batch/scaled/ladder5_c3_high.cir\"\n");
    RunResult r = run_binary({"batch", "s.toml", "--junit", "r.xml"}, dir.path());
    EXPECT_EQ(r.exit_code, 1) << r.out << r.err;
    EXPECT_NE(r.out.find("UNEXPECTED off: expected pass, got fail: worst ac n2: relative error "),
              std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("FAIL: 1 case(s) did not meet their expectation\n"), std::string::npos)
        << r.out;
    pugi::xml_document doc;
    ASSERT_TRUE(doc.load_file(dir.file("r.xml").c_str()));
    auto failure = doc.child("testsuites").child("testsuite").child("testcase").child("failure");
    ASSERT_TRUE(failure);
    EXPECT_EQ(
        std::string(failure.attribute("message").value()).rfind("not equivalent; worst ac n2: ", 0),
        0u);
}

TEST(BatchCommand, MergedShardsEqualAnUnshardedRun) {
    TempDir dir;
    RunResult all =
        run_binary({"batch", demo_suite(), "--json", "all.json", "--junit", "all.xml"}, dir.path());
    ASSERT_EQ(all.exit_code, 0) << all.out << all.err;
    for (int n : {2, 3}) {
        std::vector<std::string> merge = {"batch", "--merge"};
        std::size_t cases = 0;
        for (int k = 1; k <= n; ++k) {
            std::string json = "s" + std::to_string(k) + ".json";
            RunResult s = run_binary({"batch", demo_suite(), "--shard",
                                      std::to_string(k) + "/" + std::to_string(n), "--json", json},
                                     dir.path());
            ASSERT_EQ(s.exit_code, 0) << s.out << s.err;
            cases += nlohmann::json::parse(read_bytes(dir.file(json)))["cases"].size();
            merge.push_back(json);
        }
        EXPECT_EQ(cases, 5u) << "n = " << n;
        merge.insert(merge.end(), {"--json", "m.json", "--junit", "m.xml"});
        RunResult m = run_binary(merge, dir.path());
        ASSERT_EQ(m.exit_code, 0) << m.out << m.err;
        EXPECT_EQ(without_times(nlohmann::json::parse(read_bytes(dir.file("m.json")))),
                  without_times(nlohmann::json::parse(read_bytes(dir.file("all.json")))))
            << "n = " << n;
        EXPECT_EQ(junit_without_times(read_bytes(dir.file("m.xml"))),
                  junit_without_times(read_bytes(dir.file("all.xml"))))
            << "n = " << n;
        // A missing shard is noticed.
        merge.erase(merge.begin() + 2);
        RunResult partial = run_binary(merge, dir.path());
        EXPECT_EQ(partial.exit_code, 2) << partial.out;
        EXPECT_NE(partial.err.find("a shard's report is missing"), std::string::npos)
            << partial.err;
    }
}

TEST(BatchCommand, SurveySaysWhichDecksScaleWhichAreRefusedAndWhy) {
    TempDir dir;
    const char* rc = "rc\nV1 in 0 DC 0 AC 1\nR1 in out 1k\nC1 out 0 1u\n.ac dec 10 10 10k\n.end\n";
    const char* orphan =
        "a\nV1 in 0 DC 0 AC 1\nR1 in a 1k\nA1 a b amp\nR2 b 0 1k\n.ac dec 5 10 1k\n.end\n";
    write_bytes(dir.file("lib/rc.cir"), rc);
    write_bytes(dir.file("lib/sub/d1.sp"), orphan);
    write_bytes(dir.file("lib/sub/d2.cir"), orphan);
    write_bytes(dir.file("lib/bad.cir"), "bad\nR1 a 0 1..k\n.end\n");
    write_bytes(dir.file("lib/readme.txt"), "not a deck\n");
    RunResult r = run_binary({"batch", "lib", "--km", "50", "--kf", "1meg"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    EXPECT_EQ(r.out.rfind("scaled and verified (1):\n  rc.cir  worst ", 0), 0u) << r.out;
    EXPECT_NE(r.out.find("refused (2), by reason:\n"), std::string::npos) << r.out;
    EXPECT_NE(
        r.out.find(
            "  XSPICE A device whose model 'amp' is not in the deck (2 deck(s)):\n    sub/d1.sp\n"
            "    sub/d2.cir\n"),
        std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("not read or not simulated (1):\n  bad.cir  "), std::string::npos)
        << r.out;
    EXPECT_NE(r.out.find("4 case(s): 1 equivalent, 0 not equivalent, 2 refused, 1 error(s)"),
              std::string::npos)
        << r.out;
}

TEST(BatchCommand, BadSuitesAndOptionsExitWithTwo) {
    TempDir dir;
    write_bytes(dir.file("s.toml"), "[[case]]\ndeck = \"nowhere.cir\"\nkm = 2\nkf = 2\n");
    RunResult missing = run_binary({"batch", "s.toml"}, dir.path());
    EXPECT_EQ(missing.exit_code, 2);
    EXPECT_EQ(missing.err,
              "s.toml:2:8: error: deck 'nowhere.cir' does not exist\n  deck = \"nowhere.cir\"\n"
              "         ^\n");
    write_bytes(dir.file("t.toml"), "[[case]\n");
    RunResult bad = run_binary({"batch", "t.toml"}, dir.path());
    EXPECT_EQ(bad.exit_code, 2);
    EXPECT_EQ(bad.err.rfind("t.toml:1:", 0), 0u) << bad.err;
    RunResult shard = run_binary({"batch", "s.toml", "--shard", "3/2"}, dir.path());
    EXPECT_EQ(shard.exit_code, 2);
    EXPECT_NE(shard.err.find("--shard: '3/2' is not K/N with 1 <= K <= N"), std::string::npos)
        << shard.err;
    RunResult two = run_binary({"batch", "s.toml", "t.toml"}, dir.path());
    EXPECT_EQ(two.exit_code, 2);
    EXPECT_NE(two.err.find("several files only with --merge"), std::string::npos) << two.err;
}

}  // namespace
}  // namespace deckscale
