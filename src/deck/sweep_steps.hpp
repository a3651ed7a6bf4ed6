// How ngspice 39 reads the numbers of a sweep and which points it steps through (.ac, .noise,
// .dc, linearize after .tran): the model deck/sweep_rewrite checks its texts against.
// Sources: ngspice-39.3 src/spicelib/parser/inpeval.c (numbers), src/spicelib/analysis/acan.c,
// noisean.c, dctrcurv.c (stepping), src/frontend/linear.c (linearize).
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace deckscale {

// The double ngspice 39 makes of a number on a dot card (INPevaluate): the mantissa is
// accumulated digit by digit in double and multiplied by a power of ten, so it is not
// correctly rounded; exact for at most 15 significant digits. NaN when `text` is no number.
double ngspice_read(std::string_view text);

// The points of one sweep; `endless` when ngspice's loop would never stop (then `values`
// holds the first kSweepPointLimit + 1 of them). `count` is the number of points, also when
// only counted (values empty then): a nudge search that only compares counts of sweeps of
// millions of points spent its time storing them (found by the deck fuzz target).
struct SweepPoints {
    std::vector<double> values;
    bool endless = false;
    std::size_t count = 0;
    double last = 0;  // the last point, when count > 0
    bool count_only = false;
    // `endless` because the sweep asks for more than kSweepPointLimit points: known from the
    // count alone, nothing stepped (".ac lin 201.t ..." is 2e14 points; stepping them to the
    // limit took seconds under the fuzz target's sanitizers). A log sweep counts as asking for
    // log(fstop/fstart)/log(ratio) + 1 points and is flagged from twice the limit, where
    // stepping could never end below it (".ac dec 463366804 10 1k" took 2.7 s there).
    bool over_limit = false;
    double asked = 0;  // the point count the sweep asks for, when over_limit
};
inline constexpr std::size_t kSweepPointLimit = 1 << 22;

// `type` is "dec", "oct" or "lin" (lower case); `points` as read (rounded like ngspice's
// integer fields); empty when ngspice rejects the sweep (fstart <= 0 on a log sweep ...).
SweepPoints ac_points(std::string_view type, double points, double fstart, double fstop,
                      double reltol = 1e-3, bool count_only = false);
SweepPoints noise_points(std::string_view type, double points, double fstart, double fstop,
                         double reltol = 1e-3, bool count_only = false);
// One level of a .dc sweep (`count_only`: counted, values left empty).
SweepPoints dc_points(double start, double stop, double step, bool count_only = false);
// Number of points `linearize` makes of a transient; 0 when it refuses the times.
long linearize_points(double tstep, double tstop, double tstart);

// A double as a long, clamped to the long's range (NaN as the largest): a conversion out of
// range would be undefined.
long clamped_long(double v);
// An integer field as ngspice reads it: floor(0.5 + value), clamped (a count beyond a long,
// ".ac lin 2e40 ...", was found by the deck fuzz target).
long count_field(double v);

}  // namespace deckscale
