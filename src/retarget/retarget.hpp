// Retargeting a proven deck to a new impedance level and band: the factors come from design
// targets (a named resistor's new value or a stated impedance mapping; a measured corner,
// centre or notch moved to a target frequency, or a stated frequency mapping), the deck is
// scaled and written, the target is measured again on the output, and the pair is verified.
// Never prints: the `retarget` command presents the result.
#pragma once

#include <chrono>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "base/file_system.hpp"
#include "deck/diagnostic.hpp"
#include "retarget/fit.hpp"
#include "retarget/measure.hpp"
#include "verify/pair.hpp"

namespace deckscale {

struct ImpedanceTarget {
    std::string element;      // "R1": that resistor's value becomes `to`; empty: a mapping
    double from = 1, to = 1;  // a mapping: impedance level `from` becomes `to` (Ohm)
    // With `element`: a range [to, to_high] in which the level that rounds best is chosen
    // (retarget/fit, with RetargetRequest::series); 0: `to` exactly.
    double to_high = 0;
};

struct FrequencyTarget {
    std::optional<Feature> feature;  // measured on `node`; none: a stated mapping
    std::string node;
    double from = 1, to = 1;  // Hz; with a feature, `from` is what was measured
};

struct RetargetRequest {
    std::string deck, output;
    std::optional<ImpedanceTarget> impedance;
    std::optional<FrequencyTarget> frequency;
    std::vector<std::string> sweep;  // "dec N F1 F2" for the measurement; empty: the deck's .ac
    std::string drive;               // the source that gets AC 1; empty: as the deck has it
    SnapSeries series;               // for a best fit of the impedance level
    int digits = 9;
    std::chrono::milliseconds timeout{60000};
    std::uint64_t memory_mb = 8192;
};

struct RetargetResult {
    enum class Outcome {
        done,        // written, measured again and verified (see `verification`)
        bad_input,   // `problems` says why nothing was written
        refused,     // `unscalable` lists what cannot be scaled exactly; nothing written
        sim_failed,  // a measurement or verification run failed (`problems`)
    };
    Outcome outcome = Outcome::done;
    std::vector<std::string> problems;
    std::vector<Diagnostic> warnings;  // the deck's and the scaling pass's notes
    std::vector<Diagnostic> unscalable;
    double km = 1, kf = 1;
    double element_value = 0;           // the named element's value before (Ohm)
    std::optional<Measurement> before;  // the feature on the original
    std::optional<Measurement> after;   // the same on the output deck
    // A best fit: the parts (values at Km = 1, after the frequency scaling), the range of Km
    // searched and the choice.
    std::vector<FitPart> fit_parts;
    double fit_km_low = 0, fit_km_high = 0;
    std::optional<FitChoice> fit;
    double target_hz = 0;
    std::size_t change_count = 0;
    std::vector<std::string> written;  // the files written, main deck last
    std::optional<PairVerification> verification;
    double target_error() const { return after ? after->freq / target_hz - 1 : 0; }
};

// Throws DeckError for a deck that cannot be read.
RetargetResult retarget(const RetargetRequest& request, const FileSystem& fs);

}  // namespace deckscale
