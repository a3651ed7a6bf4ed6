// Tests of the code-model rule table: every parameter row has a deck here that uses it, with
// the port types that decide its unit, and scaling that deck multiplies the value by
// Km^a * Kf^b. The exponents are written here independently of the table, from the shared
// notes "codemodel-rules.md" §1-§5 (ngspice 39 manual ch. 12, Table 12.1), so a wrong factor
// in the table fails its row. codemodel_ngspice_test.cpp asks ngspice 39 itself (`devhelp`)
// which parameters each code model has.
#include "scale/codemodel_rules.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <set>

#include "support/scale.hpp"

namespace deckscale {
namespace {

struct ParamCase {
    int line;
    std::string type, param;
    std::string instance;  // the A card
    std::string value;     // written after "param="
    std::string marker;    // the element under test ("" for a word or a file name)
    int a, b;              // expected factor Km^a * Kf^b
    std::string extra;     // further parameters on the card
    bool refused = false;  // the instance is reported as not exactly scalable
    std::string renamed;   // a file name's new value ("" when it stays)
};

constexpr double kKm = 7, kKf = 300;

std::vector<ParamCase> param_cases() {
    std::vector<ParamCase> v;
    auto add = [&](int line, std::string type, std::string param, std::string inst, int a, int b,
                   std::string extra = "") {
        v.push_back({line, type, param, inst, "3.17", "3.17", a, b, extra});
    };
    auto vec = [&](int line, std::string type, std::string param, std::string inst,
                   std::string value, std::string marker, int a, int b) {
        v.push_back({line, type, param, inst, value, marker, a, b, ""});
    };
    auto word = [&](int line, std::string type, std::string param, std::string inst,
                    std::string value) {
        v.push_back({line, type, param, inst, value, "", 0, 0, ""});
    };
    // ---- gain: in ×Fi, gain ×Fo/Fi, out ×Fo (Table 12.1: %i reads/drives a current) ----
    const std::string vv = "a1 %v(in) %v(o) m1", vi = "a1 %v(in) %i(o) m1",
                      iv = "a1 %i(in) %v(o) m1", ii = "a1 %i(in) %i(o) m1";
    add(__LINE__, "gain", "in_offset", iv, -1, 0);
    add(__LINE__, "gain", "gain", vv, 0, 0);
    add(__LINE__, "gain", "gain", vi, -1, 0);
    add(__LINE__, "gain", "gain", iv, 1, 0);
    add(__LINE__, "gain", "gain", ii, 0, 0);
    add(__LINE__, "gain", "gain", "a1 %vnam(vs) %vd(o 0) m1", 1, 0);
    add(__LINE__, "gain", "out_offset", vi, -1, 0);
    // ---- summer, mult: per input element; out_gain carries Fo ----
    for (std::string t : {"summer", "mult"}) {
        const std::string inst = "a1 [%v in %i ni] %i(o) m1";
        vec(__LINE__, t, "in_offset", inst, "[3.17 4.19]", "3.17", 0, 0);
        vec(__LINE__, t, "in_offset", inst, "[3.17 4.19]", "4.19", -1, 0);
        vec(__LINE__, t, "in_gain", inst, "[3.17 4.19]", "3.17", 0, 0);
        vec(__LINE__, t, "in_gain", inst, "[3.17 4.19]", "4.19", 1, 0);
        add(__LINE__, t, "out_gain", inst, -1, 0);
        add(__LINE__, t, "out_offset", inst, -1, 0);
    }
    // ---- divide ----
    const std::string dv = "a1 %i(n) %i(d) %i(o) m1";
    add(__LINE__, "divide", "num_offset", dv, -1, 0);
    add(__LINE__, "divide", "num_gain", dv, 1, 0);
    add(__LINE__, "divide", "den_offset", dv, -1, 0);
    add(__LINE__, "divide", "den_gain", dv, 1, 0);
    add(__LINE__, "divide", "den_lower_limit", dv, 0, 0);
    add(__LINE__, "divide", "den_domain", dv, 0, 0);
    word(__LINE__, "divide", "fraction", dv, "true");
    add(__LINE__, "divide", "out_gain", dv, -1, 0);
    add(__LINE__, "divide", "out_offset", dv, -1, 0);
    // ---- limit, climit: limit_range absolute unless fraction=true ----
    for (std::string t : {"limit", "climit"}) {
        std::string inst = t == "limit" ? vi : "a1 %v(in) %i(u) %i(l) %i(o) m1";
        add(__LINE__, t, "in_offset", inst, 0, 0);
        add(__LINE__, t, "gain", inst, -1, 0);
        add(__LINE__, t, "limit_range", inst, -1, 0);
        add(__LINE__, t, "limit_range", inst, 0, 0, "fraction=true ");
        word(__LINE__, t, "fraction", inst, "false");
    }
    add(__LINE__, "limit", "out_lower_limit", vi, -1, 0);
    add(__LINE__, "limit", "out_upper_limit", vi, -1, 0);
    add(__LINE__, "climit", "upper_delta", "a1 %v(in) %i(u) %i(l) %i(o) m1", -1, 0);
    add(__LINE__, "climit", "lower_delta", "a1 %v(in) %i(u) %i(l) %i(o) m1", -1, 0);
    // ---- pwl, pwlts: input_domain relative unless fraction=false ----
    vec(__LINE__, "pwl", "x_array", iv, "[-1 3.17]", "3.17", -1, 0);
    vec(__LINE__, "pwl", "y_array", vi, "[-1 3.17]", "3.17", -1, 0);
    add(__LINE__, "pwl", "input_domain", iv, 0, 0);
    add(__LINE__, "pwl", "input_domain", iv, -1, 0, "fraction=false ");
    word(__LINE__, "pwl", "fraction", iv, "true");
    word(__LINE__, "pwl", "limit", iv, "true");
    vec(__LINE__, "pwlts", "x_array", "a1 %i(o) m1", "[0 3.17]", "3.17", 0, -1);
    vec(__LINE__, "pwlts", "y_array", "a1 %i(o) m1", "[0 3.17]", "3.17", -1, 0);
    add(__LINE__, "pwlts", "input_domain", "a1 %i(o) m1", 0, 0);
    add(__LINE__, "pwlts", "input_domain", "a1 %i(o) m1", 0, -1, "fraction=false ");
    word(__LINE__, "pwlts", "fraction", "a1 %i(o) m1", "true");
    word(__LINE__, "pwlts", "limit", "a1 %i(o) m1", "false");
    // ---- filesource: one amplitude column per output element ----
    const std::string fs = "a1 [%v o1 %i o2] m1";
    add(__LINE__, "filesource", "timeoffset", fs, 0, -1);
    add(__LINE__, "filesource", "timescale", fs, 0, -1);
    word(__LINE__, "filesource", "timerelative", fs, "true");
    word(__LINE__, "filesource", "amplstep", fs, "true");
    vec(__LINE__, "filesource", "amploffset", fs, "[3.17 4.19]", "3.17", 0, 0);
    vec(__LINE__, "filesource", "amploffset", fs, "[3.17 4.19]", "4.19", -1, 0);
    vec(__LINE__, "filesource", "amplscale", fs, "[3.17 4.19]", "4.19", -1, 0);
    word(__LINE__, "filesource", "file", fs, "\"wave.txt\"");
    // ---- multi_input_pwl ----
    const std::string mp = "a1 [%id(a 0) %id(b 0)] %id(o 0) m1";
    vec(__LINE__, "multi_input_pwl", "x", mp, "[0 3.17]", "3.17", -1, 0);
    vec(__LINE__, "multi_input_pwl", "y", mp, "[0 3.17]", "3.17", -1, 0);
    word(__LINE__, "multi_input_pwl", "model", mp, "\"and\"");
    // ---- aswitch, pswitch ----
    const std::string as = "a1 %i(c) (o 0) m1", ps = "a1 %gd(c 0) %gd(o 0) m1";
    add(__LINE__, "aswitch", "cntl_off", as, -1, 0);
    add(__LINE__, "aswitch", "cntl_on", as, -1, 0);
    word(__LINE__, "aswitch", "log", as, "false");
    add(__LINE__, "aswitch", "r_off", as, 1, 0);
    add(__LINE__, "aswitch", "r_on", as, 1, 0);
    word(__LINE__, "aswitch", "limit", as, "true");
    // pswitch clamps r_off at 1e12 (its default): keep Km r_off below that.
    add(__LINE__, "pswitch", "cntl_off", ps, 0, 0, "r_off=1e9 ");
    add(__LINE__, "pswitch", "cntl_on", ps, 0, 0, "r_off=1e9 ");
    v.push_back({__LINE__, "pswitch", "log", ps, "true", "", 0, 0, "r_off=1e9 "});
    add(__LINE__, "pswitch", "r_off", ps, 1, 0);
    add(__LINE__, "pswitch", "r_on", ps, 1, 0, "r_off=1e9 ");
    add(__LINE__, "pswitch", "r_cntl_in", ps, 1, 0, "r_off=1e9 ");
    // ---- zener, sidiode, memristor, potentiometer, capacitoric, inductoric ----
    const std::string z = "a1 (z 0) m1";
    add(__LINE__, "zener", "v_breakdown", z, 0, 0);
    add(__LINE__, "zener", "i_breakdown", z, -1, 0);
    add(__LINE__, "zener", "r_breakdown", z, 1, 0);
    add(__LINE__, "zener", "i_rev", z, -1, 0);
    add(__LINE__, "zener", "i_sat", z, -1, 0);
    add(__LINE__, "zener", "n_forward", z, 0, 0);
    word(__LINE__, "zener", "limit_switch", z, "true");
    for (std::string p : {"ron", "roff", "rrev"}) add(__LINE__, "sidiode", p, z, 1, 0);
    for (std::string p : {"vfwd", "vrev", "epsilon", "revepsilon"})
        add(__LINE__, "sidiode", p, z, 0, 0);
    for (std::string p : {"ilimit", "revilimit"}) add(__LINE__, "sidiode", p, z, -1, 0);
    for (std::string p : {"rmin", "rmax", "rinit"}) add(__LINE__, "memristor", p, z, 1, 0);
    for (std::string p : {"alpha", "beta"}) add(__LINE__, "memristor", p, z, 1, 1);
    add(__LINE__, "memristor", "vt", z, 0, 0);
    const std::string pot = "a1 r0 w r1 m1";
    add(__LINE__, "potentiometer", "r", pot, 1, 0);
    add(__LINE__, "potentiometer", "position", pot, 0, 0);
    word(__LINE__, "potentiometer", "log", pot, "true");
    add(__LINE__, "potentiometer", "log_multiplier", pot, 0, 0);
    add(__LINE__, "capacitoric", "c", z, -1, -1);
    add(__LINE__, "capacitoric", "ic", z, 0, 0);
    add(__LINE__, "inductoric", "l", z, 1, -1);
    add(__LINE__, "inductoric", "ic", z, -1, 0);
    // ---- ilimit: its internal target is a voltage ----
    const std::string il = "a1 %i(x) vp vn o m1";
    add(__LINE__, "ilimit", "in_offset", il, -1, 0);
    add(__LINE__, "ilimit", "gain", il, 1, 0);
    for (std::string p : {"r_out_source", "r_out_sink"}) add(__LINE__, "ilimit", p, il, 1, 0);
    for (std::string p : {"i_limit_source", "i_limit_sink", "i_source_range", "i_sink_range"})
        add(__LINE__, "ilimit", p, il, -1, 0);
    add(__LINE__, "ilimit", "v_pwr_range", il, 0, 0);
    add(__LINE__, "ilimit", "r_out_domain", il, 0, 0);
    // ---- hyst ----
    for (std::string p : {"in_low", "in_high", "hyst"}) add(__LINE__, "hyst", p, iv, -1, 0);
    for (std::string p : {"out_lower_limit", "out_upper_limit"})
        add(__LINE__, "hyst", p, vi, -1, 0);
    add(__LINE__, "hyst", "input_domain", iv, 0, 0);
    add(__LINE__, "hyst", "input_domain", iv, -1, 0, "fraction=false ");
    word(__LINE__, "hyst", "fraction", iv, "true");
    // ---- d_dt: gain ×Fo/(Fi Kf); int: gain ×Fo Kf/Fi ----
    add(__LINE__, "d_dt", "gain", vi, -1, -1);
    for (std::string p : {"out_offset", "out_lower_limit", "out_upper_limit", "limit_range"})
        add(__LINE__, "d_dt", p, vi, -1, 0);
    add(__LINE__, "int", "gain", vi, -1, 1);
    add(__LINE__, "int", "gain", iv, 1, 1);
    add(__LINE__, "int", "in_offset", iv, -1, 0);
    for (std::string p : {"out_lower_limit", "out_upper_limit", "limit_range", "out_ic"})
        add(__LINE__, "int", p, vi, -1, 0);
    // ---- s_xfer: coefficients kept, denormalized_freq ×Kf, int_ic[k] ×Fo Kf^(n-1-k) ----
    add(__LINE__, "s_xfer", "in_offset", iv, -1, 0);
    add(__LINE__, "s_xfer", "gain", vi, -1, 0);
    vec(__LINE__, "s_xfer", "num_coeff", vi, "[3.17]", "3.17", 0, 0);
    vec(__LINE__, "s_xfer", "den_coeff", vi, "[1 3.17 1]", "3.17", 0, 0);
    vec(__LINE__, "s_xfer", "int_ic", vi, "[3.17 4.19]", "3.17", -1, 1);
    vec(__LINE__, "s_xfer", "int_ic", vi, "[3.17 4.19]", "4.19", -1, 0);
    add(__LINE__, "s_xfer", "denormalized_freq", vi, 0, 1);
    // ---- slew: slopes ×Fo Kf ----
    add(__LINE__, "slew", "rise_slope", ii, -1, 1);
    add(__LINE__, "slew", "fall_slope", ii, -1, 1);
    // ---- lcouple, core: the magnetic loop with n = Km (codemodel-rules.md §5) ----
    add(__LINE__, "lcouple", "num_turns", "a1 (l 0) (m 0) m1", 1, 0);
    const std::string core = "a1 (m1 m2) m1";
    vec(__LINE__, "core", "h_array", core, "[0 3.17]", "3.17", 0, 0);
    vec(__LINE__, "core", "b_array", core, "[0 3.17]", "3.17", 0, 0);
    add(__LINE__, "core", "area", core, -1, -1);
    for (std::string p : {"length", "input_domain", "mode", "in_low", "in_high", "hyst"})
        add(__LINE__, "core", p, core, 0, 0);
    word(__LINE__, "core", "fraction", core, "true");
    for (std::string p : {"out_lower_limit", "out_upper_limit"})
        add(__LINE__, "core", p, core, -1, -1);
    // ---- oscillators ----
    for (std::string t : {"sine", "triangle", "square"}) {
        const std::string inst = "a1 %i(c) %i(o) m1";
        vec(__LINE__, t, "cntl_array", inst, "[0 3.17]", "3.17", -1, 0);
        vec(__LINE__, t, "freq_array", inst, "[1 3.17]", "3.17", 0, 1);
        add(__LINE__, t, "out_low", inst, -1, 0);
        add(__LINE__, t, "out_high", inst, -1, 0);
        if (t != "sine") add(__LINE__, t, "duty_cycle", inst, 0, 0);
    }
    add(__LINE__, "square", "rise_time", "a1 c o m1", 0, -1);
    add(__LINE__, "square", "fall_time", "a1 c o m1", 0, -1);
    const std::string os = "a1 %i(k) %v(c) %i(r) %i(o) m1";
    vec(__LINE__, "oneshot", "cntl_array", os, "[0 3.17]", "3.17", 0, 0);
    vec(__LINE__, "oneshot", "pw_array", os, "[1 3.17]", "3.17", 0, -1);
    add(__LINE__, "oneshot", "clk_trig", os, -1, 0);
    word(__LINE__, "oneshot", "pos_edge_trig", os, "true");
    add(__LINE__, "oneshot", "out_low", os, -1, 0);
    add(__LINE__, "oneshot", "out_high", os, -1, 0);
    for (std::string p : {"rise_time", "fall_time", "rise_delay", "fall_delay"})
        add(__LINE__, "oneshot", p, os, 0, -1);
    word(__LINE__, "oneshot", "retrig", os, "true");
    // ---- meters: output per farad / per henry ----
    add(__LINE__, "cmeter", "gain", "a1 x o m1", 1, 1);
    v.push_back({__LINE__, "lmeter", "gain", "a1 x o m1", "3.17", "3.17", -1, 1, "", true});
    // ---- table2d/3d: out = offset + gain*table, a current by default ----
    for (std::string t : {"table2d", "table3d"}) {
        std::string inst = t == "table2d" ? "a1 x y o m1" : "a1 x y z o m1";
        add(__LINE__, t, "gain", inst, -1, 0);
        add(__LINE__, t, "offset", inst, -1, 0);
        add(__LINE__, t, "order", inst, 0, 0);
        add(__LINE__, t, "verbose", inst, 0, 0);
        word(__LINE__, t, "file", inst, "\"t.tbl\"");
    }
    // ---- delay ----
    for (std::string p : {"delay", "delmin", "delmax"})
        add(__LINE__, "delay", p, "a1 in o c m1", 0, -1);
    add(__LINE__, "delay", "buffer_size", "a1 in o c m1", 0, 0);
    word(__LINE__, "delay", "has_delay_cnt", "a1 in o c m1", "true");
    // ---- spice2poly: refused when Km != 1 (scale the POLY card instead) ----
    v.push_back({__LINE__, "spice2poly", "coef", "a1 [%vd(a 0)] %vd(o 0) m1", "[0 3.17]", "3.17", 0,
                 0, "", true});
    // ---- bridges ----
    add(__LINE__, "adc_bridge", "in_low", "a1 [%i x] [d] m1", -1, 0);
    add(__LINE__, "adc_bridge", "in_high", "a1 [%i x] [d] m1", -1, 0);
    for (std::string p : {"rise_delay", "fall_delay"})
        add(__LINE__, "adc_bridge", p, "a1 [x] [d] m1", 0, -1);
    for (std::string p : {"out_low", "out_high", "out_undef"})
        add(__LINE__, "dac_bridge", p, "a1 [d] [%i o] m1", -1, 0);
    add(__LINE__, "dac_bridge", "input_load", "a1 [d] [o] m1", -1, -1);
    for (std::string p : {"t_rise", "t_fall"})
        add(__LINE__, "dac_bridge", p, "a1 [d] [o] m1", 0, -1);
    const std::string bb = "a1 [a] [d] null m1";
    for (std::string p :
         {"direction", "strength", "smooth", "in_low", "in_high", "out_low", "out_high"})
        add(__LINE__, "bidi_bridge", p, bb, 0, 0);
    add(__LINE__, "bidi_bridge", "input_load", bb, -1, -1);
    for (std::string p : {"drive_low", "drive_high"}) add(__LINE__, "bidi_bridge", p, bb, -1, 0);
    for (std::string p : {"r_stl", "r_sth", "r_low", "r_high"})
        add(__LINE__, "bidi_bridge", p, bb, 1, 0);
    for (std::string p : {"t_rise", "t_fall", "rise_delay", "fall_delay"})
        add(__LINE__, "bidi_bridge", p, bb, 0, -1);
    // ---- d_osc, d_pwm ----
    vec(__LINE__, "d_osc", "cntl_array", "a1 %i(c) q m1", "[0 3.17]", "3.17", -1, 0);
    vec(__LINE__, "d_osc", "freq_array", "a1 %i(c) q m1", "[1 3.17]", "3.17", 0, 1);
    vec(__LINE__, "d_pwm", "cntl_array", "a1 %i(c) q m1", "[0 3.17]", "3.17", -1, 0);
    vec(__LINE__, "d_pwm", "dc_array", "a1 %i(c) q m1", "[0 0.317]", "0.317", 0, 0);
    add(__LINE__, "d_pwm", "frequency", "a1 c q m1", 0, 1);
    for (std::string t : {"d_osc", "d_pwm"}) {
        add(__LINE__, t, "init_phase", "a1 c q m1", 0, 0);
        add(__LINE__, t, "rise_delay", "a1 c q m1", 0, -1);
        add(__LINE__, t, "fall_delay", "a1 c q m1", 0, -1);
    }
    add(__LINE__, "d_osc", "duty_cycle", "a1 c q m1", 0, 0);
    // ---- real nets: values take the factor of the real_to_v output they drive (§4) ----
    const std::string to_v = "\nav r %v(o) rv\n.model rv real_to_v",
                      to_i = "\nav r %i(o) rv\n.model rv real_to_v";
    add(__LINE__, "d_to_real", "zero", "a1 d null r m1" + to_v, 0, 0);
    add(__LINE__, "d_to_real", "zero", "a1 d null r m1" + to_i, -1, 0);
    add(__LINE__, "d_to_real", "one", "a1 d null r m1" + to_i, -1, 0);
    add(__LINE__, "d_to_real", "delay", "a1 d null r m1", 0, -1);
    add(__LINE__, "real_delay", "delay", "a1 q k r m1" + to_i, 0, -1);
    // the net before a real_gain carries the same unit as the one after it
    for (std::string p : {"in_offset", "out_offset", "ic"})
        add(__LINE__, "real_gain", p, "a1 q r m1" + to_i, -1, 0);
    add(__LINE__, "real_gain", "in_offset", "a1 q r m1" + to_v, 0, 0);
    add(__LINE__, "real_gain", "gain", "a1 q r m1" + to_i, 0, 0);
    add(__LINE__, "real_gain", "delay", "a1 q r m1", 0, -1);
    add(__LINE__, "real_to_v", "gain", "a1 r %v(o) m1", 0, 0);
    add(__LINE__, "real_to_v", "transition_time", "a1 r %v(o) m1", 0, -1);
    // ---- digital models: every *_delay ÷Kf, every load ÷(Km Kf) ----
    const std::string dg = "a1 [x y] z m1";
    for (std::string t : {"d_and", "d_nand", "d_or", "d_nor", "d_xor", "d_xnor", "d_buffer",
                          "d_inverter", "d_lut", "d_genlut"}) {
        add(__LINE__, t, "rise_delay", dg, 0, -1);
        add(__LINE__, t, "fall_delay", dg, 0, -1);
        add(__LINE__, t, "input_load", dg, -1, -1);
    }
    for (std::string t : {"d_lut", "d_genlut"}) word(__LINE__, t, "table_values", dg, "\"0001\"");
    add(__LINE__, "d_genlut", "input_delay", dg, 0, -1);
    for (auto [t, d] : {std::pair{"d_open_c", "fall_delay"}, std::pair{"d_open_e", "rise_delay"}}) {
        add(__LINE__, t, d, dg, 0, -1);
        add(__LINE__, t, "open_delay", dg, 0, -1);
        add(__LINE__, t, "input_load", dg, -1, -1);
    }
    add(__LINE__, "d_tristate", "delay", dg, 0, -1);
    add(__LINE__, "d_tristate", "input_load", dg, -1, -1);
    add(__LINE__, "d_tristate", "enable_load", dg, -1, -1);
    add(__LINE__, "d_pullup", "load", "a1 z m1", -1, -1);
    add(__LINE__, "d_pulldown", "load", "a1 z m1", -1, -1);
    for (auto [t, in] : {std::pair{"d_dff", "data_load"}, std::pair{"d_jkff", "jk_load"},
                         std::pair{"d_tff", "t_load"}, std::pair{"d_srff", "sr_load"}}) {
        for (std::string p : {"clk_delay", "set_delay", "reset_delay", "rise_delay", "fall_delay"})
            add(__LINE__, t, p, dg, 0, -1);
        add(__LINE__, t, "ic", dg, 0, 0);
        for (std::string p : {std::string(in), std::string("clk_load"), std::string("set_load"),
                              std::string("reset_load")})
            add(__LINE__, t, p, dg, -1, -1);
    }
    for (auto [t, in] : {std::pair{"d_dlatch", "data"}, std::pair{"d_srlatch", "sr"}}) {
        for (std::string p :
             {std::string(in) + "_delay", std::string("enable_delay"), std::string("set_delay"),
              std::string("reset_delay"), std::string("rise_delay"), std::string("fall_delay")})
            add(__LINE__, t, p, dg, 0, -1);
        add(__LINE__, t, "ic", dg, 0, 0);
        for (std::string p : {std::string(in) + "_load", std::string("enable_load"),
                              std::string("set_load"), std::string("reset_load")})
            add(__LINE__, t, p, dg, -1, -1);
    }
    for (std::string p : {"clk_delay", "reset_delay"}) add(__LINE__, "d_state", p, dg, 0, -1);
    word(__LINE__, "d_state", "state_file", dg, "\"s.in\"");
    add(__LINE__, "d_state", "reset_state", dg, 0, 0);
    for (std::string p : {"input_load", "clk_load", "reset_load"})
        add(__LINE__, "d_state", p, dg, -1, -1);
    for (std::string p : {"div_factor", "high_cycles", "i_count"})
        add(__LINE__, "d_fdiv", p, dg, 0, 0);
    for (std::string p : {"rise_delay", "fall_delay"}) add(__LINE__, "d_fdiv", p, dg, 0, -1);
    add(__LINE__, "d_fdiv", "freq_in_load", dg, -1, -1);
    add(__LINE__, "d_ram", "select_value", dg, 0, 0);
    add(__LINE__, "d_ram", "ic", dg, 0, 0);
    add(__LINE__, "d_ram", "read_delay", dg, 0, -1);
    for (std::string p : {"data_load", "address_load", "select_load", "enable_load"})
        add(__LINE__, "d_ram", p, dg, -1, -1);
    // d_source keeps its times in its input file: a rewritten copy when Kf != 1.
    v.push_back(
        {__LINE__, "d_source", "input_file", dg, "\"d.txt\"", "", 0, 0, "", false, "\"d-scaled.txt\""});
    v.push_back({__LINE__, "d_source", "input_load", dg, "3.17", "3.17", -1, -1,
                 "input_file=\"d.txt\" "});
    return v;
}

TEST(CodeModelRulesTest, EveryParameterOfTheTableHasATestCard) {
    std::set<std::pair<std::string, std::string>> covered;
    for (const auto& c : param_cases()) covered.insert({c.type, c.param});
    for (const auto& r : code_model_params())
        EXPECT_TRUE(covered.count({std::string(r.type), std::string(r.name)}))
            << "no test card for (" << r.type << ", " << r.name << ")";
    for (const auto& c : param_cases())
        EXPECT_NE(find_code_model_param(c.type, c.param), nullptr)
            << "line " << c.line << ": (" << c.type << ", " << c.param << ") is not in the table";
}

TEST(CodeModelRulesTest, EachParameterScalesByItsPortsAndUnit) {
    for (const auto& c : param_cases()) {
        std::string deck = "code model test\n" + c.instance + "\n.model m1 " + c.type + "(" +
                           c.extra + c.param + "=" + c.value + ")\n.end\n";
        SCOPED_TRACE(testing::Message() << "codemodel_rules_test.cpp:" << c.line << ": " << deck);
        test::Scaled s;
        try {
            s = test::scale_text(deck, kKm, kKf);
        } catch (const DeckError& e) {
            ADD_FAILURE() << "DeckError: " << e.what();
            continue;
        }
        EXPECT_EQ(!s.result.unscalable.empty(), c.refused);
        if (!c.refused)
            for (const auto& d : s.result.unscalable) ADD_FAILURE() << "unscalable: " << d.message;
        if (c.marker.empty()) {
            EXPECT_NE(s.text().find(c.param + "=" + (c.renamed.empty() ? c.value : c.renamed)),
                      std::string::npos)
                << s.text();
            continue;
        }
        double expected = std::pow(kKm, c.a) * std::pow(kKf, c.b);
        std::vector<const Change*> hits;
        for (const auto& ch : s.result.changes)
            if (ch.old_text == c.marker) hits.push_back(&ch);
        if (expected == 1) {
            EXPECT_TRUE(hits.empty()) << "changed to " << hits.front()->new_text;
            continue;
        }
        ASSERT_EQ(hits.size(), 1u) << s.text();
        double new_value = test::number_value(hits.front()->new_text);
        EXPECT_TRUE(test::close_to(new_value, test::number_value(c.marker) * expected, 1e-6))
            << c.marker << " -> " << hits.front()->new_text << ", expected x" << expected;
    }
}

TEST(CodeModelRulesTest, NoDuplicateRowsAndEveryTypeHasItsParameters) {
    std::set<std::pair<std::string_view, std::string_view>> seen;
    for (const auto& r : code_model_params()) {
        EXPECT_TRUE(seen.insert({r.type, r.name}).second) << r.type << " " << r.name;
        EXPECT_NE(find_code_model(r.type), nullptr) << r.type;
    }
    EXPECT_EQ(code_model_types().size(), 70u);
    EXPECT_EQ(code_model_params().size(), 367u);
    for (const auto& r : code_model_refusals())
        EXPECT_NE(find_code_model(r.type), nullptr) << r.type;
}

// Which models are event-driven: ngspice 39 manual §12.4 (digital models) and §12.3 (hybrid
// models: the bridges, d_osc, d_pwm, the real_* nodes); the analog §12.2 models are not.
TEST(CodeModelRulesTest, EventDrivenModelsAreThoseWithDigitalOrRealPorts) {
    for (const char* t : {"adc_bridge", "dac_bridge", "bidi_bridge", "d_osc", "d_pwm", "d_and",
                          "d_dff", "d_source", "d_to_real", "real_gain", "real_to_v"})
        EXPECT_TRUE(event_driven_model(t)) << t;
    for (const char* t : {"gain", "int", "hyst", "aswitch", "multi_input_pwl", "spice2poly",
                          "sidiode", "filesource", "d_nonsense", "", "r"})
        EXPECT_FALSE(event_driven_model(t)) << t;
}

}  // namespace
}  // namespace deckscale
