#include "scale/rules.hpp"

#include <string>
#include <unordered_map>

namespace deckscale {
namespace {

using U = Unit;

constexpr FieldRule kRules[] = {
    // ---- resistor (manual 3.3.1; notes §1) ----
    {"r", "value", U::ohm}, {"r", "r", U::ohm}, {"r", "resistance", U::ohm}, {"r", "ac", U::ohm},
    {"r", "m", U::none}, {"r", "scale", U::none}, {"r", "tc1", U::none}, {"r", "tc2", U::none},
    {"r", "tce", U::none}, {"r", "temp", U::none}, {"r", "dtemp", U::none}, {"r", "noisy", U::none},
    {"r", "l", U::none}, {"r", "w", U::none},
    // names ngspice 39's `devhelp resistor` lists besides (tc = tc1, noise = noisy; bv_max is
    // the safe-operating-area limit on the voltage across it, which scaling keeps)
    {"r", "tc", U::none}, {"r", "noise", U::none}, {"r", "bv_max", U::volt},
    // ---- capacitor (3.3.6) ----
    {"c", "value", U::farad}, {"c", "c", U::farad}, {"c", "capacitance", U::farad},
    {"c", "ic", U::volt}, {"c", "m", U::none}, {"c", "scale", U::none}, {"c", "tc1", U::none},
    {"c", "tc2", U::none}, {"c", "temp", U::none}, {"c", "dtemp", U::none}, {"c", "l", U::none},
    {"c", "w", U::none},
    // behavioural charge Q='expr' (3.3.9; notes §4): coulomb scales like farad
    {"c", "q", U::farad},
    // `devhelp capacitor` of ngspice 39: cap = capacitance; bv_max a voltage limit
    {"c", "cap", U::farad}, {"c", "bv_max", U::volt},
    // ---- inductor (3.3.10) ----
    {"l", "value", U::henry}, {"l", "l", U::henry}, {"l", "inductance", U::henry},
    {"l", "ic", U::ampere}, {"l", "m", U::none}, {"l", "scale", U::none}, {"l", "nt", U::none},
    {"l", "tc1", U::none}, {"l", "tc2", U::none}, {"l", "temp", U::none}, {"l", "dtemp", U::none},
    // ---- coupling (3.3.12): a ratio ----
    {"k", "value", U::none}, {"k", "k", U::none}, {"k", "coefficient", U::none},
    // ---- independent sources (4.1; notes §2) ----
    {"v", "dc", U::signal}, {"v", "ac", U::signal}, {"v", "acmag", U::signal},
    {"v", "acphase", U::none},
    {"v", "distof1", U::signal}, {"v", "distof1phase", U::none}, {"v", "distof2", U::signal},
    {"v", "distof2phase", U::none}, {"v", "z0", U::ohm}, {"v", "portnum", U::none},
    {"v", "freq", U::hertz}, {"v", "phase", U::none},  // RF port; its pwr: scale/sources.cpp
    {"v", "r", U::second}, {"v", "td", U::second},
    {"i", "dc", U::signal}, {"i", "c", U::signal}, {"i", "ac", U::signal},
    {"i", "acmag", U::signal}, {"i", "acphase", U::none},
    {"i", "distof1", U::signal}, {"i", "distof1phase", U::none}, {"i", "distof2", U::signal},
    {"i", "distof2phase", U::none}, {"i", "m", U::none},
    // source functions: positional arguments
    {"pulse", "#1", U::signal}, {"pulse", "#2", U::signal}, {"pulse", "#3", U::second},
    {"pulse", "#4", U::second}, {"pulse", "#5", U::second}, {"pulse", "#6", U::second},
    {"pulse", "#7", U::second}, {"pulse", "#8", U::none},
    {"sin", "#1", U::signal}, {"sin", "#2", U::signal}, {"sin", "#3", U::hertz},
    {"sin", "#4", U::second}, {"sin", "#5", U::hertz}, {"sin", "#6", U::none},
    {"exp", "#1", U::signal}, {"exp", "#2", U::signal}, {"exp", "#3", U::second},
    {"exp", "#4", U::second}, {"exp", "#5", U::second}, {"exp", "#6", U::second},
    {"pwl", "time", U::second}, {"pwl", "value", U::signal},
    {"sffm", "#1", U::signal}, {"sffm", "#2", U::signal}, {"sffm", "#3", U::hertz},
    {"sffm", "#4", U::none}, {"sffm", "#5", U::hertz}, {"sffm", "#6", U::none},
    {"sffm", "#7", U::none},
    // AM: VO multiplies VA and is dimensionless (notes §2, checked with an I source there).
    {"am", "#1", U::signal}, {"am", "#2", U::none}, {"am", "#3", U::hertz},
    {"am", "#4", U::hertz}, {"am", "#5", U::second}, {"am", "#6", U::none},
    {"am", "#7", U::none},
    {"trnoise", "#1", U::signal}, {"trnoise", "#2", U::second}, {"trnoise", "#3", U::none},
    {"trnoise", "#4", U::signal}, {"trnoise", "#5", U::signal}, {"trnoise", "#6", U::second},
    {"trnoise", "#7", U::second},
    {"trrandom", "#1", U::none}, {"trrandom", "#2", U::second}, {"trrandom", "#3", U::second},
    {"trrandom", "#4", U::signal}, {"trrandom", "#5", U::signal},
    // ---- controlled sources (4.2) ----
    {"e", "value", U::none}, {"f", "value", U::none}, {"f", "m", U::none},
    {"g", "value", U::siemens}, {"g", "m", U::none}, {"h", "value", U::ohm},
    // the keyed form of the value, "gain=" (ngspice 39's devhelp for VCVS, VCCS, CCCS, CCVS)
    {"e", "gain", U::none}, {"f", "gain", U::none}, {"g", "gain", U::siemens},
    {"h", "gain", U::ohm},
    // ---- behavioural source (5.1): its temperature arguments ----
    {"b", "tc1", U::none}, {"b", "tc2", U::none}, {"b", "temp", U::none}, {"b", "dtemp", U::none},
    {"b", "m", U::none}, {"b", "reciproctc", U::none}, {"b", "reciprocm", U::none},
    // ---- lossless line (6.1) ----
    {"t", "z0", U::ohm}, {"t", "zo", U::ohm}, {"t", "td", U::second}, {"t", "f", U::hertz},
    {"t", "nl", U::none}, {"t", "ic#1", U::volt}, {"t", "ic#2", U::ampere},
    {"t", "ic#3", U::volt}, {"t", "ic#4", U::ampere},
    // the initial conditions one by one (ngspice 39's devhelp for Tranline and LTRA)
    {"t", "v1", U::volt}, {"t", "i1", U::ampere}, {"t", "v2", U::volt}, {"t", "i2", U::ampere},
    {"o", "v1", U::volt}, {"o", "i1", U::ampere}, {"o", "v2", U::volt}, {"o", "i2", U::ampere},
    {"o", "ic#1", U::volt}, {"o", "ic#2", U::ampere}, {"o", "ic#3", U::volt},
    {"o", "ic#4", U::ampere},
    // ---- URC instance (6.3) ----
    {"u", "l", U::none}, {"u", "n", U::none},
    // ---- switches: instances carry no values, models do (3.3.15-16; notes §3) ----
    {"model:sw", "vt", U::volt}, {"model:sw", "vh", U::volt}, {"model:sw", "ron", U::ohm},
    {"model:sw", "roff", U::ohm},
    {"model:csw", "it", U::ampere}, {"model:csw", "ih", U::ampere}, {"model:csw", "ron", U::ohm},
    {"model:csw", "roff", U::ohm},
    // ---- LTRA (6.2): per-unit-length R L G C ----
    {"model:ltra", "r", U::ohm}, {"model:ltra", "l", U::henry}, {"model:ltra", "g", U::siemens},
    {"model:ltra", "c", U::farad}, {"model:ltra", "len", U::none}, {"model:ltra", "rel", U::none},
    {"model:ltra", "abs", U::none}, {"model:ltra", "nocontrol", U::none},
    {"model:ltra", "steplimit", U::none}, {"model:ltra", "nosteplimit", U::none},
    {"model:ltra", "lininterp", U::none}, {"model:ltra", "quadinterp", U::none},
    {"model:ltra", "mixedinterp", U::none}, {"model:ltra", "truncnr", U::none},
    {"model:ltra", "truncdontcut", U::none}, {"model:ltra", "compactrel", U::none},
    {"model:ltra", "compactabs", U::ampere},
    // ---- URC model (6.3) ----
    {"model:urc", "k", U::none}, {"model:urc", "fmax", U::hertz}, {"model:urc", "rperl", U::ohm},
    {"model:urc", "cperl", U::farad}, {"model:urc", "isperl", U::ampere},
    {"model:urc", "rsperl", U::ohm},
    // ---- R, C, L models (3.3.3, 3.3.8, 3.3.11) ----
    {"model:r", "rsh", U::ohm}, {"model:r", "r", U::ohm}, {"model:r", "res", U::ohm},
    {"model:r", "defw", U::none}, {"model:r", "w", U::none}, {"model:r", "l", U::none},
    {"model:r", "narrow", U::none}, {"model:r", "short", U::none}, {"model:r", "tc1", U::none},
    {"model:r", "tc2", U::none}, {"model:r", "tce", U::none}, {"model:r", "tnom", U::none},
    {"model:r", "noise", U::none}, {"model:r", "dw", U::none}, {"model:r", "dlr", U::none},
    {"model:r", "tc1r", U::none}, {"model:r", "tc2r", U::none}, {"model:r", "bv_max", U::volt},
    // Flicker noise (ngspice 39 `devhelp resistor`: KF, AF, EF, LF, WF): no unit that a
    // rescaled circuit follows; --follow-flicker rewrites KF (scale/flicker.hpp).
    {"model:r", "kf", U::none}, {"model:r", "af", U::none}, {"model:r", "ef", U::none},
    {"model:r", "lf", U::none}, {"model:r", "wf", U::none},
    {"model:c", "cap", U::farad}, {"model:c", "c", U::farad}, {"model:c", "cj", U::farad},
    {"model:c", "cjsw", U::farad}, {"model:c", "defw", U::none}, {"model:c", "defl", U::none},
    {"model:c", "w", U::none}, {"model:c", "l", U::none},
    {"model:c", "narrow", U::none}, {"model:c", "short", U::none}, {"model:c", "tc1", U::none},
    {"model:c", "tc2", U::none}, {"model:c", "tnom", U::none}, {"model:c", "di", U::none},
    {"model:c", "thick", U::none}, {"model:c", "cox", U::farad}, {"model:c", "capsw", U::farad},
    {"model:c", "del", U::none}, {"model:c", "bv_max", U::volt},
    {"model:l", "ind", U::henry}, {"model:l", "l", U::henry}, {"model:l", "tc1", U::none},
    {"model:l", "tc2", U::none}, {"model:l", "tnom", U::none},
    // ---- analyses (15.3; notes §6) ----
    {".ac", "#2", U::none}, {".ac", "#3", U::hertz}, {".ac", "#4", U::hertz},
    {".sp", "#2", U::none}, {".sp", "#3", U::hertz}, {".sp", "#4", U::hertz},
    {".sp", "#5", U::none},
    {".disto", "#2", U::none}, {".disto", "#3", U::hertz}, {".disto", "#4", U::hertz},
    {".disto", "#5", U::none},
    {".noise", "points", U::none}, {".noise", "fstart", U::hertz}, {".noise", "fstop", U::hertz},
    {".noise", "summary", U::none},
    {".sens", "points", U::none}, {".sens", "fstart", U::hertz}, {".sens", "fstop", U::hertz},
    {".tran", "#1", U::second}, {".tran", "#2", U::second}, {".tran", "#3", U::second},
    {".tran", "#4", U::second},
    {".four", "#1", U::hertz},
    {".pss", "#1", U::hertz}, {".pss", "#2", U::second}, {".pss", "#3", U::none},
    {".pss", "#4", U::none}, {".pss", "#5", U::none}, {".pss", "#6", U::none},
    {".pss", "#7", U::none},
    {".temp", "value", U::none},
    {".ic", "value", U::volt}, {".nodeset", "value", U::volt},
    // .meas: times on tran, frequencies on ac; VAL follows the measured quantity
    {".meas:tran", "td", U::second}, {".meas:tran", "from", U::second},
    {".meas:tran", "to", U::second}, {".meas:tran", "at", U::second},
    {".meas:ac", "td", U::hertz}, {".meas:ac", "from", U::hertz}, {".meas:ac", "to", U::hertz},
    {".meas:ac", "at", U::hertz},
    {".meas:sp", "from", U::hertz}, {".meas:sp", "to", U::hertz}, {".meas:sp", "at", U::hertz},
    {".meas", "rise", U::none}, {".meas", "fall", U::none}, {".meas", "cross", U::none},
    // ---- options (15.1; notes §6) ----
    {".options", "gmin", U::siemens}, {".options", "abstol", U::ampere},
    {".options", "chgtol", U::farad}, {".options", "rshunt", U::ohm},
    {".options", "rseries", U::ohm}, {".options", "cshunt", U::farad},
    {".options", "minbreak", U::second}, {".options", "ramptime", U::second},
    {".options", "reltol", U::none}, {".options", "vntol", U::volt}, {".options", "trtol", U::none},
    {".options", "xmu", U::none}, {".options", "maxord", U::none}, {".options", "itl1", U::none},
    {".options", "itl2", U::none}, {".options", "itl3", U::none}, {".options", "itl4", U::none},
    {".options", "itl5", U::none}, {".options", "itl6", U::none}, {".options", "pivrel", U::none},
    {".options", "pivtol", U::none}, {".options", "gminsteps", U::none},
    {".options", "srcsteps", U::none}, {".options", "temp", U::none}, {".options", "tnom", U::none},
    {".options", "scale", U::none}, {".options", "defl", U::none}, {".options", "defw", U::none},
    {".options", "defad", U::none}, {".options", "defas", U::none}, {".options", "seed", U::none},
    {".options", "gmin_steps", U::none}, {".options", "numdgt", U::none},
    {".options", "maxstep", U::second}, {".options", "interp", U::none},
    // the safe-operating-area checks' switch and message count (libngspice 39 takes both)
    {".options", "warn", U::none}, {".options", "maxwarns", U::none},
};

}  // namespace

std::span<const FieldRule> rule_table() { return kRules; }

std::optional<Unit> find_rule(std::string_view scope, std::string_view field) {
    // The table indexed once by "scope|field".
    static const std::unordered_map<std::string, Unit> index = [] {
        std::unordered_map<std::string, Unit> m;
        for (const auto& r : kRules) m.emplace(std::string(r.scope) + "|" + std::string(r.field), r.unit);
        return m;
    }();
    std::string key;
    key.reserve(scope.size() + field.size() + 1);
    key.append(scope).append(1, '|').append(field);
    auto it = index.find(key);
    if (it == index.end()) return std::nullopt;
    return it->second;
}

}  // namespace deckscale
