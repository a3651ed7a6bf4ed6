#include "cli/snap_command.hpp"

#include <fmt/format.h>
#include <fmt/ranges.h>

#include <cmath>
#include <filesystem>

#include "base/output_file.hpp"
#include "base/text_util.hpp"
#include "cli/exit_codes.hpp"
#include "deck/analyses.hpp"
#include "retarget/quantity.hpp"
#include "retarget/response_change.hpp"
#include "scale/cautions.hpp"
#include "values/snap.hpp"
#include "verify/bode_plot.hpp"
#include "write/plan.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

std::string series_text(const SnapSeries& s) {
    std::string t;
    for (auto [kind, series] : {std::pair{"R", &s.r}, std::pair{"C", &s.c}, std::pair{"L", &s.l}})
        if (*series) t += fmt::format("{}{}=E{}", t.empty() ? "" : ", ", kind, (*series)->n);
    return t;
}

// The node to report on: --node, else "out" when the deck's AC results have one.
std::string report_node(const SnapOptions& o) { return o.node.empty() ? "out" : o.node; }

std::string change_text(const ResponseChange& c, const std::string& node) {
    std::string s = fmt::format(
        "  response change at node {} ({} points, rounded against ideal):\n", node, c.points);
    s += fmt::format("    magnitude  max {:.4g} dB at {}\n", c.max_db, frequency_text(c.max_db_hz));
    s += fmt::format("    phase      max {:.4g} deg at {}\n", c.max_deg,
                     frequency_text(c.max_deg_hz));
    auto ripple = [](const Ripple& r) {
        return r.valley_hz > 0 ? fmt::format("{:.4g} dB (deepest valley at {})", r.db,
                                             frequency_text(r.valley_hz))
                               : std::string("none (no valley below the corner)");
    };
    s += fmt::format("    ripple     ideal {}, rounded {}\n", ripple(c.ripple_ideal),
                     ripple(c.ripple_rounded));
    if (c.corner_ideal && c.corner_rounded)
        s += fmt::format("    corner     {} -> {} ({:+.3g} %)\n", frequency_text(*c.corner_ideal),
                         frequency_text(*c.corner_rounded),
                         100 * (*c.corner_rounded / *c.corner_ideal - 1));
    else
        s += "    corner     none in the sweep\n";
    return s;
}

}  // namespace

int run_snap(const SnapOptions& o, std::ostream& out, std::ostream& err) {
    std::string error;
    auto series = parse_snap_series(o.series, error);
    if (!series) {
        err << "deckscale: error: --series " << error << "\n";
        return exit_bad_input;
    }
    std::error_code ec;
    if (fs::exists(o.output, ec) && fs::exists(o.deck, ec) &&
        fs::equivalent(o.output, o.deck, ec)) {
        err << fmt::format("deckscale: error: '{}' is the input deck; snap never overwrites it\n",
                           o.output);
        return exit_bad_input;
    }
    DiskFileSystem disk;
    try {
        Deck deck = load_deck(o.deck, disk);
        err << render(deck.warnings);
        SnapResult snapped = snap_deck(deck, *series);
        err << render(snapped.left_alone);
        DeckAnalyses an = find_analyses(deck);
        std::optional<AcSweep> sweep = an.ac;
        if (!o.sweep.empty()) {
            sweep = parse_sweep(o.sweep, error);
            if (!sweep) {
                err << "deckscale: error: --sweep: " << error << "\n";
                return exit_bad_input;
            }
        }
        OutputPlan plan = plan_output(deck, std::move(snapped.edits), o.output, false, "-snapped");
        OutputBatch batch;
        for (const auto& f : plan.files) {
            auto produce = [&](ByteSink& sink) { produce_output(deck, plan, f, sink); };
            if (auto e = batch.add(f.path, produce); !e.empty()) {
                err << "deckscale: error: " << e << "\n";
                return exit_bad_input;
            }
        }
        if (auto e = batch.commit(); !e.empty()) {
            err << "deckscale: error: " << e << "\n";
            return exit_bad_input;
        }
        out << fmt::format(
            "snap {} -> {} ({}; nearest on a logarithmic scale, a value midway between "
            "two members goes to the larger)\n",
            o.deck, o.output, series_text(*series));
        out << fmt::format("  {:<10} {:>14} {:>14} {:>9}\n", "part", "ideal", "rounded", "error");
        const SnappedPart* worst = nullptr;
        for (const auto& p : snapped.parts) {
            out << fmt::format("  {:<10} {:>14} {:>14} {:>+8.3f}%", p.name, p.old_text, p.new_text,
                               100 * p.error());
            if (!p.elements.empty())
                out << fmt::format("  .param, the value of {}", fmt::join(p.elements, ", "));
            out << "\n";
            if (!worst || std::abs(p.error()) > std::abs(worst->error())) worst = &p;
        }
        if (worst)
            out << fmt::format("  worst part error: {} {:+.3f} %\n", worst->name,
                               100 * worst->error());
        int code = exit_ok;
        if (!sweep) {
            err << fmt::format(
                "deckscale: note: {} has no .ac sweep; give --sweep dec 50 F1 F2 to see "
                "the response change rounding caused\n",
                o.deck);
        } else if (!an.ac_sources.empty() || !o.drive.empty()) {
            Deck rounded = load_deck(o.output, disk);
            ProbeSettings probe{report_node(o), to_lower(o.drive), 1,
                                std::chrono::milliseconds(static_cast<long>(o.timeout_s * 1000)),
                                o.memory_mb};
            ResponseChange c = response_change(deck, o.deck, rounded, o.output, probe, *sweep);
            if (c.missing_node && o.node.empty()) {
                // The rounding is done; only the default node of the report is not there.
                err << "deckscale: note: " << c.problem
                    << ", so the response change is not shown (--node names the node to "
                       "report on)\n";
            } else if (!c.problem.empty()) {
                err << "deckscale: error: " << c.problem
                    << (c.missing_node ? " (--node names the node to report on)\n" : "\n");
                code = c.missing_node ? exit_bad_input : exit_sim_failed;
            } else {
                out << change_text(c, probe.node);
                if (!o.plot.empty()) {
                    BodePlotRequest req{o.plot,
                                        {probe.node},
                                        fmt::format("{} rounded to {}", o.deck, o.output),
                                        1,
                                        1};
                    req.original_label = "ideal";
                    req.scaled_label = "rounded";
                    if (c.corner_rounded) {
                        req.mark_hz = *c.corner_rounded;
                        req.mark_label = "rounded corner " + frequency_text(*c.corner_rounded);
                    }
                    if (auto e = write_bode_plot(c.ideal_ac, c.rounded_ac, req); !e.empty())
                        err << "deckscale: error: plot: " << e << "\n";
                    else
                        out << "plot written to " << o.plot << "\n";
                }
            }
        } else {
            err << fmt::format(
                "deckscale: note: no source of {} has an AC value; name one with --drive "
                "NAME to see the response change\n",
                o.deck);
        }
        err << nominal_value_cautions();
        return code;
    } catch (const DeckError& e) {
        err << render(e.diagnostic());
        return exit_bad_input;
    }
}

}  // namespace deckscale
