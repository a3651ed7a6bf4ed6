#include "yield/plot.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <filesystem>

#include "base/gnuplot.hpp"
#include "base/output_file.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

// Writes the data and the script, runs gnuplot, renames its output into place.
std::string draw(const std::string& svg_path, const std::string& data, const std::string& body) {
    fs::path svg = fs::absolute(svg_path);
    fs::path dir = svg.parent_path();
    std::string stem = svg.stem().string();
    std::string dat = stem + ".dat", gp_name = stem + ".gp";
    std::string tmp_svg = "." + svg.filename().string() + ".part";
    std::string gp =
        "# gnuplot script written by deckscale yield; edit and rerun: gnuplot " + gp_name + "\n";
    gp += "set terminal svg size 900,700 dynamic noenhanced font 'sans,11' background '#ffffff'\n";
    gp += "set output " + gnuplot_quote(tmp_svg) + "\n";
    gp += "data = " + gnuplot_quote(dat) + "\n" + body;
    if (auto e = write_file_atomically((dir / dat).string(), data); !e.empty()) return e;
    if (auto e = write_file_atomically((dir / gp_name).string(), gp); !e.empty()) return e;
    if (auto e = run_gnuplot(gp_name, dir.string()); !e.empty()) return e;
    std::error_code ec;
    fs::rename(dir / tmp_svg, svg, ec);
    if (ec) return fmt::format("cannot write '{}': {}", svg.string(), ec.message());
    return "";
}

std::string number_or_nan(double x) { return std::isnan(x) ? "NaN" : fmt::format("{:.8e}", x); }

}  // namespace

std::string histogram_path(const std::string& svg_path) {
    fs::path p(svg_path);
    return (p.parent_path() / (p.stem().string() + "-histogram" + p.extension().string())).string();
}

std::string write_envelope_plot(const YieldResult& r, const std::string& svg_path,
                                const std::string& title) {
    std::string data =
        "# frequency/Hz, nominal dB, lowest and highest dB of all trials, mask min and max dB\n";
    for (std::size_t k = 0; k < r.frequency.size(); ++k)
        data += fmt::format("{:.10e} {:.8e} {:.8e} {:.8e} {} {}\n", r.frequency[k], r.nominal_db[k],
                            r.low_db[k], r.high_db[k], number_or_nan(r.mask_low[k]),
                            number_or_nan(r.mask_high[k]));
    // Columns 7..10: the envelope and the mask relative to the nominal, for the lower panel.
    std::string gp = "set multiplot layout 2,1 title " + gnuplot_quote(title) + "\n";
    gp +=
        "set logscale x\nset grid\nset key bottom left\nset format x '%.0s%c'\nset xlabel "
        "'frequency / Hz'\n";
    if (r.frequency.size() > 1)
        gp +=
            fmt::format("set xrange [{:.10e}:{:.10e}]\n", r.frequency.front(), r.frequency.back());
    gp += "set ylabel " + gnuplot_quote("|" + r.output + "| / dB") + "\n";
    gp += "plot data using 1:3:4 with filledcurves lc rgb '#9ecae1' title " +
          gnuplot_quote(fmt::format("envelope of {} trials", r.trials.size())) +
          ", \\\n     data using 1:2 with lines lw 2 lc rgb '#08519c' title 'nominal'" +
          ", \\\n     data using 1:5 with lines lw 2 dt 2 lc rgb '#d95f02' title 'mask'" +
          ", \\\n     data using 1:6 with lines lw 2 dt 2 lc rgb '#d95f02' notitle\n";
    gp += "set ylabel 'trials minus nominal / dB'\nset key top left\n";
    gp +=
        "plot data using 1:($3-$2):($4-$2) with filledcurves lc rgb '#9ecae1' title 'envelope'" +
        std::string(
            ", \\\n     data using 1:($5-$2) with lines lw 2 dt 2 lc rgb '#d95f02' title 'mask'") +
        ", \\\n     data using 1:($6-$2) with lines lw 2 dt 2 lc rgb '#d95f02' notitle\n";
    gp += "unset multiplot\n";
    return draw(svg_path, data, gp);
}

std::string write_histogram(const YieldResult& r, const std::string& svg_path,
                            const std::string& title) {
    bool corner = r.corner.count == r.trials.size() && r.corner.count > 0;
    std::vector<double> v;
    for (const TrialResult& t : r.trials)
        v.push_back(corner ? *t.figures.corner_hz : t.figures.deviation_db);
    if (v.empty()) return "no trials to draw";
    auto [lo, hi] = std::minmax_element(v.begin(), v.end());
    // Square-root choice of the bin count, at most 60 bins.
    std::size_t bins =
        std::clamp<std::size_t>(static_cast<std::size_t>(std::sqrt(v.size())), 1, 60);
    double width = *hi > *lo ? (*hi - *lo) / static_cast<double>(bins) : 1;
    std::vector<std::size_t> count(bins, 0);
    for (double x : v) ++count[std::min(bins - 1, static_cast<std::size_t>((x - *lo) / width))];
    std::string data = fmt::format("# bin centre ({}), trials in the bin\n",
                                   corner ? "corner/Hz" : "deviation/dB");
    for (std::size_t b = 0; b < bins; ++b)
        data += fmt::format("{:.10e} {}\n", *lo + (static_cast<double>(b) + 0.5) * width, count[b]);
    std::string gp = "set title " + gnuplot_quote(title) + "\n";
    gp +=
        "set grid ytics\nset format x '%.3s%c'\nset style fill solid 0.6 border lc rgb "
        "'#08519c'\nset boxwidth " +
        fmt::format("{:.10e}", width * 0.9) + "\n";
    gp += std::string("set xlabel ") +
          gnuplot_quote(corner ? "-3 dB corner / Hz" : "largest deviation from nominal / dB") +
          "\nset ylabel 'trials'\nset yrange [0:*]\n";
    if (corner && r.nominal.corner_hz)
        gp += fmt::format(
            "set arrow from {:.10e}, graph 0 to {:.10e}, graph 1 nohead lw 2 lc rgb '#d95f02'\n",
            *r.nominal.corner_hz, *r.nominal.corner_hz);
    gp += "plot data using 1:2 with boxes lc rgb '#6baed6' title " +
          gnuplot_quote(corner ? "trials (line: nominal corner)" : "trials") + "\n";
    return draw(svg_path, data, gp);
}

}  // namespace deckscale
