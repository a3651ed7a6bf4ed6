// Tests of the rule table: every (scope, field) pair of rule_table() has a deck line here that
// uses it, and scaling that line multiplies the value by Km^a * Kf^b for the field's unit
// (shared notes "scaling-rules.md" §0-§6). The exponents are written here independently of
// the table, so a wrong unit in the table fails its row.
#include "scale/rules.hpp"

#include <gtest/gtest.h>

#include <set>

#include "support/scale.hpp"

namespace deckscale {
namespace {

struct FieldCase {
    int line;
    std::string scope, field;
    std::string deck;    // cards after the title line
    std::string marker;  // the value under test, written once in the deck; "" for a flag
    int a, b;            // expected factor Km^a * Kf^b
};

constexpr double kKm = 7, kKf = 300;

std::vector<FieldCase> field_cases() {
    std::vector<FieldCase> v;
    auto add = [&](int line, std::string scope, std::string field, std::string deck,
                   std::string marker, int a, int b) {
        v.push_back({line, std::move(scope), std::move(field), std::move(deck), std::move(marker), a, b});
    };
    // A key=value on an element card: "<prefix> key=3.17".
    auto keyed = [&](int line, std::string scope, std::string prefix, std::string key, int a, int b) {
        add(line, scope, key, prefix + " " + key + "=3.17", "3.17", a, b);
    };
    // ---- R C L K ----
    add(__LINE__, "r", "value", "R1 a 0 3.17", "3.17", 1, 0);
    for (auto k : {"r", "resistance", "ac"}) keyed(__LINE__, "r", "R1 a 0 5", k, 1, 0);
    keyed(__LINE__, "r", "R1 a 0", "r", 1, 0);
    for (auto k : {"m", "scale", "tc1", "tc2", "tce", "temp", "dtemp", "l", "w", "tc", "bv_max"})
        keyed(__LINE__, "r", "R1 a 0 5", k, 0, 0);
    add(__LINE__, "r", "noise", "R1 a 0 5 noise=0", "0", 0, 0);
    add(__LINE__, "r", "noisy", "R1 a 0 5 noisy=0", "0", 0, 0);
    add(__LINE__, "c", "value", "C1 a 0 3.17", "3.17", -1, -1);
    for (auto k : {"c", "capacitance", "q", "cap"}) keyed(__LINE__, "c", "C1 a 0", k, -1, -1);
    for (auto k : {"ic", "m", "scale", "tc1", "tc2", "temp", "dtemp", "l", "w", "bv_max"})
        keyed(__LINE__, "c", "C1 a 0 5", k, 0, 0);
    add(__LINE__, "l", "value", "L1 a 0 3.17", "3.17", 1, -1);
    for (auto k : {"l", "inductance"}) keyed(__LINE__, "l", "L1 a 0", k, 1, -1);
    keyed(__LINE__, "l", "L1 a 0 5", "ic", -1, 0);  // a current
    for (auto k : {"m", "scale", "nt", "tc1", "tc2", "temp", "dtemp"})
        keyed(__LINE__, "l", "L1 a 0 5", k, 0, 0);
    add(__LINE__, "k", "value", "L1 a 0 1\nL2 b 0 2\nK1 L1 L2 0.317", "0.317", 0, 0);
    keyed(__LINE__, "k", "L1 a 0 1\nL2 b 0 2\nK1 L1 L2", "coefficient", 0, 0);
    keyed(__LINE__, "k", "L1 a 0 1\nL2 b 0 2\nK1 L1 L2", "k", 0, 0);
    // ---- independent sources ----
    for (std::string s : {"v", "i"}) {
        int a = s == "v" ? 0 : -1;
        std::string card = s == "v" ? "V1 a 0" : "I1 0 a";
        add(__LINE__, s, "dc", card + " dc 3.17", "3.17", a, 0);
        add(__LINE__, s, "ac", card + " ac 3.17", "3.17", a, 0);
        add(__LINE__, s, "acphase", card + " ac 2 3.17", "3.17", 0, 0);
        add(__LINE__, s, "acmag", card + " acmag 3.17 acphase 45", "3.17", a, 0);
        add(__LINE__, s, "distof1", card + " distof1 3.17", "3.17", a, 0);
        add(__LINE__, s, "distof1phase", card + " distof1 2 3.17", "3.17", 0, 0);
        add(__LINE__, s, "distof2", card + " distof2 3.17", "3.17", a, 0);
        add(__LINE__, s, "distof2phase", card + " distof2 2 3.17", "3.17", 0, 0);
    }
    add(__LINE__, "v", "z0", "V1 a 0 dc 0 ac 1 portnum 2 z0=3.17", "3.17", 1, 0);
    add(__LINE__, "v", "portnum", "V1 a 0 dc 0 ac 1 portnum 3 z0=50", "3", 0, 0);
    add(__LINE__, "v", "freq", "V1 a 0 dc 0 portnum 1 z0=50 pwr=1m freq=3.17", "3.17", 0, 1);
    add(__LINE__, "v", "phase", "V1 a 0 dc 0 portnum 1 z0=50 pwr=1m phase=3.17", "3.17", 0, 0);
    add(__LINE__, "v", "r", "V1 a 0 PWL(0 0 1 1 2 0) r=0.317", "0.317", 0, -1);
    add(__LINE__, "v", "td", "V1 a 0 PWL(0 0 1 1 2 0) td=0.317", "0.317", 0, -1);
    add(__LINE__, "i", "m", "I1 0 a dc 1 m=3.17", "3.17", 0, 0);
    add(__LINE__, "i", "c", "I1 0 a c=3.17", "3.17", -1, 0);
    // Source functions, on current sources so that amplitudes must be divided by Km.
    struct Fn {
        const char* name;
        const char* args;
        std::vector<std::pair<int, int>> exps;  // per positional argument
    };
    const Fn fns[] = {
        {"pulse", "1.11 2.22 3.33 4.44 5.55 6.66 7.77 8.88",
         {{-1, 0}, {-1, 0}, {0, -1}, {0, -1}, {0, -1}, {0, -1}, {0, -1}, {0, 0}}},
        {"sin", "1.11 2.22 3.33 4.44 5.55 6.66", {{-1, 0}, {-1, 0}, {0, 1}, {0, -1}, {0, 1}, {0, 0}}},
        {"exp", "1.11 2.22 3.33 4.44 5.55 6.66",
         {{-1, 0}, {-1, 0}, {0, -1}, {0, -1}, {0, -1}, {0, -1}}},
        {"sffm", "1.11 2.22 3.33 4.44 5.55 6.66 7.77",
         {{-1, 0}, {-1, 0}, {0, 1}, {0, 0}, {0, 1}, {0, 0}, {0, 0}}},
        // AM: VO (2nd) is a dimensionless offset, not a current (notes §2).
        {"am", "1.11 2.22 3.33 4.44 5.55 6.66 7.77",
         {{-1, 0}, {0, 0}, {0, 1}, {0, 1}, {0, -1}, {0, 0}, {0, 0}}},
        {"trnoise", "1.11 2.22 3.33 4.44 5.55 6.66 7.77",
         {{-1, 0}, {0, -1}, {0, 0}, {-1, 0}, {-1, 0}, {0, -1}, {0, -1}}},
        {"trrandom", "1 2.22 3.33 4.44 5.55", {{0, 0}, {0, -1}, {0, -1}, {-1, 0}, {-1, 0}}},
    };
    for (const auto& fn : fns) {
        std::string args = fn.args;
        std::vector<std::string> words;
        for (std::size_t p = 0, q; p < args.size(); p = q + 1) {
            q = args.find(' ', p);
            if (q == std::string::npos) q = args.size();
            words.push_back(args.substr(p, q - p));
        }
        for (std::size_t k = 0; k < fn.exps.size(); ++k)
            add(__LINE__, fn.name, "#" + std::to_string(k + 1),
                std::string("I1 0 a ") + fn.name + "(" + args + ")", words[k], fn.exps[k].first,
                fn.exps[k].second);
    }
    add(__LINE__, "pwl", "time", "I1 0 a PWL(0 0 1.11 2.22)", "1.11", 0, -1);
    add(__LINE__, "pwl", "value", "I1 0 a PWL(0 0 1.11 2.22)", "2.22", -1, 0);
    // ---- controlled sources ----
    const std::string sense = "Vs s 0 0\nRs s 0 1\n";
    add(__LINE__, "e", "value", "E1 b 0 a 0 3.17", "3.17", 0, 0);
    add(__LINE__, "f", "value", sense + "F1 0 b Vs 3.17", "3.17", 0, 0);
    add(__LINE__, "f", "m", sense + "F1 0 b Vs 2 m=3.17", "3.17", 0, 0);
    add(__LINE__, "g", "value", "G1 0 b a 0 3.17", "3.17", -1, 0);
    add(__LINE__, "g", "m", "G1 0 b a 0 2 m=3.17", "3.17", 0, 0);
    add(__LINE__, "h", "value", sense + "H1 b 0 Vs 3.17", "3.17", 1, 0);
    keyed(__LINE__, "e", "E1 b 0 a 0", "gain", 0, 0);
    keyed(__LINE__, "f", sense + "F1 0 b Vs", "gain", 0, 0);
    keyed(__LINE__, "g", "G1 0 b a 0", "gain", -1, 0);
    keyed(__LINE__, "h", sense + "H1 b 0 Vs", "gain", 1, 0);
    for (auto k : {"tc1", "tc2", "temp", "dtemp", "m", "reciproctc", "reciprocm"})
        keyed(__LINE__, "b", "B1 b 0 V=v(a)*2", k, 0, 0);
    // ---- lines, URC, switches ----
    keyed(__LINE__, "t", "T1 a 0 b 0 TD=1n", "z0", 1, 0);
    keyed(__LINE__, "t", "T1 a 0 b 0 TD=1n", "zo", 1, 0);
    keyed(__LINE__, "t", "T1 a 0 b 0 Z0=50", "td", 0, -1);
    add(__LINE__, "t", "f", "T1 a 0 b 0 Z0=50 F=3.17 NL=0.25", "3.17", 0, 1);
    add(__LINE__, "t", "nl", "T1 a 0 b 0 Z0=50 F=1 NL=0.317", "0.317", 0, 0);
    const std::string tic = "T1 a 0 b 0 Z0=50 TD=1 IC=1.11,2.22,3.33,4.44";
    add(__LINE__, "t", "ic#1", tic, "1.11", 0, 0);
    add(__LINE__, "t", "ic#2", tic, "2.22", -1, 0);
    add(__LINE__, "t", "ic#3", tic, "3.33", 0, 0);
    add(__LINE__, "t", "ic#4", tic, "4.44", -1, 0);
    const std::string oic = ".model lm ltra r=1 l=1 c=1 len=1\nO1 a 0 b 0 lm IC=1.11,2.22,3.33,4.44";
    add(__LINE__, "o", "ic#1", oic, "1.11", 0, 0);
    add(__LINE__, "o", "ic#2", oic, "2.22", -1, 0);
    add(__LINE__, "o", "ic#3", oic, "3.33", 0, 0);
    add(__LINE__, "o", "ic#4", oic, "4.44", -1, 0);
    for (const auto& [k, a] : {std::pair{"v1", 0}, {"i1", -1}, {"v2", 0}, {"i2", -1}}) {
        keyed(__LINE__, "t", "T1 a 0 b 0 Z0=50 TD=1", k, a, 0);
        keyed(__LINE__, "o", ".model lm ltra r=1 l=1 c=1 len=1\nO1 a 0 b 0 lm", k, a, 0);
    }
    const std::string urc = ".model um urc k=2 fmax=1e9 rperl=1000 cperl=1e-15\n";
    add(__LINE__, "u", "l", urc + "U1 a b 0 um l=3.17 n=4", "3.17", 0, 0);
    add(__LINE__, "u", "n", urc + "U1 a b 0 um l=1 n=6", "6", 0, 0);
    const std::pair<const char*, std::vector<std::pair<std::string, std::pair<int, int>>>> models[] = {
        {"sw", {{"vt", {0, 0}}, {"vh", {0, 0}}, {"ron", {1, 0}}, {"roff", {1, 0}}}},
        {"csw", {{"it", {-1, 0}}, {"ih", {-1, 0}}, {"ron", {1, 0}}, {"roff", {1, 0}}}},
        {"ltra", {{"r", {1, 0}}, {"l", {1, -1}}, {"g", {-1, 0}}, {"c", {-1, -1}}, {"len", {0, 0}},
                  {"rel", {0, 0}}, {"abs", {0, 0}}, {"compactrel", {0, 0}}, {"compactabs", {-1, 0}}}},
        {"urc", {{"k", {0, 0}}, {"fmax", {0, 1}}, {"rperl", {1, 0}}, {"cperl", {-1, -1}},
                 {"isperl", {-1, 0}}, {"rsperl", {1, 0}}}},
        {"r", {{"rsh", {1, 0}}, {"r", {1, 0}}, {"res", {1, 0}}, {"defw", {0, 0}}, {"w", {0, 0}},
               {"l", {0, 0}}, {"narrow", {0, 0}}, {"short", {0, 0}}, {"tc1", {0, 0}},
               {"tc2", {0, 0}}, {"tce", {0, 0}}, {"tnom", {0, 0}}, {"noise", {0, 0}},
               {"kf", {0, 0}}, {"af", {0, 0}}, {"ef", {0, 0}}, {"lf", {0, 0}}, {"wf", {0, 0}},
               {"dw", {0, 0}}, {"dlr", {0, 0}}, {"tc1r", {0, 0}}, {"tc2r", {0, 0}},
               {"bv_max", {0, 0}}}},
        {"c", {{"cap", {-1, -1}}, {"c", {-1, -1}}, {"cj", {-1, -1}}, {"cjsw", {-1, -1}},
               {"defw", {0, 0}}, {"defl", {0, 0}}, {"w", {0, 0}}, {"l", {0, 0}}, {"narrow", {0, 0}},
               {"short", {0, 0}}, {"tc1", {0, 0}}, {"tc2", {0, 0}}, {"tnom", {0, 0}},
               {"di", {0, 0}}, {"thick", {0, 0}}, {"cox", {-1, -1}}, {"capsw", {-1, -1}},
               {"del", {0, 0}}, {"bv_max", {0, 0}}}},
        {"l", {{"ind", {1, -1}}, {"l", {1, -1}}, {"tc1", {0, 0}}, {"tc2", {0, 0}}, {"tnom", {0, 0}}}},
    };
    for (const auto& [type, fields] : models)
        for (const auto& [key, e] : fields)
            keyed(__LINE__, std::string("model:") + type, std::string(".model mm ") + type, key,
                  e.first, e.second);
    for (auto flag : {"nocontrol", "steplimit", "nosteplimit", "lininterp", "quadinterp",
                      "mixedinterp", "truncnr", "truncdontcut"})
        add(__LINE__, "model:ltra", flag, std::string(".model mm ltra r=1 l=1 c=1 len=1 ") + flag, "",
            0, 0);
    // ---- analyses ----
    const std::string src = "V1 a 0 dc 0 ac 1\nR1 a 0 1\n";
    for (std::string kw : {".ac", ".sp", ".disto"}) {
        std::string card = kw + " dec 17 1.11 2.22";
        if (kw != ".ac") card += " 0.33";
        add(__LINE__, kw, "#2", card, "17", 0, 0);
        add(__LINE__, kw, "#3", card, "1.11", 0, 1);
        add(__LINE__, kw, "#4", card, "2.22", 0, 1);
        if (kw != ".ac") add(__LINE__, kw, "#5", card, "0.33", 0, 0);
    }
    const std::string noise = src + ".noise v(a) V1 dec 17 1.11 2.22 5";
    add(__LINE__, ".noise", "points", noise, "17", 0, 0);
    add(__LINE__, ".noise", "fstart", noise, "1.11", 0, 1);
    add(__LINE__, ".noise", "fstop", noise, "2.22", 0, 1);
    add(__LINE__, ".noise", "summary", noise, "5", 0, 0);
    const std::string sens = src + ".sens v(a) ac dec 17 1.11 2.22";
    add(__LINE__, ".sens", "points", sens, "17", 0, 0);
    add(__LINE__, ".sens", "fstart", sens, "1.11", 0, 1);
    add(__LINE__, ".sens", "fstop", sens, "2.22", 0, 1);
    const std::string tran = ".tran 1.11 2.22 3.33 4.44";
    for (int k = 1; k <= 4; ++k)
        add(__LINE__, ".tran", "#" + std::to_string(k), tran, std::to_string(k) + "." +
            std::string(2, static_cast<char>('0' + k)), 0, -1);
    add(__LINE__, ".four", "#1", src + ".four 1.11 v(a)", "1.11", 0, 1);
    const std::string pss = ".pss 1.11 2.22 a 17 18 19 0.33";
    add(__LINE__, ".pss", "#1", pss, "1.11", 0, 1);
    add(__LINE__, ".pss", "#2", pss, "2.22", 0, -1);
    add(__LINE__, ".pss", "#3", pss, "a", 0, 0);  // oscnob: a node name
    add(__LINE__, ".pss", "#4", pss, "17", 0, 0);
    add(__LINE__, ".pss", "#5", pss, "18", 0, 0);
    add(__LINE__, ".pss", "#6", pss, "19", 0, 0);
    add(__LINE__, ".pss", "#7", pss, "0.33", 0, 0);
    add(__LINE__, ".temp", "value", ".temp 31.7", "31.7", 0, 0);
    add(__LINE__, ".ic", "value", ".ic v(a)=3.17", "3.17", 0, 0);
    add(__LINE__, ".nodeset", "value", ".nodeset v(a)=3.17", "3.17", 0, 0);
    for (std::string an : {"tran", "ac", "sp"}) {
        int b = an == "tran" ? -1 : 1;
        std::string scope = ".meas:" + an;
        add(__LINE__, scope, "from", ".meas " + an + " m1 AVG v(a) FROM=1.11 TO=2.22", "1.11", 0, b);
        add(__LINE__, scope, "to", ".meas " + an + " m1 AVG v(a) FROM=1.11 TO=2.22", "2.22", 0, b);
        add(__LINE__, scope, "at", ".meas " + an + " m1 FIND v(a) AT=3.33", "3.33", 0, b);
        if (an != "sp")
            add(__LINE__, scope, "td",
                ".meas " + an + " m1 TRIG v(a) VAL=0.5 TD=1.11 RISE=2 TARG v(a) VAL=0.7 RISE=3",
                "1.11", 0, b);
    }
    const std::string trig = ".meas tran m1 TRIG v(a) VAL=0.5 RISE=2 TARG v(a) VAL=0.7 FALL=3";
    add(__LINE__, ".meas", "rise", trig, "2", 0, 0);
    add(__LINE__, ".meas", "fall", trig, "3", 0, 0);
    add(__LINE__, ".meas", "cross", ".meas tran m1 WHEN v(a)=0.5 CROSS=4", "4", 0, 0);
    // ---- options ----
    const std::pair<const char*, std::pair<int, int>> options[] = {
        {"gmin", {-1, 0}},     {"abstol", {-1, 0}},  {"chgtol", {-1, -1}}, {"rshunt", {1, 0}},
        {"rseries", {1, 0}},   {"cshunt", {-1, -1}}, {"minbreak", {0, -1}}, {"ramptime", {0, -1}},
        {"maxstep", {0, -1}},  {"reltol", {0, 0}},   {"vntol", {0, 0}},    {"trtol", {0, 0}},
        {"xmu", {0, 0}},       {"maxord", {0, 0}},   {"itl1", {0, 0}},     {"itl2", {0, 0}},
        {"itl3", {0, 0}},      {"itl4", {0, 0}},     {"itl5", {0, 0}},     {"itl6", {0, 0}},
        {"pivrel", {0, 0}},    {"pivtol", {0, 0}},   {"gminsteps", {0, 0}}, {"srcsteps", {0, 0}},
        {"temp", {0, 0}},      {"tnom", {0, 0}},     {"scale", {0, 0}},    {"defl", {0, 0}},
        {"defw", {0, 0}},      {"defad", {0, 0}},    {"defas", {0, 0}},    {"seed", {0, 0}},
        {"gmin_steps", {0, 0}}, {"numdgt", {0, 0}}, {"warn", {0, 0}},     {"maxwarns", {0, 0}},
    };
    for (const auto& [key, e] : options) keyed(__LINE__, ".options", ".options", key, e.first, e.second);
    add(__LINE__, ".options", "interp", ".options interp", "", 0, 0);
    return v;
}

TEST(RulesTest, EveryFieldOfTheTableHasATestCard) {
    std::set<std::pair<std::string, std::string>> covered;
    for (const auto& c : field_cases()) covered.insert({c.scope, c.field});
    for (const auto& r : rule_table())
        EXPECT_TRUE(covered.count({std::string(r.scope), std::string(r.field)}))
            << "no test card for rule (" << r.scope << ", " << r.field << ")";
    // And every test row names a rule that exists.
    for (const auto& c : field_cases())
        EXPECT_TRUE(find_rule(c.scope, c.field).has_value())
            << "line " << c.line << ": (" << c.scope << ", " << c.field << ") is not in the table";
}

TEST(RulesTest, EachFieldScalesByItsUnit) {
    for (const auto& c : field_cases()) {
        SCOPED_TRACE(testing::Message() << "rules_test.cpp:" << c.line << " (" << c.scope << ", "
                                        << c.field << "): " << c.deck);
        std::string deck = "field test\n" + c.deck + "\n.end\n";
        test::Scaled s;
        try {
            s = test::scale_text(deck, kKm, kKf);
        } catch (const DeckError& e) {
            ADD_FAILURE() << "DeckError: " << e.what();
            continue;
        }
        for (const auto& d : s.result.unscalable) ADD_FAILURE() << "unscalable: " << d.message;
        if (c.marker.empty()) {
            EXPECT_NE(s.text().find(c.field), std::string::npos);
            continue;
        }
        double expected = std::pow(kKm, c.a) * std::pow(kKf, c.b);
        std::vector<const Change*> hits;
        for (const auto& ch : s.result.changes)
            if (ch.old_text == c.marker) hits.push_back(&ch);
        if (expected == 1) {
            EXPECT_TRUE(hits.empty()) << "changed to " << hits.front()->new_text;
            EXPECT_NE(s.text().find(c.marker), std::string::npos);
            continue;
        }
        ASSERT_EQ(hits.size(), 1u) << s.text();
        double old_value = test::number_value(c.marker);
        double new_value = test::number_value(hits.front()->new_text);
        EXPECT_TRUE(test::close_to(new_value, old_value * expected, 1e-6))
            << c.marker << " -> " << hits.front()->new_text << ", expected x" << expected;
        EXPECT_TRUE(test::close_to(hits.front()->factor, expected, 1e-12));
    }
}

TEST(RulesTest, FindRuleIsExactAndLowerCase) {
    EXPECT_EQ(find_rule("r", "value"), Unit::ohm);
    EXPECT_EQ(find_rule(".options", "scale"), Unit::none);  // geometry, not Km
    EXPECT_FALSE(find_rule("r", "VALUE").has_value());
    EXPECT_FALSE(find_rule("q", "area").has_value());
}

TEST(RulesTest, NoDuplicateRows) {
    std::set<std::pair<std::string_view, std::string_view>> seen;
    for (const auto& r : rule_table())
        EXPECT_TRUE(seen.insert({r.scope, r.field}).second) << r.scope << " " << r.field;
}

}  // namespace
}  // namespace deckscale
