// Km and Kf read off a pair of decks: matched resistors give Km (R'/R), capacitors and
// inductors give Kf (C'/C = 1/(Km Kf), L'/L = Km/Kf). Every element whose ratio disagrees
// with the factors is reported: in a hand-scaled deck that is the likely typo.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "deck/analyses.hpp"
#include "deck/load.hpp"

namespace deckscale {

struct ElementValue {
    std::string name;  // lower-case
    char letter = 0;   // 'r', 'c' or 'l'
    double value = 0;
    std::string file;
    std::uint32_t line = 0;
    std::string text;  // the value as written
    bool in_subckt = false;  // inside a .subckt definition
};

// R, C and L elements with a value that is a literal, a `{…}`/`'…'` expression or a bare parameter
// name evaluated with the deck's top-level .param definitions (deck/param_eval), from every file.
// Inside a .subckt a value that uses one of the subcircuit's own parameters is left out (it
// varies per instance), as is any value that does not evaluate.
std::vector<ElementValue> element_values(const Deck& deck);

struct RatioMismatch {
    ElementValue original;
    ElementValue scaled;
    double expected = 0;   // scaled value the factors predict
    double deviation = 0;  // scaled/expected - 1
};

struct FactorInference {
    bool ok = false;
    double km = 1, kf = 1;
    int resistor_pairs = 0, reactive_pairs = 0;
    std::string message;  // why inference failed
};

FactorInference infer_factors(const std::vector<ElementValue>& original,
                              const std::vector<ElementValue>& scaled);

// Kf read off the decks' own analyses, for decks without matched capacitors or inductors:
// the scaled .ac stop frequency over the original's, else the original .tran stop time over
// the scaled one's, else the .noise, the .sp, then the .disto stop frequencies. Nothing when
// the two decks have none of these analyses in common.
std::optional<double> kf_from_analyses(const DeckAnalyses& original, const DeckAnalyses& scaled);

// Pairs whose ratio is off by more than `tolerance` (relative) from what km, kf predict.
std::vector<RatioMismatch> check_ratios(const std::vector<ElementValue>& original,
                                        const std::vector<ElementValue>& scaled, double km,
                                        double kf, double tolerance);

}  // namespace deckscale
