// The change list of a scaling run, as text and as JSON.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include "scale/change_report.hpp"
#include "write/plan.hpp"

namespace deckscale {
namespace {

struct ScaleRun {
    Deck deck;
    ScaleResult result;
    OutputPlan plan;
};

ScaleRun run_scale_in_memory(const std::string& text, double km, double kf) {
    MemoryFileSystem fs;
    fs.add("deck.cir", text);
    ScaleSettings s;
    s.factors = {km, kf};
    ScaleRun r{load_deck("deck.cir", fs), {}, {}};
    r.result = scale_deck(r.deck, s);
    r.plan = plan_output(r.deck, r.result.edits, "", false);
    return r;
}

TEST(ChangeReport, OneLinePerRewrittenValue) {
    ScaleRun r = run_scale_in_memory("t\nR1 a 0 1k\nC1 a 0 {c0}\n.param c0=1n\nY1 a 0 b 0 tm\n.end\n", 50, 2);
    EXPECT_EQ(change_list_text(r.deck, r.result),
              "deck.cir:2:8  R1  value  1k -> 50k  x50 [Ohm]\n"
              "deck.cir:4:11  .param  c0  1n -> 10p  x0.01 [F]\n"
              "deck.cir:4:8  parameter c0  scaled at its definition as capacitance  x0.01\n");
}

// A card written out on a line of its own (the solver tolerances before .end) stays on one
// line of the list.
TEST(ChangeReport, InsertedCardStaysOnOneLine) {
    ScaleRun r = run_scale_in_memory("t\r\n.tran 1u 1m\r\n.end\r\n", 10, 1);
    EXPECT_EQ(change_list_text(r.deck, r.result),
              "deck.cir:3:1  .options  abstol, chgtol (defaults written out for the transient)  "
              "(none) -> .options abstol=1e-13 chgtol=1e-15  x1\n");
}

TEST(ChangeReport, JsonHasFactorsFilesChangesAndRefusals) {
    ScaleRun r = run_scale_in_memory("t\nR1 a 0 1k\nY1 a 0 b 0 tm\nY2 b 0 c 0 tm\n.end\n", 50, 2);
    auto j = nlohmann::json::parse(change_list_json(r.deck, r.result, {50, 2}, r.plan));
    EXPECT_EQ(j["km"], 50);
    EXPECT_EQ(j["kf"], 2);
    ASSERT_EQ(j["files"].size(), 1u);
    EXPECT_EQ(j["files"][0]["input"], "deck.cir");
    EXPECT_EQ(j["files"][0]["output"], "-");
    ASSERT_EQ(j["changes"].size(), 1u);
    EXPECT_EQ(j["changes"][0]["element"], "R1");
    EXPECT_EQ(j["changes"][0]["line"], 2);
    EXPECT_EQ(j["changes"][0]["column"], 8);
    EXPECT_EQ(j["changes"][0]["old"], "1k");
    EXPECT_EQ(j["changes"][0]["new"], "50k");
    EXPECT_EQ(j["changes"][0]["unit"], "Ohm");
    EXPECT_DOUBLE_EQ(j["changes"][0]["factor"].get<double>(), 50);
    ASSERT_EQ(j["unscalable"].size(), 2u);  // the two TXL lines
    EXPECT_EQ(j["unscalable"][0]["line"], 3);
}

// The noise consequence of the factors (scale/noise_effect.hpp): output noise density
// x sqrt(Km), integrated x sqrt(Km Kf) (shared notes "scaling-rules.md" §8), flicker models.
TEST(ChangeReport, JsonStatesTheNoiseConsequence) {
    ScaleRun r = run_scale_in_memory("t\nR1 a 0 1k\nD1 a 0 dn\n.model dn d(kf=1e-15)\n.end\n", 100, 1e4);
    auto j = nlohmann::json::parse(change_list_json(r.deck, r.result, {100, 1e4}, r.plan));
    const auto& n = j["noise"];
    EXPECT_DOUBLE_EQ(n["output_density_factor"].get<double>(), 10);
    EXPECT_DOUBLE_EQ(n["output_density_db"].get<double>(), 20);
    EXPECT_DOUBLE_EQ(n["integrated_factor"].get<double>(), 1000);
    EXPECT_DOUBLE_EQ(n["integrated_db"].get<double>(), 60);
    EXPECT_EQ(n["flicker_not_following"], nlohmann::json::array({"dn (deck.cir:4)"}));
    EXPECT_TRUE(n["flicker_rewritten"].empty());
    EXPECT_EQ(n["line"],
              "noise (thermal, shot): Km = 100: output noise density x10 (+20 dB) at Kf f; integrated "
              "output noise x1000 (+60 dB) over the Kf = 10000 times wider band; flicker (1/f) noise "
              "of dn (deck.cir:4) does not follow (--follow-flicker rewrites KF)");
    j = nlohmann::json::parse(change_list_json(r.deck, r.result, {100, 1e4}, r.plan, true));
    EXPECT_EQ(j["noise"]["flicker_rewritten"], nlohmann::json::array({"dn (deck.cir:4)"}));
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// Held parts follow the rewritten values: what, why, the scaled copy, and what a held part
// could not have followed anyway; the JSON has the same under "held".
TEST(ChangeReport, HeldPartsAreListedWithWhy) {
    MemoryFileSystem fs;
    fs.add("deck.cir",
           "t\nX1 a f\nX2 b f\nM1 d g 0 0 nb\n.subckt f p\nC1 p 0 1n\n.ends\n"
           ".model nb nmos level=8\n.end\n");
    ScaleSettings s;
    s.factors = {1, 10};
    s.hold = {"X1", "M1"};
    ScaleRun r{load_deck("deck.cir", fs), {}, {}};
    r.result = scale_deck(r.deck, s);
    r.plan = plan_output(r.deck, r.result.edits, "", false);
    EXPECT_EQ(change_list_text(r.deck, r.result),
              "deck.cir:3:6  X2  subckt (scaled copy)  f -> f_scaled  x1\n"
              "deck.cir:5:9  .subckt (in f_scaled)  name of the scaled copy  f -> f_scaled  x1\n"
              "deck.cir:6:8  C1 (in f_scaled)  value  1n -> 100p  x0.1 [F]\n"
              "deck.cir:2:1  X1  held (instance): asked: --hold X1\n"
              "deck.cir:4:1  M1  held (element): asked: --hold M1\n"
              "    could not have followed anyway: deck.cir:4:12: MOSFET 'M1' uses model 'nb' "
              "(level 8, BSIM3): its intrinsic charge and its DC current both come from the "
              "oxide capacitance, so no model change follows a frequency change (Kf = 10); "
              "with Kf = 1 it scales exactly by m\n"
              "deck.cir:5:9  f  held (subckt): used by held parts: X1; the scaled parts use its "
              "scaled copy f_scaled\n");
    auto j = nlohmann::json::parse(change_list_json(r.deck, r.result, {1, 10}, r.plan));
    ASSERT_EQ(j["held"].size(), 3u);
    EXPECT_EQ(j["held"][2]["kind"], "subckt");
    EXPECT_EQ(j["held"][2]["name"], "f");
    EXPECT_EQ(j["held"][2]["line"], 5);
    EXPECT_EQ(j["held"][2]["copy"], "f_scaled");
    EXPECT_EQ(j["held"][1]["could_not_follow"].size(), 1u);
    EXPECT_EQ(j["held"][1]["could_not_follow"][0]["line"], 4);
}

// Every parameter gets a line after the changes: scaled at its definition, following from
// other parameters, unchanged (a voltage), wrapped at its uses and why, or used nowhere.
TEST(ChangeReport, SaysHowEachParameterWasScaled) {
    ScaleRun r = run_scale_in_memory(
        "t\n.param rb=1k rs={rb/10} spare=3 vdd=5 mix=2k\nR1 a 0 {rs}\nR2 a b rb\nV1 b 0 {vdd}\n"
        "R3 b 0 {mix}\nC3 b 0 {mix*1p}\n.subckt cell p q params: cx=1n\nC1 p q {cx}\n.ends\n"
        "X1 a 0 cell\n.end\n",
        50, 2);
    std::string text = change_list_text(r.deck, r.result);
    EXPECT_EQ(text.substr(text.find("deck.cir:2:8  parameter")),
              "deck.cir:2:8  parameter rb  scaled at its definition as resistance  x50\n"
              "deck.cir:2:14  parameter rs  follows from its definition as resistance  x50\n"
              "deck.cir:2:25  parameter spare  used nowhere: left as it is\n"
              "deck.cir:2:33  parameter vdd  unchanged: voltage, factor 1\n"
              "deck.cir:2:39  parameter mix  wrapped at 2 use sites: used as resistance (R3, "
              "deck.cir:6) and as capacitance (C3, deck.cir:7)\n"
              "deck.cir:8:26  parameter cx of cell  scaled at its definition as capacitance  x0.01\n");
    auto j = nlohmann::json::parse(change_list_json(r.deck, r.result, {50, 2}, r.plan));
    ASSERT_EQ(j["parameters"].size(), 6u);
    EXPECT_EQ(j["parameters"][0]["name"], "rb");
    EXPECT_EQ(j["parameters"][0]["outcome"], "definition");
    EXPECT_EQ(j["parameters"][0]["kind"], "resistance");
    EXPECT_DOUBLE_EQ(j["parameters"][0]["factor"].get<double>(), 50);
    EXPECT_EQ(j["parameters"][4]["outcome"], "wrapped");
    EXPECT_EQ(j["parameters"][4]["wrapped_uses"], 2);
    EXPECT_EQ(j["parameters"][5]["subckt"], "cell");
    EXPECT_EQ(j["parameters"][5]["line"], 8);
}

}  // namespace
}  // namespace deckscale
