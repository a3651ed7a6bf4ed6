// The rewrite of a sweep's numbers for a scale factor such that ngspice 39 steps through the
// same number of points, each at the factor times the original's (a stepping model of
// deck/sweep_steps decides; ngspice-39.3 reads at most 15 digits exactly).
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace deckscale {

enum class SweepKind { ac, noise, dc, tran };

struct SweepRewrite {
    std::vector<std::string> fields;  // the texts to write, one per field given
    std::string refusal;              // why no texts do; empty on success
};

// Rewrites the number fields of one sweep for `factor` (Kf for frequencies, 1/Kf for times,
// the swept element's factor for .dc), keeping each field's spelling, at most 15 significant
// digits, and nudging the stop value until ngspice counts the same points:
//   ac, noise: {dec|oct|lin, points, fstart, fstop}
//   dc:        {start, stop, step} of one level
//   tran:      {tstep, tstop [, tstart [, tmax]]} (linearize keeps its point count)
// Every field must be a plain number. `reltol` is the one in force for the analysis.
SweepRewrite rewrite_sweep(SweepKind kind, const std::vector<std::string_view>& fields,
                           double factor, double reltol = 1e-3);

}  // namespace deckscale
