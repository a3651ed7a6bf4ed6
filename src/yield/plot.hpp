// Pictures of a yield run, drawn by gnuplot as SVG: the nominal response with the envelope of
// every trial and the mask limits, and a histogram of a key figure. The data and the gnuplot
// script are kept beside each SVG so users can restyle them.
#pragma once

#include <string>

#include "yield/run.hpp"

namespace deckscale {

// Writes <stem>.dat, <stem>.gp and the SVG at `svg_path`. Returns an error text, "" on success.
std::string write_envelope_plot(const YieldResult& r, const std::string& svg_path,
                                const std::string& title);

// The histogram of the corner frequency (of the deviation where no trial has a corner), at
// `svg_path`. Returns an error text, "" on success.
std::string write_histogram(const YieldResult& r, const std::string& svg_path,
                            const std::string& title);

// "plot.svg" -> "plot-histogram.svg": where the histogram goes beside the envelope plot.
std::string histogram_path(const std::string& svg_path);

}  // namespace deckscale
