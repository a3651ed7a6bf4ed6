// An SVG Bode overlay of original and scaled AC responses (the scaled one mapped back to
// the original's frequencies), plus the error trace, drawn by gnuplot. The data file and
// the gnuplot script are kept beside the SVG so users can restyle the plot.
#pragma once

#include <string>
#include <vector>

#include "sim/simulate.hpp"

namespace deckscale {

struct BodePlotRequest {
    std::string svg_path;
    std::vector<std::string> vectors;  // names of the vectors to draw
    std::string title;
    double km = 1, kf = 1;
    // A frequency to mark on every panel (in the scaled deck's band), e.g. a retarget's
    // corner, centre or notch; 0: none.
    double mark_hz = 0;
    std::string mark_label{};
    // What the two traces are called in the keys.
    std::string original_label = "original, moved to the new band";
    std::string scaled_label = "scaled";
};

// Writes <stem>.dat, <stem>.gp and the SVG. Returns an error text, empty on success.
std::string write_bode_plot(const SimPlot& original, const SimPlot& scaled,
                            const BodePlotRequest& request);

}  // namespace deckscale
