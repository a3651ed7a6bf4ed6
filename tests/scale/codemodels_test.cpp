// Tests of the code-model card handlers: vectors rewritten element by element, defaults that
// carry units written out, unknown parameter names as errors, models shared by instances of
// different port types, the cases refused with their reasons, and clamps inside models
// (shared notes "codemodel-rules.md" §1, §2, §6, pitfalls 2, 4 and 7).
#include <gtest/gtest.h>

#include "support/scale.hpp"

namespace deckscale {
namespace {

std::string scaled(const std::string& cards, double km, double kf) {
    return test::scale_text("t\n" + cards + ".end\n", km, kf).text();
}

TEST(CodeModelsTest, VectorsAreRewrittenElementByElement) {
    // pwl with a current output: y_array x1/Km (Km = 2), the x axis (a voltage) stays.
    struct Row {
        int line;
        std::string model, expected;
    };
    const Row rows[] = {
        {__LINE__, ".model p pwl(x_array=[0 1] y_array=[1 2])\n",
         ".model p pwl(x_array=[0 1] y_array=[0.5 1])\n"},
        {__LINE__, ".model p pwl(x_array=[0,1] y_array=[1,2])\n",
         ".model p pwl(x_array=[0,1] y_array=[0.5,1])\n"},
        {__LINE__, ".model p pwl(x_array=[ 0 1 ] y_array=[ 1m , -1m ])\n",
         ".model p pwl(x_array=[ 0 1 ] y_array=[ 500u , -500u ])\n"},
        {__LINE__, ".model p pwl(x_array=[0 1]\n+ y_array=[{a} 4])\n",
         ".model p pwl(x_array=[0 1]\n+ y_array=[{(a)/2} 2])\n"},
        {__LINE__, ".model p pwl(x_array=[0 1] y_array=[3])\n",
         ".model p pwl(x_array=[0 1] y_array=[1.5])\n"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "codemodels_test.cpp:" << r.line);
        EXPECT_EQ(scaled(".param a=1\na1 %v(x) %i(o) p\n" + r.model, 2, 1),
                  "t\n.param a=1\na1 %v(x) %i(o) p\n" + r.expected + ".end\n");
    }
}

TEST(CodeModelsTest, DefaultsThatCarryUnitsAreWrittenOut) {
    struct Row {
        int line;
        std::string cards, expected;
        double km, kf;
    };
    const Row rows[] = {
        // gain v -> i: the default gain 1 is 1 S; Km = 2 makes it 0.5 S.
        {__LINE__, "a1 %v(x) %i(o) g\n.model g gain(in_offset=0.1)\n",
         "a1 %v(x) %i(o) g\n.model g gain(in_offset=0.1 gain=0.5)\n", 2, 1},
        {__LINE__, "a1 %v(x) %i(o) g\n.model g gain\n",
         "a1 %v(x) %i(o) g\n.model g gain(gain=0.5)\n", 2, 1},
        {__LINE__, "a1 %v(x) %v(o) g\n.model g gain\n", "a1 %v(x) %v(o) g\n.model g gain\n", 2, 1},
        // s_xfer: denormalized_freq defaults to 1 rad/s and moves by Kf.
        {__LINE__, "a1 x o f\n.model f s_xfer(num_coeff=[1] den_coeff=[1 1.4 1] int_ic=[0 0])\n",
         "a1 x o f\n.model f s_xfer(num_coeff=[1] den_coeff=[1 1.4 1] int_ic=[0 0] "
         "denormalized_freq=1000)\n",
         1, 1000},
        // summer: in_gain per input (default 1) x1/Fi, for the current input only.
        {__LINE__, "a1 [%v a %i b] o s\n.model s summer\n",
         "a1 [%v a %i b] o s\n.model s summer(in_gain=[1 0.5])\n", 0.5, 1},
        // limit: limit_range absolute by default (fraction=false), relative with fraction=true;
        // the default gain 1 is 1 S here.
        {__LINE__, "a1 x %i(o) l\n.model l limit(out_lower_limit=0 out_upper_limit=1)\n",
         "a1 x %i(o) l\n.model l limit(out_lower_limit=0 out_upper_limit=0.5 gain=0.5 "
         "limit_range=5e-07)\n",
         2, 1},
        {__LINE__, "a1 x %i(o) l\n.model l limit(gain=2 out_upper_limit=1 fraction=true)\n",
         "a1 x %i(o) l\n.model l limit(gain=1 out_upper_limit=0.5 fraction=true)\n", 2, 1},
        // dac_bridge: out_undef is the midpoint when out_low and out_high are both given.
        {__LINE__, "a1 [d] [%i o] b\n.model b dac_bridge(out_low=0 out_high=2)\n",
         "a1 [d] [%i o] b\n.model b dac_bridge(out_low=0 out_high=1 t_rise=5e-10 t_fall=5e-10)\n",
         2, 2},
        {__LINE__, "a1 [d] [%i o] b\n.model b dac_bridge(out_high=2)\n",
         "a1 [d] [%i o] b\n.model b dac_bridge(out_high=1 out_undef=0.25)\n", 2, 1},
        // core: the flux limits (default 0 and 1) are read in mode 2 only.
        {__LINE__, "a1 (m 0) c\n.model c core(mode=2 area=1 length=1)\n",
         "a1 (m 0) c\n.model c core(mode=2 area=0.5 length=1 out_upper_limit=0.5)\n", 2, 1},
        {__LINE__, "a1 (m 0) c\n.model c core(area=1 length=1)\n",
         "a1 (m 0) c\n.model c core(area=0.5 length=1)\n", 2, 1},
        // Digital delays default to 1 ns.
        {__LINE__, "a1 x y inv\n.model inv d_inverter (rise_delay=2n)\n",
         "a1 x y inv\n.model inv d_inverter (rise_delay=1n fall_delay=5e-10)\n", 1, 2},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "codemodels_test.cpp:" << r.line);
        EXPECT_EQ(scaled(r.cards, r.km, r.kf), "t\n" + r.expected + ".end\n");
    }
}

TEST(CodeModelsTest, FactorsOfOneReproduceTheDeckByteForByte) {
    const std::string deck =
        "t\r\na1 [%v in %i ni %vd a 0] %i(o1) sm\r\n.model sm summer(in_offset=[0.1 1m 0]\r\n"
        "+ in_gain=[1 2 3] out_gain=2m)\r\naC (r2 0) ccap\r\n.model ccap capacitoric(c=1n)\r\n"
        "a5 %v(x) %i(y) s5\r\n.model s5 s_xfer(num_coeff=[1] den_coeff=[1 1] "
        "int_ic=[0])\r\n.end\r\n";
    auto s = test::scale_text(deck, 1, 1);
    EXPECT_EQ(s.text(), deck);
    EXPECT_TRUE(s.result.unscalable.empty());
}

TEST(CodeModelsTest, UnknownParameterIsAnErrorWithItsLocation) {
    // ngspice 39 ignores a parameter name the model does not have, without a word.
    const std::string deck =
        "t\na1 x o f\n.model f s_xfer(num_coeff=[1] den_coeff=[1 1]\n"
        "+ int_ic=[0] denormalised_freq=6283)\n.end\n";
    try {
        test::scale_text(deck, 1, 1000);
        ADD_FAILURE() << "no error";
    } catch (const DeckError& e) {
        EXPECT_EQ(render(e.diagnostic()),
                  "deck.cir:4:14: error: code model 's_xfer' has no parameter 'denormalised_freq' "
                  "(ngspice 39 would ignore it without a word)\n"
                  "  + int_ic=[0] denormalised_freq=6283)\n"
                  "               ^~~~~~~~~~~~~~~~~\n");
    }
}

TEST(CodeModelsTest, MalformedParametersAreErrorsWithTheirLocation) {
    struct Row {
        int line;
        std::string model, rendered;
    };
    const Row rows[] = {
        {__LINE__, ".model g gain(gain 2)\n",
         "deck.cir:3:15: error: expected name=value on a 'gain' model, found 'gain'\n"
         "  .model g gain(gain 2)\n"
         "                ^~~~\n"},
        {__LINE__, ".model g gain(gain=)\n",
         "deck.cir:3:15: error: 'gain=' has no value\n"
         "  .model g gain(gain=)\n"
         "                ^~~~\n"},
        {__LINE__, ".model g pwl(x_array=[0 1 y_array=[0 1])\n",
         "deck.cir:3:14: error: the vector of 'x_array' has no closing ']'\n"
         "  .model g pwl(x_array=[0 1 y_array=[0 1])\n"
         "               ^~~~~~~\n"},
        {__LINE__, ".model g gain(gain=true)\n",
         "deck.cir:3:20: error: bare name 'true' in a value of a dot card: ngspice 39 does not "
         "read a parameter name there; write {true}\n"
         "  .model g gain(gain=true)\n"
         "                     ^~~~\n"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "codemodels_test.cpp:" << r.line);
        try {
            test::scale_text("t\na1 x %i(o) g\n" + r.model + ".end\n", 2, 1);
            ADD_FAILURE() << "no error";
        } catch (const DeckError& e) {
            EXPECT_EQ(render(e.diagnostic()), r.rendered);
        }
    }
    // fraction given as an expression: whether ranges are absolute is not known.
    auto s = test::scale_text(
        "t\na1 x %i(o) l\n.model l limit(fraction={f} out_upper_limit=1)\n.end\n", 2, 1);
    ASSERT_EQ(s.result.unscalable.size(), 1u);
    EXPECT_EQ(render(s.result.unscalable[0]),
              "deck.cir:3:25: error: fraction is not a true/false literal: whether the model's "
              "ranges are absolute is not known\n"
              "  .model l limit(fraction={f} out_upper_limit=1)\n"
              "                          ^~~\n");
}

TEST(CodeModelsTest, ModelSharedByDifferentPortTypesGetsACopyPerSignature) {
    // codemodel-rules.md §1: a .model used by instances with different port-type signatures
    // needs one copy per signature; each copy follows its card, the instances are renamed.
    const std::string deck =
        "t\na1 %v(x) %v(o1) G\na2 %v(x) %i(o2) g\na3 %i(y) %i(o3) g\na4 %g(x) %id(o4 0) g\n"
        ".model G gain(gain=2 out_offset={p}) ; shared\nR1 o1 0 1k\n.end\n";
    auto s = test::scale_text(deck, 7, 1);
    EXPECT_TRUE(s.result.unscalable.empty());
    EXPECT_EQ(s.text(),
              "t\na1 %v(x) %v(o1) G\na2 %v(x) %i(o2) g_2\na3 %i(y) %i(o3) g_3\n"
              "a4 %g(x) %id(o4 0) g_2\n.model G gain(gain=2 out_offset={p}) ; shared\n"
              ".model G_2 gain(gain=0.2857143 out_offset={(p)/7}) ; shared\n"
              ".model G_3 gain(gain=2 out_offset={(p)/7}) ; shared\nR1 o1 0 7k\n.end\n");
    // A name already taken is skipped.
    auto t = test::scale_text("t\na1 x o1 g\na2 x %i(o2) g\n.model g gain\n.model g_2 gain\n.end\n",
                              7, 1);
    EXPECT_NE(t.text().find("a2 x %i(o2) g_3\n"), std::string::npos) << t.text();
    EXPECT_NE(t.text().find(".model g gain\n.model g_3 gain(gain=0.1428571)\n"), std::string::npos)
        << t.text();
}

TEST(CodeModelsTest, CopyFollowsDefaultsWrittenAtTheEndOfAnUnclosedLastCard) {
    // Found by the deck fuzz target (tests/fuzz/regressions/deck-summer-defaults-inserted-
    // twice.bin): the last card of a file with no line end leaves its '(' open, so the
    // defaults written out and the copy for other port types both go where the card ends.
    // They used to collide there ("overlapping edits", an internal error).
    const std::string head = "t\na2 [%i y] o2 sm\na1 [%v x] o1 sm\n";
    auto s = test::scale_text(head + ".model sm summer(out_gain=2", 7, 3);
    EXPECT_EQ(s.text(), "t\na2 [%i y] o2 sm\na1 [%v x] o1 sm_2\n"
                        ".model sm summer(out_gain=2 in_gain=[7]\n"
                        ".model sm_2 summer(out_gain=2");
    // The same with no parameters at all: the defaults open and close their own parentheses.
    auto t = test::scale_text(head + ".model sm summer", 7, 3);
    EXPECT_EQ(t.text(), "t\na2 [%i y] o2 sm\na1 [%v x] o1 sm_2\n"
                        ".model sm summer(in_gain=[7])\n.model sm_2 summer");
}

TEST(CodeModelsTest, CasesThatCannotBeScaledExactlyAreRefusedWithTheirReason) {
    struct Row {
        int line;
        std::string cards, reason;
    };
    const Row rows[] = {
        {__LINE__, "a1 %v(x) %i(o) m\n.model m slew\n", "slew's output follows its input 1:1"},
        {__LINE__, "a1\n.model m gain\n", "XSPICE A device without connections and model"},
        {__LINE__, "a1 x o nomodel\n.model m gain\n",
         "XSPICE A device whose model 'nomodel' is not"},
        {__LINE__, "a1 x o m\n.model m d\n",
         "XSPICE model type 'd' is not one of ngspice 39's code models"},
        {__LINE__, "a1 x o p m\n.model m gain\n",
         "cannot read the connections of this 'gain' device"},
        {__LINE__, "a1 %i(x) %v(o) c m\n.model m delay(delay=1u)\n", "delay passes its input"},
        {__LINE__, "a1 x o %i(c) m\n.model m delay(delay=1u)\n", "delay clamps its control input"},
        {__LINE__, "a1 x %i(u) l %v(o) m\n.model m climit\n", "climit uses cntl_upper directly"},
        {__LINE__, "a1 x u %i(l) o m\n.model m climit\n", "climit uses cntl_lower directly"},
        {__LINE__, "a1 k c %i(r) o m\n.model m oneshot(cntl_array=[0] pw_array=[1u])\n",
         "oneshot compares clear with clk_trig"},
        {__LINE__, "a1 [%vd(a 0) %id(b 0)] (o 0) m\n.model m multi_input_pwl(x=[0 1] y=[0 1])\n",
         "multi_input_pwl compares its inputs"},
        {__LINE__, "a1 [x %i y] [d1 d2] m\n.model m adc_bridge\n", "adc_bridge applies one in_low"},
        {__LINE__, "a1 %i(x) y o m\n.model m table2d(file=\"t.tbl\")\n", "table2d reads its axes"},
        {__LINE__, "a1 x y %i(z) o m\n.model m table3d(file=\"t.tbl\")\n",
         "table3d reads its axes"},
        {__LINE__,
         "a1 d null r dr\n.model dr d_to_real\na2 r %i(o1) m\na3 r %v(o2) m\n.model m real_to_v\n",
         "a real net here drives real_to_v outputs of different quantities"},
        {__LINE__, "a1 [a] m\n.model m d_source(input_load=1p)\n",
         "d_source reads its times from its input_file"},
        {__LINE__, "a1 [%vd(a 0)] %vd(o 0) m\n.model m spice2poly(coef=[0 1])\n",
         "spice2poly coefficients depend on the powers"},
        {__LINE__, "a1 x o m\n.model m lmeter\n", "lmeter returns gain*1e12 H"},
        // A digital port on an analog node: ngspice inserts a bridge with 1 ns delays (§12.6).
        {__LINE__, "R1 y 0 1k\na1 x ~y inv\n.model inv d_inverter\n",
         "digital node 'y' also connects analog elements"},
        {__LINE__, "V1 x 0 1\na1 %v(c) x osc\n.model osc d_osc(cntl_array=[0] freq_array=[1k])\n",
         "digital node 'x' also connects analog elements"},
        // A resistor on a magnetic loop's mmf node (codemodel-rules.md §5).
        {__LINE__, "a1 (p 0) (m 0) w\n.model w lcouple(num_turns=10)\nR1 m 0 1k\n",
         "magnetic loop node 'm' also connects an element other than a voltage source"},
        {__LINE__, "a2 (m n) c\n.model c core(area=1 length=1)\nRx n 0 1k\n",
         "magnetic loop node 'n' also connects an element"},
        // Clamps inside models: the scaled value would be cut (xtradev/pswitch/cfunc.mod,
        // xtradev/aswitch/cfunc.mod, analog/oneshot/cfunc.mod, xtradev/sidiode/cfunc.mod).
        {__LINE__, "a1 (c 0) (o 0) m\n.model m pswitch(r_on=1)\n",
         "default r_off=1e+12 would become 7e+12, above the pswitch model's ceiling of 1e+12"},
        {__LINE__, "a1 (c 0) (o 0) m\n.model m pswitch(r_off=1e12)\n",
         "r_off=1e+12 would become 7e+12, above"},
        {__LINE__, "a1 x (o 0) m\n.model m aswitch(r_on=1e-4 r_off=1e6)\n",
         "r_on=0.0001 would become 0.0007, below the aswitch model's floor of 0.001"},
        {__LINE__, "a1 %i(c) (o 0) m\n.model m aswitch(cntl_off=0 cntl_on=5e-12)\n",
         "cntl_on - cntl_off would become 7.142857e-13, below the 1e-12 the aswitch model accepts"},
        {__LINE__, "a1 k c r o m\n.model m oneshot(cntl_array=[0] pw_array=[1u] rise_time=1e-12)\n",
         "rise_time=1e-12 would become 3.333333e-13, below the oneshot model's floor of 1e-12"},
        {__LINE__, "a1 (d 0) m\n.model m sidiode(ilimit=2e28)\n",
         "which the sidiode model reads as 'no limit'"},
    };
    for (const auto& r : rows) {
        SCOPED_TRACE(testing::Message() << "codemodels_test.cpp:" << r.line << ": " << r.cards);
        // Km = 7 and Kf = 3 (the sidiode row: Km = 1/7).
        bool small_km = r.cards.find("sidiode") != std::string::npos;
        auto s = test::scale_text("t\n" + r.cards + ".end\n", small_km ? 1.0 / 7 : 7, 3);
        std::string all;
        for (const auto& d : s.result.unscalable) all += d.message + "\n";
        EXPECT_NE(all.find(r.reason), std::string::npos) << all;
    }
}

// d_source has no time-scale parameter (shared notes "codemodel-rules.md" §3: "write a new
// file"): its input file is named as a rewritten copy, once per card, with times x 1/Kf; a
// held model keeps its file, and Kf = 1 needs no copy.
TEST(CodeModelsTest, APatternSourceReadsARewrittenCopyOfItsFile) {
    const std::string deck = "t\na1 [a b] m\n.model m d_source(input_file=\"pat/seq.txt\" "
                             "input_load=1p)\n.end\n";
    auto s = test::scale_text(deck, 7, 1000);
    EXPECT_TRUE(s.result.unscalable.empty());
    EXPECT_NE(s.text().find("input_file=\"seq-scaled.txt\""), std::string::npos) << s.text();
    ASSERT_EQ(s.result.data_files.size(), 1u);
    const DataFileCopy& copy = s.result.data_files.front();
    EXPECT_EQ(copy.path, "pat/seq.txt");
    EXPECT_EQ(copy.copy, "seq-scaled.txt");
    EXPECT_DOUBLE_EQ(copy.time_factor, 1e-3);
    EXPECT_EQ(deck.substr(copy.offset, copy.size), "\"pat/seq.txt\"");
    EXPECT_TRUE(test::scale_text(deck, 7, 1).result.data_files.empty());
    // Unquoted, it stays unquoted.
    auto bare = test::scale_text("t\na1 [a] m\n.model m d_source(input_file=d/x.txt)\n.end\n", 2, 3);
    EXPECT_NE(bare.text().find("input_file=x-scaled.txt)"), std::string::npos) << bare.text();
    ScaleSettings held;
    held.factors = {7, 1000};
    held.hold = {"model:m"};
    auto h = test::scale_with(deck, held);
    EXPECT_TRUE(h.result.data_files.empty());
    EXPECT_NE(h.text().find("input_file=\"pat/seq.txt\""), std::string::npos) << h.text();
}

TEST(CodeModelsTest, ClampsAllowWhatStaysInside) {
    // Km < 1 keeps pswitch's default r_off below its clamp: it is written out scaled.
    EXPECT_EQ(
        scaled("a1 (c 0) (o 0) m\n.model m pswitch(r_on=2 r_off=1e9 r_cntl_in=1e9)\n", 0.5, 1),
        "t\na1 (c 0) (o 0) m\n.model m pswitch(r_on=1 r_off=5e8 r_cntl_in=5e8)\n.end\n");
    // sidiode: limits of 1e29 A and more mean "no limit" and stay as written.
    EXPECT_EQ(scaled("a1 (d 0) m\n.model m sidiode(ron=1 roff=1 ilimit=1e30 revilimit=2)\n", 2, 1),
              "t\na1 (d 0) m\n.model m sidiode(ron=2 roff=2 ilimit=1e30 revilimit=1)\n.end\n");
}

TEST(CodeModelsTest, ReadingWhileLoadingGivesTheSameResultAsAWholeDeck) {
    // The model comes before its instance, the instance's port types decide the factor.
    const std::string deck =
        "t\n.model g gain(gain=2 out_offset=1m)\nR1 x 0 1k\n"
        "a1 %v(x) %i(o) g\nR2 o 0 1k\n.end\n";
    MemoryFileSystem fs;
    fs.add("deck.cir", deck);
    ScaleSettings settings;
    settings.factors = {4, 10};
    ScaledDeck streamed = load_and_scale("deck.cir", fs, settings);
    auto whole = test::scale_text(deck, 4, 10);
    std::string text = apply_edits(streamed.deck.top().text(), streamed.result.edits[0]);
    EXPECT_EQ(text, whole.text());
    EXPECT_EQ(text,
              "t\n.model g gain(gain=0.5 out_offset=250u)\nR1 x 0 4k\n"
              "a1 %v(x) %i(o) g\nR2 o 0 4k\n.end\n");
}

TEST(CodeModelsTest, MagneticLoopGetsANoteAboutItsCurrents) {
    auto s = test::scale_text("t\na1 (p 0) (m 0) w\n.model w lcouple(num_turns=10)\n.end\n", 3, 2);
    EXPECT_NE(s.text().find("num_turns=30"), std::string::npos) << s.text();
    ASSERT_EQ(s.result.notes.size(), 1u);
    EXPECT_NE(s.result.notes[0].message.find("1/(Km*Kf)"), std::string::npos);
}

}  // namespace
}  // namespace deckscale
