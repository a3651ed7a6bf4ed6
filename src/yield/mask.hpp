// The response mask a built unit must meet, and the key figures of one response: both read
// from the magnitude in dB at the sweep's frequencies.
#pragma once

#include <optional>
#include <string>
#include <vector>

namespace deckscale {

struct MaskRow {
    double frequency = 0, min_db = 0, max_db = 0;
};

struct Mask {
    // Within +-window_db of the nominal response at every swept frequency in [band_low,
    // band_high]; with no band given, over the nominal's passband (the frequencies where it is
    // within 3 dB of its peak). Used when `rows` is empty.
    double window_db = 1;
    std::optional<double> band_low, band_high;
    // Absolute limits from a mask file, interpolated linearly in log frequency between rows and
    // checked at the swept frequencies between the first and the last row.
    std::vector<MaskRow> rows;
    std::string rows_source;  // the mask file's path
    // The corner (see ResponseFigures) must lie in [corner_low, corner_high].
    std::optional<double> corner_low, corner_high;
};

// Reads a mask file: one "frequency min_dB max_dB" row per line (SPICE suffixes allowed in the
// frequency), '#' or '*' comments, blank lines; frequencies increasing. Returns an error text
// naming the line, or "".
std::string parse_mask_rows(const std::string& text, const std::string& path, Mask& mask);

// "F1:F2" with SPICE numbers ("1k:100k"). Returns an error text or "".
std::string parse_range(const std::string& text, double& low, double& high);

// Key figures of one magnitude response (dB), over the mask's band (the passband of the
// nominal for a relative mask without band).
struct ResponseFigures {
    bool pass = true;
    double gain_db = 0;       // the response at the nominal's peak frequency
    double deviation_db = 0;  // largest |dB - nominal dB| over the band
    // Over the nominal's passband: the highest level less the lowest interior dip (0 without a
    // dip: a monotonic roll-off is no ripple).
    double ripple_db = 0;
    // The -3 dB edge: where the response first falls 3 dB below its own peak going up in
    // frequency from the peak (else going down); interpolated in log frequency.
    std::optional<double> corner_hz;
    double margin_db = 0;  // smallest distance to a mask limit in dB (negative: violated;
                           // infinite with no limits)
};

struct MaskJudge {
    std::vector<double> frequency;
    std::vector<double> nominal_db;
    std::vector<char> in_band;         // points where a relative mask and the deviation apply
    std::vector<char> in_passband;     // points of the nominal within 3 dB of its peak
    std::vector<double> lower, upper;  // the limits per point (NaN where none)
    std::size_t peak = 0;              // index of the nominal's peak
    std::optional<double> corner_low, corner_high;

    ResponseFigures judge(const std::vector<double>& db) const;
};

// Prepares the limits for a sweep. Returns an error text in `error` (no point in the band).
MaskJudge make_judge(const Mask& mask, const std::vector<double>& frequency,
                     const std::vector<double>& nominal_db, std::string& error);

std::optional<double> corner_of(const std::vector<double>& frequency,
                                const std::vector<double>& db);

}  // namespace deckscale
