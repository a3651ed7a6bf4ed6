// What the fuzz targets do with one input, shared by the libFuzzer entry points
// (deck_fuzz.cpp, number_fuzz.cpp, built by scripts/fuzz) and by replay_test.cpp, which
// runs every deck of netlists/ and every saved regression input through the same code in the
// ordinary test suite. Each function returns normally for any input, or aborts on a broken
// property (which the fuzzer reports as a crash).
#pragma once

#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <string>
#include <string_view>

#include "base/file_system.hpp"
#include "deck/analyses.hpp"
#include "deck/load.hpp"
#include "deck/spice_number.hpp"
#include "scale/expression.hpp"
#include "scale/factor.hpp"
#include "scale/rescale.hpp"
#include "verify/sim_cards.hpp"
#include "write/data_files.hpp"
#include "write/edit.hpp"
#include "write/flatten.hpp"
#include "write/time_column.hpp"

namespace deckscale::fuzz {

inline void require(bool property) {
    if (!property) std::abort();
}

// Read -> scale -> write on an in-memory deck. The first byte picks the factors and options;
// the rest is the deck, split at the first "\n#--\n" into the deck and an included file
// "sub.inc" (so include handling is exercised too).
inline void deck(const std::uint8_t* data, std::size_t size) {
    if (size == 0) return;
    const std::uint8_t knobs = data[0];
    std::string_view input(reinterpret_cast<const char*>(data + 1), size - 1);
    MemoryFileSystem fs;
    auto split = input.find("\n#--\n");
    fs.add("deck.cir", std::string(input.substr(0, split)));
    if (split != std::string_view::npos) fs.add("sub.inc", std::string(input.substr(split + 5)));
    static constexpr double kFactors[][2] = {{7, 3}, {1, 1}, {0.02, 6.283185307179586e7},
                                             {1e4, 1e-3}, {50, 1}, {1, 1000}, {1e-6, 1e9},
                                             {3.3, 0.7}};
    ScaleSettings settings;
    settings.factors = {kFactors[knobs & 7][0], kFactors[knobs & 7][1]};
    settings.mark_unscalable = (knobs & 8) != 0;
    settings.digits = (knobs & 16) ? 15 : 9;
    try {
        ScaledDeck one = load_and_scale("deck.cir", fs, settings);
        for (std::size_t i = 0; i < one.deck.files.size(); ++i)
            apply_edits(one.deck.files[i].source->text(), one.result.edits[i]);
        flatten_deck(one.deck, one.result.edits);
        // d_source files the deck names (sub.inc is one the input can name): rewritten.
        data_file_outputs(one.deck, one.result.data_files, "out/deck-scaled.cir", fs,
                          settings.digits);
        // One pass while reading equals a pass over the finished deck.
        ScaleResult two = scale_deck(one.deck, settings);
        require(apply_edits(one.deck.top().text(), one.result.edits[0]) ==
                apply_edits(one.deck.top().text(), two.edits[0]));
        // Factors of one change nothing.
        if (settings.factors.km == 1 && settings.factors.kf == 1)
            require(one.result.edits[0].empty() || settings.mark_unscalable);
        find_analyses(one.deck);
        simulation_cards(one.deck, SimDeckOptions{".ac dec 10 1 1meg", "", 1});
    } catch (const DeckError&) {
        // Refused with a diagnostic: the expected way to fail.
    }
}

// The number reader and writer, the factor reader and the expression rewriter on one word.
// A number that reads cleanly must have strtod's value, and rewritten it must read back as
// the scaled value.
inline void number(const std::uint8_t* data, std::size_t size) {
    std::string_view text(reinterpret_cast<const char*>(data), size);
    NumberParse p = parse_spice_number(text);
    if (p.problem == NumberProblem::none) {
        require(p.number.has_value() && std::isfinite(p.number->value));
        // The reader agrees with the C library's strtod on the mantissa (with ngspice's 'd'
        // exponent letter as 'e'), times the suffix.
        std::string mantissa(p.number->mantissa);
        for (char& c : mantissa)
            if (c == 'd' || c == 'D') c = 'e';
        double expected = std::strtod(mantissa.c_str(), nullptr) * suffix_multiplier(p.number->suffix);
        require(p.number->value == expected);
        for (double k : {1.0, 1e3, 1e-3, 6.283185307179586e3, 0.07}) {
            double scaled = p.number->value * k;
            if (!std::isfinite(scaled) || (scaled != 0 && std::fabs(scaled) < 1e-300)) continue;
            std::string again = respell(*p.number, scaled, 12);
            NumberParse q = parse_spice_number(again);
            require(q.problem == NumberProblem::none && q.number.has_value());
            require(std::fabs(q.number->value - scaled) <= 1e-9 * std::fabs(scaled));
        }
    } else {
        describe(p.problem, text);
    }
    parse_factor(text);
    substitute_variables(text, ScaleFactors{7, 3});
    std::string why;
    scale_time_column(text, 1.0 / 3, 9, why);
}

}  // namespace deckscale::fuzz
