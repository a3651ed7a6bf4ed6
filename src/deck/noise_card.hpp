// The noise analysis a deck asks for (`.noise v(out[,ref]) src dec|oct|lin N f1 f2 [pts]`,
// ngspice 39 manual §15.3.4, or the same words as a `noise` command of .control), and its
// image under frequency scaling.
#pragma once

#include <optional>
#include <string>

#include "deck/card.hpp"
#include "deck/param_eval.hpp"

namespace deckscale {

struct NoiseSpec {
    std::string output;  // the output as ngspice reads it: "v(out)" or "v(out,ref)"
    std::string source;  // the input source, lower case
    std::string type;    // "dec", "oct" or "lin"
    // The numbers as written ("20", "1k"; an expression's value in full precision), and as
    // read.
    std::string points_text, fstart_text, fstop_text;
    std::string summary_text;  // points per summary; "" when not given
    double fstart = 0, fstop = 0;
    double reltol = 1e-3;  // the deck's .options reltol: the stop test of the sweep uses it
};

// The noise analysis of a `.noise` card (or a `noise` command read as one); nullopt with
// `error` set when it cannot be read. With `params`, expressions and parameter names are
// evaluated with them.
std::optional<NoiseSpec> read_noise_card(const Card& card, std::string& error,
                                         const ParamTable* params = nullptr);

// The mapped analysis of the scaled deck: frequencies x Kf, written so that ngspice 39 steps
// through as many points as in the original (deck/sweep_rewrite).
NoiseSpec map_noise(const NoiseSpec& spec, double kf);

std::string noise_card(const NoiseSpec& spec);

}  // namespace deckscale
