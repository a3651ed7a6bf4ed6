#include "scale/codemodel_rules.hpp"

#include <algorithm>
#include <string>
#include <unordered_map>

namespace deckscale {
namespace {

// Ports in ifspec order with their default types (ngspice-39.3 ifspec.ifs; codemodel-rules.md
// §2-§3). Models whose parameters do not depend on port types leave their ports unread ("").
// clang-format off
constexpr CodeModelType kTypes[] = {
    {"gain", "in:in:v out:out:v"},
    {"summer", "in[]:in:v out:out:v"},
    {"mult", "in[]:in:v out:out:v"},
    {"divide", "num:in:v den:in:v out:out:v"},
    {"limit", "in:in:v out:out:v"},
    {"climit", "in:in:v cntl_upper:in:v cntl_lower:in:v out:out:v"},
    {"pwl", "in:in:v out:out:v", true},
    {"pwlts", "out:out:v", true},
    {"filesource", "out[]:out:v"},
    {"multi_input_pwl", "in[]:in:vd out:out:vd"},
    {"aswitch", "cntl_in:in:v out:inout:gd"},
    {"pswitch", "cntl_in:in:gd out:inout:gd"},
    {"zener", "z:inout:gd"},
    {"ilimit", "in:in:v pos_pwr:inout:g neg_pwr:inout:g out:inout:g"},
    {"hyst", "in:in:v out:out:v", true},
    {"d_dt", "in:in:v out:out:v"},
    {"int", "in:in:v out:out:v"},
    {"s_xfer", "in:in:v out:out:v"},
    {"slew", "in:in:v out:out:v"},
    {"lcouple", "l:inout:hd mmf_out:inout:hd"},
    {"core", "mc:inout:gd", true},
    {"sine", "cntl_in:in:v out:out:v"},
    {"triangle", "cntl_in:in:v out:out:v"},
    {"square", "cntl_in:in:v out:out:v"},
    {"oneshot", "clk:in:v cntl_in:in:v clear:in:v out:out:v"},
    {"cmeter", "in:in:v out:out:v"},
    {"lmeter", "in:in:v out:out:v"},
    {"memristor", "memris:inout:gd"},
    {"table2d", "inx:in:v iny:in:v out:out:i"},
    {"table3d", "inx:in:v iny:in:v inz:in:v out:out:i"},
    {"sidiode", "ds:inout:gd"},
    {"delay", "in:in:v out:out:v cntrl:in:v"},
    {"potentiometer", "r0:inout:g wiper:inout:g r1:inout:g"},
    {"capacitoric", "cap:inout:hd"},
    {"inductoric", "ind:inout:gd"},
    {"spice2poly", "in[]:in:vd out:out:vd"},
    {"adc_bridge", "in[]:in:v out[]:out:d"},
    {"dac_bridge", "in[]:in:d out[]:out:v"},
    {"bidi_bridge", ""},
    {"d_osc", "cntl_in:in:v out:out:d"},
    {"d_pwm", "cntl_in:in:v out:out:d"},
    {"d_to_real", "in:in:d enable:in:d out:out:real"},
    {"real_gain", "in:in:real out:out:real"},
    {"real_delay", "in:in:real clk:in:d out:out:real"},
    {"real_to_v", "in:in:real out:out:v"},
    {"d_and", ""}, {"d_nand", ""}, {"d_or", ""}, {"d_nor", ""}, {"d_xor", ""}, {"d_xnor", ""},
    {"d_buffer", ""}, {"d_inverter", ""}, {"d_open_c", ""}, {"d_open_e", ""}, {"d_tristate", ""},
    {"d_pullup", ""}, {"d_pulldown", ""}, {"d_dff", ""}, {"d_jkff", ""}, {"d_tff", ""},
    {"d_srff", ""}, {"d_dlatch", ""}, {"d_srlatch", ""}, {"d_state", ""}, {"d_fdiv", ""},
    {"d_ram", ""}, {"d_source", ""}, {"d_lut", ""}, {"d_genlut", ""},
};

// Every parameter of the 70 code models (ngspice 39 `devhelp`), with its factor.
constexpr CodeModelParam kParams[] = {
    // ---- gain §12.2.1: out = gain*(in + in_offset) + out_offset ----
    {"gain", "in_offset", "in", ""}, {"gain", "gain", "out/in", "1"},
    {"gain", "out_offset", "out", ""},
    // ---- summer, mult §12.2.2-3: in_gain makes each input dimensionless, out_gain gives Fo ----
    {"summer", "in_offset", "in[]", ""}, {"summer", "in_gain", "1/in[]", "1"},
    {"summer", "out_gain", "out", "1"}, {"summer", "out_offset", "out", ""},
    {"mult", "in_offset", "in[]", ""}, {"mult", "in_gain", "1/in[]", "1"},
    {"mult", "out_gain", "out", "1"}, {"mult", "out_offset", "out", ""},
    // ---- divide §12.2.4: den_gain*(den + den_offset) stays, so its limits stay ----
    {"divide", "num_offset", "num", ""}, {"divide", "num_gain", "1/num", "1"},
    {"divide", "den_offset", "den", ""}, {"divide", "den_gain", "1/den", "1"},
    {"divide", "den_lower_limit", "1", ""}, {"divide", "den_domain", "1", ""},
    {"divide", "fraction", "1", ""}, {"divide", "out_gain", "out", "1"},
    {"divide", "out_offset", "out", ""},
    // ---- limit, climit §12.2.5-6: limit_range is absolute unless fraction=true ----
    {"limit", "in_offset", "in", ""}, {"limit", "gain", "out/in", "1"},
    {"limit", "out_lower_limit", "out", ""}, {"limit", "out_upper_limit", "out", ""},
    {"limit", "limit_range", "out", "1e-6", "nofraction"}, {"limit", "fraction", "1", ""},
    {"climit", "in_offset", "in", ""}, {"climit", "gain", "out/in", "1"},
    {"climit", "upper_delta", "out", ""}, {"climit", "lower_delta", "out", ""},
    {"climit", "limit_range", "out", "1e-6", "nofraction"}, {"climit", "fraction", "1", ""},
    // ---- pwl, pwlts §12.2.7-8 ----
    {"pwl", "x_array", "in", ""}, {"pwl", "y_array", "out", ""},
    {"pwl", "input_domain", "in", "0.01", "nofraction"}, {"pwl", "fraction", "1", ""},
    {"pwl", "limit", "1", ""},
    {"pwlts", "x_array", "1/Kf", ""}, {"pwlts", "y_array", "out", ""},
    {"pwlts", "input_domain", "1/Kf", "0.01", "nofraction"}, {"pwlts", "fraction", "1", ""},
    {"pwlts", "limit", "1", ""},
    // ---- filesource §12.2.9: t = t_file*timescale + timeoffset; columns per output ----
    {"filesource", "timeoffset", "1/Kf", ""}, {"filesource", "timescale", "1/Kf", "1"},
    {"filesource", "timerelative", "1", ""}, {"filesource", "amplstep", "1", ""},
    {"filesource", "amploffset", "out[]", ""}, {"filesource", "amplscale", "out[]", ""},
    {"filesource", "file", "1", ""},
    // ---- multi_input_pwl §12.2.10 ----
    {"multi_input_pwl", "x", "in", ""}, {"multi_input_pwl", "y", "out", ""},
    {"multi_input_pwl", "model", "1", ""},
    // ---- aswitch §12.2.11 (xtradev/aswitch/cfunc.mod clamps r_on >= 1e-3) ----
    {"aswitch", "cntl_off", "cntl_in", ""}, {"aswitch", "cntl_on", "cntl_in", "1"},
    {"aswitch", "log", "1", ""}, {"aswitch", "r_off", "Km", "1e12", "", 1e-9},
    {"aswitch", "r_on", "Km", "1", "", 1e-3}, {"aswitch", "limit", "1", ""},
    // ---- pswitch §12.2.12 (xtradev/pswitch/cfunc.mod clamps r_off <= 1e12, r_on >= 1e-3) ----
    {"pswitch", "cntl_off", "1", ""}, {"pswitch", "cntl_on", "1", ""}, {"pswitch", "log", "1", ""},
    {"pswitch", "r_off", "Km", "1e12", "", 0, 1e12}, {"pswitch", "r_on", "Km", "1", "", 1e-3},
    {"pswitch", "r_cntl_in", "Km", "1e12"},
    // ---- zener §12.2.13 ----
    {"zener", "v_breakdown", "1", ""}, {"zener", "i_breakdown", "1/Km", "2e-2"},
    {"zener", "r_breakdown", "Km", "1"}, {"zener", "i_rev", "1/Km", "1e-6"},
    {"zener", "i_sat", "1/Km", "1e-12"}, {"zener", "n_forward", "1", ""},
    {"zener", "limit_switch", "1", ""},
    // ---- ilimit §12.2.14: the internal target is a voltage; r_out_domain is in volts ----
    {"ilimit", "in_offset", "in", ""}, {"ilimit", "gain", "1/in", "1"},
    {"ilimit", "r_out_source", "Km", "1"}, {"ilimit", "r_out_sink", "Km", "1"},
    {"ilimit", "i_limit_source", "1/Km", "1e-2"}, {"ilimit", "i_limit_sink", "1/Km", "1e-2"},
    {"ilimit", "v_pwr_range", "1", ""}, {"ilimit", "i_source_range", "1/Km", "1e-9"},
    {"ilimit", "i_sink_range", "1/Km", "1e-9"}, {"ilimit", "r_out_domain", "1", ""},
    // ---- hyst §12.2.15 ----
    {"hyst", "in_low", "in", ""}, {"hyst", "in_high", "in", "1"}, {"hyst", "hyst", "in", "0.1"},
    {"hyst", "out_lower_limit", "out", ""}, {"hyst", "out_upper_limit", "out", "1"},
    {"hyst", "input_domain", "in", "0.01", "nofraction"}, {"hyst", "fraction", "1", ""},
    // ---- d_dt, int §12.2.16-17: a derivative divides by Kf, an integral multiplies ----
    {"d_dt", "out_offset", "out", ""}, {"d_dt", "gain", "out/in/Kf", "1"},
    {"d_dt", "out_lower_limit", "out", ""}, {"d_dt", "out_upper_limit", "out", ""},
    {"d_dt", "limit_range", "out", "1e-6"},
    {"int", "in_offset", "in", ""}, {"int", "gain", "out*Kf/in", "1"},
    {"int", "out_lower_limit", "out", ""}, {"int", "out_upper_limit", "out", ""},
    {"int", "limit_range", "out", "1e-6"}, {"int", "out_ic", "out", ""},
    // ---- s_xfer §12.2.18: N(s/w)/D(s/w) keeps its coefficients, w moves by Kf ----
    {"s_xfer", "in_offset", "in", ""}, {"s_xfer", "gain", "out/in", "1"},
    {"s_xfer", "num_coeff", "1", ""}, {"s_xfer", "den_coeff", "1", ""},
    {"s_xfer", "int_ic", "out*Kf^rest", ""}, {"s_xfer", "denormalized_freq", "Kf", "1"},
    // ---- slew §12.2.19 (ifspec default slope 1e-9, not the manual's 1e9) ----
    {"slew", "rise_slope", "out*Kf", "1e-9"}, {"slew", "fall_slope", "out*Kf", "1e-9"},
    // ---- lcouple, core §12.2.20-21: magnetic loop with n = Km (codemodel-rules.md §5) ----
    {"lcouple", "num_turns", "Km", "1"},
    {"core", "h_array", "1", ""}, {"core", "b_array", "1", ""}, {"core", "area", "1/Km/Kf", ""},
    {"core", "length", "1", ""}, {"core", "input_domain", "1", ""}, {"core", "fraction", "1", ""},
    {"core", "mode", "1", ""}, {"core", "in_low", "1", ""}, {"core", "in_high", "1", ""},
    {"core", "hyst", "1", ""}, {"core", "out_lower_limit", "1/Km/Kf", ""},
    {"core", "out_upper_limit", "1/Km/Kf", "1", "mode2"},
    // ---- sine, triangle, square, oneshot §12.2.22-25 ----
    {"sine", "cntl_array", "cntl_in", ""}, {"sine", "freq_array", "Kf", ""},
    {"sine", "out_low", "out", "-1"}, {"sine", "out_high", "out", "1"},
    {"triangle", "cntl_array", "cntl_in", ""}, {"triangle", "freq_array", "Kf", ""},
    {"triangle", "out_low", "out", "-1"}, {"triangle", "out_high", "out", "1"},
    {"triangle", "duty_cycle", "1", ""},
    {"square", "cntl_array", "cntl_in", ""}, {"square", "freq_array", "Kf", ""},
    {"square", "out_low", "out", "-1"}, {"square", "out_high", "out", "1"},
    {"square", "duty_cycle", "1", ""}, {"square", "rise_time", "1/Kf", "1e-9"},
    {"square", "fall_time", "1/Kf", "1e-9"},
    // analog/oneshot/cfunc.mod floors rise_time and fall_time at 1e-12 s
    {"oneshot", "cntl_array", "cntl_in", ""}, {"oneshot", "pw_array", "1/Kf", ""},
    {"oneshot", "clk_trig", "clk", "0.5"}, {"oneshot", "pos_edge_trig", "1", ""},
    {"oneshot", "out_low", "out", ""}, {"oneshot", "out_high", "out", "1"},
    {"oneshot", "rise_time", "1/Kf", "1e-9", "", 1e-12}, {"oneshot", "rise_delay", "1/Kf", "1e-9"},
    {"oneshot", "fall_delay", "1/Kf", "1e-9"}, {"oneshot", "fall_time", "1/Kf", "1e-9", "", 1e-12},
    {"oneshot", "retrig", "1", ""},
    // ---- cmeter, lmeter §12.2.26-27: output per farad / per henry ----
    {"cmeter", "gain", "out*Km*Kf", "1"},
    {"lmeter", "gain", "out*Kf/Km", "1"},
    // ---- memristor §12.2.28 ----
    {"memristor", "rmin", "Km", "10"}, {"memristor", "rmax", "Km", "1e4"},
    {"memristor", "rinit", "Km", "7e3"}, {"memristor", "alpha", "Km*Kf", ""},
    {"memristor", "beta", "Km*Kf", "1"}, {"memristor", "vt", "1", ""},
    // ---- table2d, table3d §12.2.29-30: out = offset + gain*table; output a current ----
    {"table2d", "order", "1", ""}, {"table2d", "verbose", "1", ""},
    {"table2d", "offset", "out", ""}, {"table2d", "gain", "out", "1"}, {"table2d", "file", "1", ""},
    {"table3d", "order", "1", ""}, {"table3d", "verbose", "1", ""},
    {"table3d", "offset", "out", ""}, {"table3d", "gain", "out", "1"}, {"table3d", "file", "1", ""},
    // ---- sidiode §12.2.31: limits of 1e29 A and more mean "none" ----
    {"sidiode", "ron", "Km", "1"}, {"sidiode", "roff", "Km", "1"}, {"sidiode", "vfwd", "1", ""},
    {"sidiode", "vrev", "1", ""}, {"sidiode", "ilimit", "1/Km", "", "", 0, 0, 1e29},
    {"sidiode", "revilimit", "1/Km", "", "", 0, 0, 1e29}, {"sidiode", "epsilon", "1", ""},
    {"sidiode", "revepsilon", "1", ""}, {"sidiode", "rrev", "Km", ""},
    // ---- delay §12.2.32 ----
    {"delay", "delay", "1/Kf", ""}, {"delay", "buffer_size", "1", ""},
    {"delay", "has_delay_cnt", "1", ""}, {"delay", "delmin", "1/Kf", ""},
    {"delay", "delmax", "1/Kf", ""},
    // ---- potentiometer §12.2.33, capacitoric, inductoric ----
    {"potentiometer", "position", "1", ""}, {"potentiometer", "log", "1", ""},
    {"potentiometer", "r", "Km", "1e5"}, {"potentiometer", "log_multiplier", "1", ""},
    {"capacitoric", "c", "1/Km/Kf", ""}, {"capacitoric", "ic", "1", ""},
    {"inductoric", "l", "Km/Kf", ""}, {"inductoric", "ic", "1/Km", ""},
    // ---- spice2poly (built by ngspice from E/F/G/H POLY cards) ----
    {"spice2poly", "coef", "1", ""},
    // ---- bridges §12.3.1-3 ----
    {"adc_bridge", "in_low", "in", "0.1"}, {"adc_bridge", "in_high", "in", "0.9"},
    {"adc_bridge", "rise_delay", "1/Kf", "1e-9"}, {"adc_bridge", "fall_delay", "1/Kf", "1e-9"},
    {"dac_bridge", "out_low", "out", ""}, {"dac_bridge", "out_high", "out", "1"},
    {"dac_bridge", "out_undef", "out", "0.5", "midpoint"},
    {"dac_bridge", "input_load", "1/Km/Kf", ""}, {"dac_bridge", "t_rise", "1/Kf", "1e-9"},
    {"dac_bridge", "t_fall", "1/Kf", "1e-9"},
    {"bidi_bridge", "direction", "1", ""}, {"bidi_bridge", "input_load", "1/Km/Kf", ""},
    {"bidi_bridge", "strength", "1", ""}, {"bidi_bridge", "smooth", "1", ""},
    {"bidi_bridge", "in_low", "1", ""}, {"bidi_bridge", "in_high", "1", ""},
    {"bidi_bridge", "out_low", "1", ""}, {"bidi_bridge", "out_high", "1", ""},
    {"bidi_bridge", "drive_low", "1/Km", "0.02"}, {"bidi_bridge", "drive_high", "1/Km", "0.02"},
    {"bidi_bridge", "r_stl", "Km", "20"}, {"bidi_bridge", "r_sth", "Km", "20"},
    {"bidi_bridge", "r_low", "Km", "10000"}, {"bidi_bridge", "r_high", "Km", "10000"},
    {"bidi_bridge", "t_rise", "1/Kf", "1e-9"}, {"bidi_bridge", "t_fall", "1/Kf", "1e-9"},
    {"bidi_bridge", "rise_delay", "1/Kf", "1e-9"}, {"bidi_bridge", "fall_delay", "1/Kf", "1e-9"},
    // ---- d_osc §12.3.4, d_pwm §12.3.9 ----
    {"d_osc", "cntl_array", "cntl_in", ""}, {"d_osc", "freq_array", "Kf", ""},
    {"d_osc", "duty_cycle", "1", ""}, {"d_osc", "init_phase", "1", ""},
    {"d_osc", "rise_delay", "1/Kf", "1e-9"}, {"d_osc", "fall_delay", "1/Kf", "1e-9"},
    {"d_pwm", "cntl_array", "cntl_in", ""}, {"d_pwm", "dc_array", "1", ""},
    {"d_pwm", "frequency", "Kf", "1e6"}, {"d_pwm", "init_phase", "1", ""},
    {"d_pwm", "rise_delay", "1/Kf", "1e-9"}, {"d_pwm", "fall_delay", "1/Kf", "1e-9"},
    // ---- real nets §12.3.5-8: values take the factor of the real_to_v output they drive ----
    {"d_to_real", "zero", "out", ""}, {"d_to_real", "one", "out", ""},
    {"d_to_real", "delay", "1/Kf", "1e-9"},
    {"real_delay", "delay", "1/Kf", "1e-9"},
    {"real_gain", "in_offset", "in", ""}, {"real_gain", "gain", "1", ""},
    {"real_gain", "out_offset", "out", ""}, {"real_gain", "delay", "1/Kf", "1e-9"},
    {"real_gain", "ic", "out", ""},
    {"real_to_v", "gain", "1", ""}, {"real_to_v", "transition_time", "1/Kf", "1e-9"},
    // ---- gates §12.4.1-9: delays 1 ns; loads are stored but read by no model ----
    {"d_and", "rise_delay", "1/Kf", "1e-9"}, {"d_and", "fall_delay", "1/Kf", "1e-9"},
    {"d_and", "input_load", "1/Km/Kf", ""},
    {"d_nand", "rise_delay", "1/Kf", "1e-9"}, {"d_nand", "fall_delay", "1/Kf", "1e-9"},
    {"d_nand", "input_load", "1/Km/Kf", ""},
    {"d_or", "rise_delay", "1/Kf", "1e-9"}, {"d_or", "fall_delay", "1/Kf", "1e-9"},
    {"d_or", "input_load", "1/Km/Kf", ""},
    {"d_nor", "rise_delay", "1/Kf", "1e-9"}, {"d_nor", "fall_delay", "1/Kf", "1e-9"},
    {"d_nor", "input_load", "1/Km/Kf", ""},
    {"d_xor", "rise_delay", "1/Kf", "1e-9"}, {"d_xor", "fall_delay", "1/Kf", "1e-9"},
    {"d_xor", "input_load", "1/Km/Kf", ""},
    {"d_xnor", "rise_delay", "1/Kf", "1e-9"}, {"d_xnor", "fall_delay", "1/Kf", "1e-9"},
    {"d_xnor", "input_load", "1/Km/Kf", ""},
    {"d_buffer", "rise_delay", "1/Kf", "1e-9"}, {"d_buffer", "fall_delay", "1/Kf", "1e-9"},
    {"d_buffer", "input_load", "1/Km/Kf", ""},
    {"d_inverter", "rise_delay", "1/Kf", "1e-9"}, {"d_inverter", "fall_delay", "1/Kf", "1e-9"},
    {"d_inverter", "input_load", "1/Km/Kf", ""},
    {"d_open_c", "open_delay", "1/Kf", "1e-9"}, {"d_open_c", "fall_delay", "1/Kf", "1e-9"},
    {"d_open_c", "input_load", "1/Km/Kf", ""},
    {"d_open_e", "rise_delay", "1/Kf", "1e-9"}, {"d_open_e", "open_delay", "1/Kf", "1e-9"},
    {"d_open_e", "input_load", "1/Km/Kf", ""},
    {"d_tristate", "delay", "1/Kf", "1e-9"}, {"d_tristate", "input_load", "1/Km/Kf", ""},
    {"d_tristate", "enable_load", "1/Km/Kf", ""},
    {"d_pullup", "load", "1/Km/Kf", ""},
    {"d_pulldown", "load", "1/Km/Kf", ""},
    // ---- flip-flops and latches §12.4.12-17 ----
    {"d_dff", "clk_delay", "1/Kf", "1e-9"}, {"d_dff", "set_delay", "1/Kf", "1e-9"},
    {"d_dff", "reset_delay", "1/Kf", "1e-9"}, {"d_dff", "ic", "1", ""},
    {"d_dff", "rise_delay", "1/Kf", "1e-9"}, {"d_dff", "fall_delay", "1/Kf", "1e-9"},
    {"d_dff", "data_load", "1/Km/Kf", ""}, {"d_dff", "clk_load", "1/Km/Kf", ""},
    {"d_dff", "set_load", "1/Km/Kf", ""}, {"d_dff", "reset_load", "1/Km/Kf", ""},
    {"d_jkff", "clk_delay", "1/Kf", "1e-9"}, {"d_jkff", "set_delay", "1/Kf", "1e-9"},
    {"d_jkff", "reset_delay", "1/Kf", "1e-9"}, {"d_jkff", "ic", "1", ""},
    {"d_jkff", "rise_delay", "1/Kf", "1e-9"}, {"d_jkff", "fall_delay", "1/Kf", "1e-9"},
    {"d_jkff", "jk_load", "1/Km/Kf", ""}, {"d_jkff", "clk_load", "1/Km/Kf", ""},
    {"d_jkff", "set_load", "1/Km/Kf", ""}, {"d_jkff", "reset_load", "1/Km/Kf", ""},
    {"d_tff", "clk_delay", "1/Kf", "1e-9"}, {"d_tff", "set_delay", "1/Kf", "1e-9"},
    {"d_tff", "reset_delay", "1/Kf", "1e-9"}, {"d_tff", "ic", "1", ""},
    {"d_tff", "rise_delay", "1/Kf", "1e-9"}, {"d_tff", "fall_delay", "1/Kf", "1e-9"},
    {"d_tff", "t_load", "1/Km/Kf", ""}, {"d_tff", "clk_load", "1/Km/Kf", ""},
    {"d_tff", "set_load", "1/Km/Kf", ""}, {"d_tff", "reset_load", "1/Km/Kf", ""},
    {"d_srff", "clk_delay", "1/Kf", "1e-9"}, {"d_srff", "set_delay", "1/Kf", "1e-9"},
    {"d_srff", "reset_delay", "1/Kf", "1e-9"}, {"d_srff", "ic", "1", ""},
    {"d_srff", "rise_delay", "1/Kf", "1e-9"}, {"d_srff", "fall_delay", "1/Kf", "1e-9"},
    {"d_srff", "sr_load", "1/Km/Kf", ""}, {"d_srff", "clk_load", "1/Km/Kf", ""},
    {"d_srff", "set_load", "1/Km/Kf", ""}, {"d_srff", "reset_load", "1/Km/Kf", ""},
    {"d_dlatch", "data_delay", "1/Kf", "1e-9"}, {"d_dlatch", "enable_delay", "1/Kf", "1e-9"},
    {"d_dlatch", "set_delay", "1/Kf", "1e-9"}, {"d_dlatch", "reset_delay", "1/Kf", "1e-9"},
    {"d_dlatch", "ic", "1", ""}, {"d_dlatch", "rise_delay", "1/Kf", "1e-9"},
    {"d_dlatch", "fall_delay", "1/Kf", "1e-9"}, {"d_dlatch", "data_load", "1/Km/Kf", ""},
    {"d_dlatch", "enable_load", "1/Km/Kf", ""}, {"d_dlatch", "set_load", "1/Km/Kf", ""},
    {"d_dlatch", "reset_load", "1/Km/Kf", ""},
    {"d_srlatch", "sr_delay", "1/Kf", "1e-9"}, {"d_srlatch", "enable_delay", "1/Kf", "1e-9"},
    {"d_srlatch", "set_delay", "1/Kf", "1e-9"}, {"d_srlatch", "reset_delay", "1/Kf", "1e-9"},
    {"d_srlatch", "ic", "1", ""}, {"d_srlatch", "rise_delay", "1/Kf", "1e-9"},
    {"d_srlatch", "fall_delay", "1/Kf", "1e-9"}, {"d_srlatch", "sr_load", "1/Km/Kf", ""},
    {"d_srlatch", "enable_load", "1/Km/Kf", ""}, {"d_srlatch", "set_load", "1/Km/Kf", ""},
    {"d_srlatch", "reset_load", "1/Km/Kf", ""},
    // ---- d_state, d_fdiv, d_ram, d_source, d_lut, d_genlut §12.4.18-23 ----
    {"d_state", "clk_delay", "1/Kf", "1e-9"}, {"d_state", "reset_delay", "1/Kf", "1e-9"},
    {"d_state", "state_file", "1", ""}, {"d_state", "reset_state", "1", ""},
    {"d_state", "input_load", "1/Km/Kf", ""}, {"d_state", "clk_load", "1/Km/Kf", ""},
    {"d_state", "reset_load", "1/Km/Kf", ""},
    {"d_fdiv", "div_factor", "1", ""}, {"d_fdiv", "high_cycles", "1", ""},
    {"d_fdiv", "i_count", "1", ""}, {"d_fdiv", "rise_delay", "1/Kf", "1e-9"},
    {"d_fdiv", "fall_delay", "1/Kf", "1e-9"}, {"d_fdiv", "freq_in_load", "1/Km/Kf", ""},
    {"d_ram", "select_value", "1", ""}, {"d_ram", "ic", "1", ""},
    {"d_ram", "read_delay", "1/Kf", "1e-7"}, {"d_ram", "data_load", "1/Km/Kf", ""},
    {"d_ram", "address_load", "1/Km/Kf", ""}, {"d_ram", "select_load", "1/Km/Kf", ""},
    {"d_ram", "enable_load", "1/Km/Kf", ""},
    {"d_source", "input_file", "1", ""}, {"d_source", "input_load", "1/Km/Kf", ""},
    {"d_lut", "rise_delay", "1/Kf", "1e-9"}, {"d_lut", "fall_delay", "1/Kf", "1e-9"},
    {"d_lut", "input_load", "1/Km/Kf", ""}, {"d_lut", "table_values", "1", ""},
    {"d_genlut", "rise_delay", "1/Kf", ""}, {"d_genlut", "fall_delay", "1/Kf", ""},
    {"d_genlut", "input_load", "1/Km/Kf", ""}, {"d_genlut", "input_delay", "1/Kf", ""},
    {"d_genlut", "table_values", "1", ""},
};
// clang-format on

// Cases the rules cannot make exact (codemodel-rules.md §6, each with its source).
constexpr CodeModelRefusal kRefusals[] = {
    {"slew", "in/out",
     "slew's output follows its input 1:1 (no gain parameter), so its input and output must carry "
     "the same quantity (both voltages or both currents)"},
    {"delay", "in/out",
     "delay passes its input to its output 1:1, so both must carry the same quantity"},
    {"delay", "cntrl",
     "delay clamps its control input to [0, 1] as a plain number (analog/delay/cfunc.mod): "
     "connect cntrl as a voltage"},
    {"climit", "cntl_upper/out",
     "climit uses cntl_upper directly as its output's upper limit: it must carry the output's "
     "quantity"},
    {"climit", "cntl_lower/out",
     "climit uses cntl_lower directly as its output's lower limit: it must carry the output's "
     "quantity"},
    {"oneshot", "clear/clk",
     "oneshot compares clear with clk_trig too, so clear and clk must carry the same quantity"},
    {"multi_input_pwl", "in[]/in",
     "multi_input_pwl compares its inputs with each other (min/max): they must all be voltages or "
     "all currents"},
    {"adc_bridge", "in[]/in",
     "adc_bridge applies one in_low/in_high to all inputs: they must all carry the same quantity"},
    {"table2d", "inx*iny",
     "table2d reads its axes from its data file, which is not rewritten: inputs must be voltages"},
    {"table3d", "inx*iny*inz",
     "table3d reads its axes from its data file, which is not rewritten: inputs must be voltages"},
    {"spice2poly", "Km",
     "spice2poly coefficients depend on the powers of each term: write the E/F/G/H POLY card "
     "instead, ngspice builds this model from it"},
    {"lmeter", "out*Kf/Km",
     "lmeter returns gain*1e12 H when no inductor is on its node (src/xspice/cm/cmmeters.c), a "
     "value its scaled gain would change"},
};

}  // namespace

std::span<const CodeModelType> code_model_types() { return kTypes; }
std::span<const CodeModelParam> code_model_params() { return kParams; }
std::span<const CodeModelRefusal> code_model_refusals() { return kRefusals; }

bool event_driven_model(std::string_view type) {
    if (type.starts_with("d_") || type == "bidi_bridge") return find_code_model(type) != nullptr;
    const CodeModelType* t = find_code_model(type);
    if (!t) return false;
    // Each port is "name:dir:type", separated by blanks.
    for (std::string_view rest = t->ports; !rest.empty();) {
        std::string_view port = rest.substr(0, rest.find(' '));
        rest.remove_prefix(std::min(rest.size(), port.size() + 1));
        std::string_view kind = port.substr(port.rfind(':') + 1);
        if (kind == "d" || kind == "real") return true;
    }
    return false;
}

const CodeModelType* find_code_model(std::string_view type) {
    static const std::unordered_map<std::string_view, const CodeModelType*> index = [] {
        std::unordered_map<std::string_view, const CodeModelType*> m;
        for (const auto& t : kTypes) m.emplace(t.type, &t);
        return m;
    }();
    auto it = index.find(type);
    return it == index.end() ? nullptr : it->second;
}

const CodeModelParam* find_code_model_param(std::string_view type, std::string_view name) {
    static const std::unordered_map<std::string, const CodeModelParam*> index = [] {
        std::unordered_map<std::string, const CodeModelParam*> m;
        for (const auto& p : kParams)
            m.emplace(std::string(p.type) + "|" + std::string(p.name), &p);
        return m;
    }();
    std::string key;
    key.reserve(type.size() + name.size() + 1);
    key.append(type).append(1, '|').append(name);
    auto it = index.find(key);
    return it == index.end() ? nullptr : it->second;
}

}  // namespace deckscale
