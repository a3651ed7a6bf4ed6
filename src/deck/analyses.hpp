// The analyses a deck asks for (.ac, .tran, .op, .noise, .dc, .tf, .sp, .disto) and the sources that could
// drive an AC comparison, read from its cards; and their images under frequency scaling.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "deck/load.hpp"
#include "deck/noise_card.hpp"

namespace deckscale {

struct AcSweep {
    std::string type;  // "dec", "oct" or "lin"
    long points = 0;
    double fstart = 0;
    double fstop = 0;
    // The fields as written ("10", "1k"; an expression's value in full precision), when
    // known: the cards are written from these, so ngspice reads what the deck says and steps
    // the mapped sweep exactly (deck/sweep_rewrite).
    std::string points_text, fstart_text, fstop_text;
    double reltol = 1e-3;  // the deck's .options reltol: the stop test of the sweep uses it
};

struct TranSpec {
    double tstep = 0, tstop = 0, tstart = 0, tmax = 0;
    bool uic = false;
};

// One level of a .dc sweep: the swept item (a V, I or R name in lower case, or "temp") and its
// start, stop and step as ngspice is to read them (the words as written; an expression's value
// in full precision).
struct DcLevel {
    std::string item;
    std::string start, stop, step;
};

// `.dc item start stop step [item2 start2 stop2 step2]` (ngspice 39 manual 15.3.2).
struct DcSweep {
    std::vector<DcLevel> levels;  // one or two; the first is the inner loop
};

// `.tf outvar insrc` (ngspice 39 manual 15.3.9): outvar as written back, `v(a)`, `v(a,b)` or
// `i(vx)`, and the input source in lower case.
struct TfSpec {
    std::string output;
    bool current_output = false;
    std::string source;
};

// `.disto dec|oct|lin n f1 f2 [f2overf1]` (ngspice 39 manual 15.3.3): the harmonics of the
// sources' DISTOF1 inputs, or with f2overf1 the intermodulation products of DISTOF1 at f1 and
// DISTOF2 at f2overf1 x f1. The ratio is kept as written (frequency scaling leaves it).
struct DistoSpec {
    AcSweep sweep;
    std::string f2overf1;  // empty when absent
};

struct DeckAnalyses {
    std::optional<AcSweep> ac;
    std::optional<TranSpec> tran;
    bool op = false;
    std::optional<NoiseSpec> noise;
    std::optional<DcSweep> dc;
    std::optional<TfSpec> tf;
    // `.sp dec|oct|lin n f1 f2 [donoise]` (ngspice 39 manual 15.3.8): the S-parameters of the
    // deck's RF ports over a sweep stepped like .ac's. The donoise flag is not kept.
    std::optional<AcSweep> sp;
    std::optional<DistoSpec> disto;
    bool asks_disto = false;  // a .disto card (or command) is there, read or not
    std::vector<std::string> uncompared;     // analysis cards verify does not map (".dc", ...)
    std::vector<std::string> problems;      // analyses that could not be read (e.g. {params})
    std::vector<std::string> ac_sources;    // sources with an AC value (lower-case names)
    std::vector<std::string> sources;       // every independent V and I source
};

DeckAnalyses find_analyses(const Deck& deck);

// A sweep from the words of --sweep (dec|oct|lin N F1 F2); nullopt with `error` set otherwise.
std::optional<AcSweep> parse_sweep(const std::vector<std::string>& words, std::string& error);

// The mapped analyses of the scaled deck: frequencies x Kf, times / Kf. A mapped sweep's
// texts make ngspice 39 step through the same number of points, each Kf times the original's.
AcSweep map_sweep(const AcSweep& s, double kf);
TranSpec map_tran(const TranSpec& t, double kf);

std::string ac_card(const AcSweep& s);
std::string sp_card(const AcSweep& s);
std::string tran_card(const TranSpec& t);
std::string dc_card(const DcSweep& s);
std::string tf_card(const TfSpec& t);
std::string disto_card(const DistoSpec& d);

}  // namespace deckscale
