// The verification report as text (one PASS/FAIL line) and as JSON.
#include <string>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "verify/report.hpp"

namespace deckscale {
namespace {

VerifyReport sample(bool fail) {
    VerifyReport r;
    r.original = "proto.cir";
    r.scaled = "scaled.cir";
    r.km = 50;
    r.kf = 1e6;
    r.factors_inferred = true;
    r.resistor_pairs = 2;
    r.reactive_pairs = 3;
    Comparison ac;
    ac.analysis = "ac";
    ac.points = 11;
    ac.first = 1;
    ac.last = 100;
    ac.vectors.push_back(VectorResult{"out", VectorKind::voltage, fail ? 0.02 : 2e-9, 10, 0.1, -0.5, 1, !fail});
    ac.vectors.push_back(VectorResult{"v1#branch", VectorKind::current, 1e-9, 5, 0, 0, 1e-3, true});
    r.comparisons.push_back(ac);
    Comparison op;
    op.analysis = "op";
    op.points = 1;
    op.vectors.push_back(VectorResult{"out", VectorKind::voltage, 0, 0, 0, 0, 2.5, true});
    r.comparisons.push_back(op);
    if (fail) {
        ElementValue o{"c2", 'c', 1.5, "proto.cir", 7, "1.5"};
        ElementValue s{"c2", 'c', 3.03e-8, "scaled.cir", 9, "30.3n"};
        r.mismatches.push_back(RatioMismatch{o, s, 3e-8, 0.01});
    }
    r.notes.push_back("a note");
    return r;
}

TEST(ReportText, Pass) {
    EXPECT_EQ(report_text(sample(false)),
              "deckscale verify\n"
              "  original   proto.cir\n"
              "  scaled     scaled.cir\n"
              "  factors    Km = 50, Kf = 1000000  (inferred from 2 resistor and 3 C/L pairs)\n"
              "  elements   every matched R, C and L agrees with the factors\n"
              "  note       a note\n"
              "\n"
              "  AC sweep: 11 points, 1 Hz .. 100 Hz of the original, 2 vectors\n"
              "    vector                   rel. error          at Hz      mag. dB    phase deg\n"
              "    out                           2e-09             10          0.1         -0.5  ok\n"
              "    v1#branch (x Km)              1e-09              5            0            0  ok\n"
              "\n"
              "  Operating point: 1 vectors\n"
              "    vector                   rel. error               \n"
              "    out                               0                 ok\n"
              "\n"
              "PASS: the scaled deck is equivalent to the original; worst relative error: ac 2e-09 "
              "(tolerance 1e-06), op 0 (tolerance 1e-06)\n");
}

TEST(ReportText, FailNamesTheElementAndTheNode) {
    std::string t = report_text(sample(true));
    EXPECT_NE(t.find("  elements   1 matched element(s) disagree with the factors:\n"
                     "    proto.cir:7: c2 is 1.5 (scaled scaled.cir:9: 30.3n), expected 3e-08: off by +1 %\n"),
              std::string::npos)
        << t;
    EXPECT_NE(t.find("    out                            0.02             10          0.1         -0.5  FAIL\n"),
              std::string::npos)
        << t;
    EXPECT_NE(t.find("\nFAIL: the scaled deck is NOT equivalent to the original; worst relative error: "
                     "ac 0.02 (tolerance 1e-06)"),
              std::string::npos)
        << t;
    EXPECT_EQ(t.find("PASS"), std::string::npos);
}

TEST(ReportText, NoComparisonIsNoPass) {
    VerifyReport r;
    EXPECT_FALSE(r.passed());
    EXPECT_NE(report_text(r).find("\nFAIL: "), std::string::npos);
}

// A distortion product is titled with its plot and named so in the summary and the JSON.
TEST(ReportText, DistortionProductsAreNamed) {
    VerifyReport r = sample(false);
    Comparison d;
    d.analysis = "disto";
    d.part = "IM: f1-f2";
    d.points = 16;
    d.first = 1e5;
    d.last = 1e8;
    d.vectors.push_back(VectorResult{"det", VectorKind::voltage, 2e-13, 1e6, 0, 0, 1e-3, true});
    r.comparisons.push_back(d);
    std::string text = report_text(r);
    EXPECT_NE(text.find("  Distortion (IM: f1-f2): 16 points, 100000 Hz .. 1e+08 Hz of the "
                        "original, 1 vectors\n"),
              std::string::npos)
        << text;
    EXPECT_NE(text.find(", disto (IM: f1-f2) 2e-13 (tolerance 1e-06)\n"), std::string::npos)
        << text;
    auto j = nlohmann::json::parse(report_json(r));
    EXPECT_EQ(j["analyses"][2]["analysis"], "disto");
    EXPECT_EQ(j["analyses"][2]["part"], "IM: f1-f2");
    EXPECT_EQ(j["analyses"][0]["part"], "");
}

TEST(ReportJson, ParsesAndHasTheFields) {
    auto j = nlohmann::json::parse(report_json(sample(true)));
    EXPECT_EQ(j["original"], "proto.cir");
    EXPECT_EQ(j["scaled"], "scaled.cir");
    EXPECT_EQ(j["km"], 50.0);
    EXPECT_EQ(j["kf"], 1e6);
    EXPECT_EQ(j["factors"], "inferred");
    EXPECT_EQ(j["passed"], false);
    EXPECT_EQ(j["tolerance"]["relative"], 1e-6);
    EXPECT_EQ(j["tolerance"]["transient"], 1e-3);
    ASSERT_EQ(j["element_mismatches"].size(), 1u);
    const auto& m = j["element_mismatches"][0];
    EXPECT_EQ(m["element"], "c2");
    EXPECT_EQ(m["file"], "proto.cir");
    EXPECT_EQ(m["line"], 7);
    EXPECT_EQ(m["scaled_file"], "scaled.cir");
    EXPECT_EQ(m["scaled_line"], 9);
    EXPECT_EQ(m["deviation"], 0.01);
    ASSERT_EQ(j["analyses"].size(), 2u);
    const auto& ac = j["analyses"][0];
    EXPECT_EQ(ac["analysis"], "ac");
    EXPECT_EQ(ac["points"], 11);
    EXPECT_EQ(ac["passed"], false);
    ASSERT_EQ(ac["vectors"].size(), 2u);
    EXPECT_EQ(ac["vectors"][0]["name"], "out");
    EXPECT_EQ(ac["vectors"][0]["kind"], "voltage");
    EXPECT_EQ(ac["vectors"][0]["worst"], 0.02);
    EXPECT_EQ(ac["vectors"][0]["at"], 10.0);
    EXPECT_EQ(ac["vectors"][1]["kind"], "current");
    EXPECT_EQ(j["analyses"][1]["analysis"], "op");
    EXPECT_EQ(j["analyses"][1]["passed"], true);
    EXPECT_EQ(j["notes"], std::vector<std::string>{"a note"});

    auto p = nlohmann::json::parse(report_json(sample(false)));
    EXPECT_EQ(p["passed"], true);
    EXPECT_TRUE(p["element_mismatches"].empty());
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// With held parts: the deviation table (scaled deck's Hz), "info" rows for the operating
// point, the caution, and an INFO line without tolerances, PASS/FAIL with them.
TEST(ReportText, HeldPartsReportHowFarTheResponseMoved) {
    VerifyReport r;
    r.original = "a.cir";
    r.scaled = "b.cir";
    r.kf = 0.01;
    r.held = {"XU1"};
    r.tolerances.held = true;
    Comparison ac;
    ac.analysis = "ac";
    ac.points = 3;
    ac.first = 1000;
    ac.last = 1e6;
    VectorResult out{"out", VectorKind::voltage, 0.2, 1e6, 1, 2, 1, true};
    out.max_db = 1.25;
    out.max_db_at = 1e6;
    out.max_deg = 35.5;
    out.max_deg_at = 5e5;
    VectorResult inner{"xu1.c1", VectorKind::voltage, 0.9, 1000, 1, 2, 1, true};
    inner.max_db = 40;
    inner.max_db_at = 1000;
    ac.vectors = {out, inner};
    r.comparisons.push_back(ac);
    Comparison op;
    op.analysis = "op";
    op.vectors.push_back(VectorResult{"out", VectorKind::voltage, 0.5, 0, 0, 0, 2.5, true});
    r.comparisons.push_back(op);
    EXPECT_EQ(report_text(r),
              "deckscale verify\n"
              "  original   a.cir\n"
              "  scaled     b.cir\n"
              "  factors    Km = 1, Kf = 0.01  (given)\n"
              "  held       XU1 (kept as written by scale --hold: the scaled deck is not expected "
              "to equal the original)\n"
              "  elements   every matched R, C and L agrees with the factors\n"
              "\n"
              "  AC sweep: 3 points, 1000 Hz .. 1e+06 Hz of the original, 2 vectors\n"
              "    how far the held parts moved the response (points more than 60 dB below a "
              "vector's peak left out):\n"
              "    vector                   max |dB|   at Hz (scaled)  max |deg|   at Hz (scaled)\n"
              "    xu1.c1                         40               10          0                0  info\n"
              "    out                          1.25            10000       35.5             5000  info\n"
              "\n"
              "  Operating point: 1 vectors\n"
              "    vector                   rel. error               \n"
              "    out                             0.5                 info\n"
              "\n"
              "caution: held parts were not rescaled; the circuit around them changed, so check "
              "their ratings and stability in it before building. For mains-connected or "
              "high-voltage circuits, local codes and licensed practice govern.\n"
              "INFO: with held parts the scaled deck is not expected to equal the original; they "
              "moved the response by up to 1.25 dB (out at 10000 Hz) and 35.5 deg (out at 5000 "
              "Hz) at the deck's own nodes (inside subcircuits: the table above). No "
              "--tolerance-db or --tolerance-deg given: this is information, not a verdict "
              "(exit 0)\n");
    EXPECT_TRUE(r.passed());
    r.tolerances.db = 1;
    r.comparisons[0].vectors[0].passed = false;
    EXPECT_FALSE(r.passed());
    EXPECT_NE(report_text(r).find("\nFAIL: the held parts moved the response by up to 1.25 dB "
                                  "(out at 10000 Hz) and 35.5 deg (out at 5000 Hz) at the deck's "
                                  "own nodes (inside subcircuits: the table above), beyond "
                                  "--tolerance-db 1\n"),
              std::string::npos)
        << report_text(r);
}

}  // namespace
}  // namespace deckscale
