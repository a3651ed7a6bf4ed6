#include "verify/bode_plot.hpp"

#include <cmath>
#include <filesystem>
#include <numbers>

#include <fmt/format.h>

#include "base/gnuplot.hpp"
#include "base/output_file.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

double db(std::complex<double> x) { return 20 * std::log10(std::max(std::abs(x), 1e-300)); }
double deg(std::complex<double> x) { return std::arg(x) * 180 / std::numbers::pi; }
// An angle moved into [-180, 180] degrees.
double wrapped(double d) { return d - 360 * std::round(d / 360); }

}  // namespace

std::string write_bode_plot(const SimPlot& o, const SimPlot& s, const BodePlotRequest& r) {
    const SimVector* fo = nullptr;
    for (const auto& v : o.vectors)
        if (v.kind == VectorKind::frequency) fo = &v;
    if (!fo) return "no AC sweep to plot";
    fs::path svg = fs::absolute(r.svg_path);
    fs::path dir = svg.parent_path();
    std::string stem = svg.stem().string();
    std::string dat_name = stem + ".dat", gp_name = stem + ".gp";

    // Phases are unwrapped along the sweep (no step of more than 180 degrees from one point to
    // the next), so a fifth-order low-pass runs down to -450 degrees instead of jumping by 360
    // where it crosses -180; the scaled trace is drawn on the original's branch.
    std::string data = "# frequency of the original deck, then per vector: original dB, original deg\n"
                       "# (unwrapped), scaled (mapped back: current x Km) dB, scaled deg, relative "
                       "error\n";
    std::vector<const SimVector*> vo, vs;
    double worst = 0;  // the largest error drawn
    for (const auto& name : r.vectors) {
        const SimVector* a = o.find(name);
        const SimVector* b = s.find(name);
        if (!a || !b) return fmt::format("vector '{}' is not in both decks", name);
        vo.push_back(a);
        vs.push_back(b);
    }
    std::vector<double> last_phase(vo.size(), std::nan(""));
    for (std::size_t k = 0; k < fo->values.size(); ++k) {
        data += fmt::format("{:.10e}", fo->values[k].real());
        for (std::size_t i = 0; i < vo.size(); ++i) {
            if (k >= vo[i]->values.size() || k >= vs[i]->values.size()) break;
            double back = vo[i]->kind == VectorKind::current ? r.km : 1;
            double peak = 0;
            for (const auto& x : vo[i]->values) peak = std::max(peak, std::abs(x));
            auto a = vo[i]->values[k];
            auto b = vs[i]->values[k] * back;
            double err = peak > 0 ? std::abs(b - a) / peak : 0;
            worst = std::max(worst, err);
            double phase = deg(a);
            if (!std::isnan(last_phase[i]))
                phase += 360 * std::round((last_phase[i] - phase) / 360);
            last_phase[i] = phase;
            double scaled_phase = phase + wrapped(deg(b) - deg(a));
            data += fmt::format(" {:.10e} {:.10e} {:.10e} {:.10e} {:.6e}", db(a), phase, db(b),
                                scaled_phase, std::max(err, 1e-18));
        }
        data += "\n";
    }
    std::string gp;
    gp += "# gnuplot script written by deckscale verify; edit and rerun: gnuplot " + gp_name + "\n";
    gp += "set terminal svg size 900,900 dynamic noenhanced font 'sans,11' background '#ffffff'\n";
    // gnuplot writes a temporary file that is renamed once complete.
    std::string tmp_svg = "." + svg.filename().string() + ".part";
    gp += "set output " + gnuplot_quote(tmp_svg) + "\n";
    gp += "set multiplot layout 3,1\n";
    gp += "set logscale x\nset grid\nset key inside top right opaque box\nset format x '%.0s%c'\n";
    // Fixed margins: the panels share one frequency axis whatever their keys and labels hold.
    gp += "set lmargin at screen 0.11\nset rmargin at screen 0.96\n";
    // The band being designed for (the scaled deck's) below, the original's on the top axis.
    std::string x = fmt::format("($1*{:.17g})", r.kf);
    double f0 = fo->values.front().real(), f1 = fo->values.back().real();
    gp += fmt::format(
        "set xrange [{0:.17g}:{1:.17g}]\nset x2range [{2:.17g}:{3:.17g}]\nset logscale x2\n"
        "set format x2 '%.0s%c'\nset x2tics\nset xtics nomirror\n",
        f0 * r.kf, f1 * r.kf, f0, f1);
    if (r.mark_hz > 0)
        gp += fmt::format(
            "set arrow from {0:.17g}, graph 0 to {0:.17g}, graph 1 nohead dt 2 lw 1.5 lc rgb "
            "'#000000'\nset label {1} at {0:.17g}, graph 0.06 offset 0.5,0\n",
            r.mark_hz, gnuplot_quote(r.mark_label));
    // The title and the top axis's label on the first panel, the bottom axis's on the last.
    gp += "set xlabel ''\nset x2label " +
          gnuplot_quote(r.title + "; top axis: frequency of the original deck / Hz") + "\n";
    auto series = [&](int col_o, int col_s, const char* what) {
        std::string cmd = "plot ";
        for (std::size_t i = 0; i < vo.size(); ++i) {
            int base = 2 + static_cast<int>(i) * 5;
            if (i) cmd += ", \\\n     ";
            cmd += fmt::format("{} using {}:{} with lines lw 4 lc rgb '#9ecae1' title {}",
                               gnuplot_quote(dat_name), x, base + col_o,
                               gnuplot_quote(r.vectors[i] + " " + r.original_label + " " + what));
            cmd += fmt::format(", {} using {}:{} with lines lw 1 lc rgb '#d95f02' title {}",
                               gnuplot_quote(dat_name), x, base + col_s,
                               gnuplot_quote(r.vectors[i] + " " + r.scaled_label + " " + what));
        }
        return cmd + "\n";
    };
    gp += "set ylabel 'magnitude / dB'\n" + series(0, 2, "dB");
    gp += "set x2label ''\nset format x2 ''\nset ylabel 'phase / deg'\n" + series(1, 3, "deg");
    gp += "set xlabel 'frequency of the scaled deck / Hz'\n";
    gp += "set ylabel 'relative error'\nset logscale y\nset format y '%.0e'\n";
    // Errors of exactly zero are drawn at the 1e-18 floor; a range around the floor keeps an
    // all-zero trace from being an empty autoscaled range.
    if (worst <= 1e-18) gp += "set yrange [1e-19:1e-15]\n";
    gp += "plot ";
    for (std::size_t i = 0; i < vo.size(); ++i) {
        if (i) gp += ", \\\n     ";
        gp +=
            fmt::format("{} using {}:{} with lines lw 2 lc rgb '#7b3294' title {}", gnuplot_quote(dat_name),
                        x, 2 + static_cast<int>(i) * 5 + 4, gnuplot_quote(r.vectors[i] + " error"));
    }
    gp += "\nunset multiplot\n";
    if (auto e = write_file_atomically((dir / dat_name).string(), data); !e.empty()) return e;
    if (auto e = write_file_atomically((dir / gp_name).string(), gp); !e.empty()) return e;
    if (auto e = run_gnuplot(gp_name, dir.string()); !e.empty()) return e;
    std::error_code ec;
    fs::rename(dir / tmp_svg, svg, ec);
    if (ec) return fmt::format("cannot write '{}': {}", svg.string(), ec.message());
    return "";
}

}  // namespace deckscale
