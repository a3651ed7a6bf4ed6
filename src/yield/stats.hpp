// The statistics of a yield run: the confidence interval of a proportion, summaries of a
// figure's distribution, and the sensitivity of a figure to each part's deviation.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace deckscale {

struct Interval {
    double low = 0, high = 1;
};

// The Wilson score interval (Wilson, J. Amer. Statist. Assoc. 22 (1927) 209) of `passed` out
// of `trials` at the two-sided level whose normal quantile is `z` (1.959963984540054: 95 %).
// It keeps inside [0, 1] and does not collapse at 0 or `trials` passes, as the plain normal
// interval does.
Interval wilson_interval(std::uint64_t passed, std::uint64_t trials, double z = 1.959963984540054);

struct Summary {
    std::size_t count = 0;
    double mean = 0, sd = 0;  // sd: sample standard deviation (n - 1)
    double min = 0, p5 = 0, median = 0, p95 = 0, max = 0;
};

// Quantiles by linear interpolation between order statistics (Hyndman and Fan type 7).
Summary summarize(std::vector<double> values);

struct Sensitivity {
    std::string part;
    double slope = 0;  // relative change of the figure per relative change of the part
    double share = 0;  // fraction of the figure's variance this part's draws explain (0..1)
};

// Ranks parts by how much of `figure`'s variance their independent draws explain: for each
// part the least-squares slope of the figure on the part's relative deviation,
// cov(x, y) / var(x), and its share slope^2 var(x) / var(y). With independent draws each
// slope estimates the first-order sensitivity without fitting all parts at once.
// deviations[p][t] is part p's relative deviation in trial t; figure[t] the relative change.
std::vector<Sensitivity> rank_sensitivities(const std::vector<std::string>& parts,
                                            const std::vector<std::vector<double>>& deviations,
                                            const std::vector<double>& figure);

}  // namespace deckscale
