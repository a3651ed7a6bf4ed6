// Running gnuplot (Debian gnuplot-nox) on a script: how every SVG of the project is drawn
// (Bode overlays, yield envelopes and histograms).
#pragma once

#include <string>

namespace deckscale {

// `s` as a gnuplot single-quoted string ('' inside for a quote).
std::string gnuplot_quote(const std::string& s);

// Runs gnuplot on `script` in the folder `dir`. Its output and its warnings are kept from the
// user's terminal; returns an error text ending in gnuplot's own message, or "" when gnuplot
// exited with 0.
std::string run_gnuplot(const std::string& script, const std::string& dir);

}  // namespace deckscale
