#include "verify/pair.hpp"

#include <algorithm>
#include <filesystem>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/analyses.hpp"
#include "deck/load.hpp"
#include "scale/codemodel_rules.hpp"
#include "scale/codemodels.hpp"
#include "scale/hold_items.hpp"
#include "scale/hold_plan.hpp"
#include "sim/head_start.hpp"
#include "verify/compare.hpp"
#include "verify/dc_sweep.hpp"
#include "verify/factor_inference.hpp"
#include "verify/flicker_check.hpp"
#include "verify/meas_compare.hpp"
#include "verify/noise_compare.hpp"
#include "verify/sim_cards.hpp"
#include "verify/disto_compare.hpp"
#include "verify/sp_compare.hpp"
#include "verify/tf_compare.hpp"

namespace deckscale {
namespace {

// The branch currents of the voltage sources whose nodes are all on magnetic loops (or
// ground): a loop's current is its flux (scale/codemodels.hpp), "vflux#branch".
std::set<std::string> flux_currents(const Deck& deck) {
    std::set<std::string> out;
    auto uses = collect_code_model_uses(deck, {});
    if (!uses || uses->magnetic_nodes.empty()) return out;
    auto on_loop = [&](std::string_view node) {
        std::string n = to_lower(node);
        return n == "0" || n == "gnd" || uses->magnetic_nodes.count(n) > 0;
    };
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::element || c.fields.size() < 3 ||
                ascii_lower(c.field_text(0)[0]) != 'v')
                return;
            if (on_loop(c.field_text(1)) && on_loop(c.field_text(2)))
                out.insert(to_lower(c.field_text(0)) + "#branch");
        });
    return out;
}


namespace fs = std::filesystem;

bool has_lossless_line(const Deck& deck) {
    bool any = false;
    for (std::size_t f = 0; f < deck.files.size() && !any; ++f)
        deck.visit_file(f, [&](const Card& c) {
            any = any || (c.kind == CardKind::element && !c.fields.empty() &&
                          ascii_lower(c.field_text(0)[0]) == 't');
        });
    return any;
}

struct PairJob {
    std::string analysis;  // "ac", "op", "tran", "noise", "dc", "tf", "sp", "disto"
    SimJob original, scaled;
};

const SimPlot* plot_of(const SimOutcome& o, const std::string& analysis) {
    for (const auto& p : o.plots)
        if (istarts_with(p.name, analysis)) return &p;
    return nullptr;
}

// A scaled deck with held parts (its held-parts line, scale/hold_items.hpp): the factors
// from that line unless given, the element check left to the parts outside held parts and
// .subckt bodies (copies shift the pairing by occurrence), and equality not expected.
// Returns a problem, or "".
std::string take_held(const HeldLine& held, const Deck& original, const PairRequest& o,
                      VerifyReport& report, std::vector<ElementValue>& vo,
                      std::vector<ElementValue>& vs) {
    report.held = held.items;
    report.tolerances.held = true;
    report.km = o.factors_given ? o.km : held.factors.km;
    report.kf = o.factors_given ? o.kf : held.factors.kf;
    report.factors_from_held_line = !o.factors_given;
    if (o.factors_given && (held.factors.km != o.km || held.factors.kf != o.kf))
        report.notes.push_back(fmt::format(
            "the held-parts line of {} says Km = {:.9g}, Kf = {:.9g}: the factors given are used",
            o.scaled, held.factors.km, held.factors.kf));
    std::set<std::string> names;
    try {
        names = held_top_level_names(original, held.items);
    } catch (const DeckError& e) {
        return fmt::format("the held-parts line of {} does not fit {}: {}", o.scaled, o.original,
                           e.diagnostic().message);
    }
    auto outside = [&](const ElementValue& e) { return e.in_subckt || names.count(e.name); };
    std::erase_if(vo, outside);
    std::erase_if(vs, outside);
    report.notes.push_back(
        "elements inside .subckt definitions and held elements are left out of the element "
        "check");
    return "";
}

// A noise run makes two plots: the spectra (with a frequency vector) and the integrated noise.
const SimPlot* noise_plot(const SimOutcome& o, bool integrated) {
    for (const auto& p : o.plots) {
        if (!istarts_with(p.name, "noise")) continue;
        bool spectra = std::any_of(p.vectors.begin(), p.vectors.end(), [](const SimVector& v) {
            return v.kind == VectorKind::frequency;
        });
        if (spectra != integrated) return &p;
    }
    return nullptr;
}

// The analyses whose .meas cards ngspice 39 evaluates (frontend/measure.c).
bool measurable(const std::string& analysis) {
    return analysis == "tran" || analysis == "ac" || analysis == "dc" || analysis == "sp";
}

PairVerification refuse(std::string problem) {
    PairVerification v;
    v.outcome = PairVerification::Outcome::bad_input;
    v.problems.push_back(std::move(problem));
    return v;
}

}  // namespace

PairVerification verify_pair(const PairRequest& o, const FileSystem& files,
                             SimHeadStart* head_start) {
    PairVerification result;
    VerifyReport& report = result.report;
    report.original = o.original;
    report.scaled = o.scaled;
    report.tolerances = o.tolerances;
    std::vector<PairJob> pairs;
    std::vector<std::string> flicker;  // why the noise of the pair cannot agree
    DcLevel dc_level;                  // the inner level of the .dc sweep compared
    std::optional<TfSpec> tf;
    std::vector<MeasureSpec> measures;  // the original's .meas cards, compared per analysis
    // The original measures something in its runs of `analysis`.
    auto measured = [&](const std::string& analysis) {
        return measurable(analysis) &&
               std::any_of(measures.begin(), measures.end(),
                           [&](const MeasureSpec& m) { return m.analysis == analysis; });
    };
    {
        Deck original = load_deck(o.original, files);
        Deck scaled = load_deck(o.scaled, files);
        report.tolerances.gmin = original.symbols.gmin;
        report.tolerances.event_driven =
            std::any_of(original.symbols.models.begin(), original.symbols.models.end(),
                        [](const auto& m) { return event_driven_model(m.second); });
        report.tolerances.delay_lines = has_lossless_line(original);
        report.tolerances.code_models =
            std::any_of(original.symbols.models.begin(), original.symbols.models.end(),
                        [](const auto& m) { return find_code_model(m.second) != nullptr; });
        auto vo = element_values(original), vs = element_values(scaled);
        std::optional<HeldLine> held = find_held_line(scaled);
        if (held) {
            if (auto problem = take_held(*held, original, o, report, vo, vs); !problem.empty())
                return refuse(problem);
        } else if (o.factors_given) {
            report.km = o.km;
            report.kf = o.kf;
        } else {
            auto inf = infer_factors(vo, vs);
            if (!inf.ok) return refuse("cannot infer the factors: " + inf.message);
            report.km = inf.km;
            report.kf = inf.kf;
            report.factors_inferred = true;
            report.resistor_pairs = inf.resistor_pairs;
            report.reactive_pairs = inf.reactive_pairs;
            auto kf = inf.reactive_pairs == 0
                          ? kf_from_analyses(find_analyses(original), find_analyses(scaled))
                          : std::nullopt;
            if (kf) {
                report.kf = *kf;
                report.notes.push_back(
                    "no matched capacitors or inductors: Kf read off the "
                    "decks' .ac, .tran, .noise, .sp or .disto cards");
            } else if (!inf.message.empty()) {
                report.notes.push_back(inf.message);
            }
        }
        // Values are written with 7 significant digits by default: 1e-5 is well above that.
        report.mismatches = check_ratios(vo, vs, report.km, report.kf, 1e-5);
        report.tolerances.flux_currents = flux_currents(original);
        report.tolerances.kf = report.kf;

        DeckAnalyses an = find_analyses(original);
        for (const auto& p : an.problems) report.notes.push_back(p + " (not compared)");
        for (const auto& kw : an.uncompared)
            report.notes.push_back(
                fmt::format("the original's {} analysis is not compared (verify maps "
                            ".ac, .op, .tran, .noise, .dc, .tf, .sp and .disto)",
                            kw));
        std::optional<AcSweep> sweep = an.ac;
        if (!o.sweep.empty()) {
            std::string e;
            sweep = parse_sweep(o.sweep, e);
            if (!sweep) return refuse("--sweep: " + e);
            sweep->reltol = original.symbols.reltol;  // the deck's stop test
        }
        std::string drive = to_lower(o.drive);
        if (!drive.empty() && std::find(an.sources.begin(), an.sources.end(), drive) == an.sources.end())
            return refuse(fmt::format("--drive {}: no independent source of that name in {}",
                                      o.drive, o.original));
        if (sweep && drive.empty() && an.ac_sources.empty())
            return refuse(fmt::format("no source of {} has an AC value, so an AC sweep "
                                      "shows nothing; name the source that drives the circuit with "
                                      "--drive NAME (it gets AC 1)", o.original));
        if (an.noise &&
            std::find(an.sources.begin(), an.sources.end(), an.noise->source) == an.sources.end())
            return refuse(fmt::format("the .noise input '{}' is no independent source of {}",
                                      an.noise->source, o.original));
        measures = find_measures(original);
        std::vector<MeasureSpec> scaled_measures = find_measures(scaled);
        if (!measures.empty() && stops_on_measures(original)) {
            report.notes.push_back("the deck's .meas results are not compared: with its "
                                   "'autostop' option they would end the transient run early");
            measures.clear();
            scaled_measures.clear();
        }
        // The `meas` commands of a deck's .control block, as .meas cards of its runs of `kind`.
        auto control_measures = [&](const Deck& d, const std::string& kind) {
            std::vector<std::string> cards;
            for (const auto& m : &d == &original ? measures : scaled_measures)
                if (!m.card.empty() && m.analysis == kind) cards.push_back(m.card);
            return cards;
        };
        auto job = [&](const Deck& d, const std::string& path, const std::string& card,
                       double drive_ac, const std::string& driven) {
            SimJob j;
            j.label = path;
            std::string kind = card.substr(1, card.find(' ') - 1);  // ".tran 1u 1m" -> "tran"
            bool measures_kind = measured(kind);
            j.cards = simulation_cards(
                d, SimDeckOptions{
                       card, driven, drive_ac,
                       &d == &original ? ScaleFactors{} : ScaleFactors{report.km, report.kf},
                       measures_kind ? kind : "",
                       measures_kind ? control_measures(d, kind) : std::vector<std::string>{}});
            j.work_dir = fs::absolute(path).parent_path().string();
            j.timeout = o.timeout;
            j.memory_limit_mb = o.memory_mb;
            return j;
        };
        // An AC current drive of 1 A in the original is 1/Km A in the scaled circuit.
        double scaled_drive = !drive.empty() && drive[0] == 'i' ? 1 / report.km : 1;
        if (sweep)
            pairs.push_back({"ac", job(original, o.original, ac_card(*sweep), 1, drive),
                             job(scaled, o.scaled, ac_card(map_sweep(*sweep, report.kf)),
                                 scaled_drive, drive)});
        if (an.op || (!sweep && !an.tran && !an.sp))
            pairs.push_back({"op", job(original, o.original, ".op", 1, drive),
                             job(scaled, o.scaled, ".op", scaled_drive, drive)});
        if (an.tran) {
            TranSpec t = *an.tran;
            if (o.max_step > 0) {
                t.tmax = o.max_step;
                report.notes.push_back(fmt::format(
                    "transient: both runs with a largest time step of {:.4g} s of the "
                    "original's time (the scaled run's {:.4g} s), not the .tran card's",
                    o.max_step, o.max_step / report.kf));
            }
            pairs.push_back({"tran", job(original, o.original, tran_card(t), 1, drive),
                             job(scaled, o.scaled, tran_card(map_tran(t, report.kf)),
                                 scaled_drive, drive)});
        }
        if (an.noise) {
            // ngspice 39 refuses a noise input without an AC value ("Noise input source i1 has
            // no AC value" for a current source); its magnitude does not enter the results.
            const std::string& in = an.noise->source;
            bool has_ac =
                std::find(an.ac_sources.begin(), an.ac_sources.end(), in) != an.ac_sources.end();
            std::string driven = has_ac ? "" : in;
            double noise_drive = in[0] == 'i' ? 1 / report.km : 1;
            pairs.push_back({"noise", job(original, o.original, noise_card(*an.noise), 1, driven),
                             job(scaled, o.scaled, noise_card(map_noise(*an.noise, report.kf)),
                                 noise_drive, driven)});
            flicker = flicker_differences(original, scaled, {report.km, report.kf});
        }
        if (an.dc) {
            std::string problem;
            if (auto mapped = map_dc(*an.dc, report.km, original.symbols.reltol, problem)) {
                pairs.push_back({"dc", job(original, o.original, dc_card(*an.dc), 1, ""),
                                 job(scaled, o.scaled, dc_card(*mapped), 1, "")});
                dc_level = an.dc->levels.front();
            } else {
                report.notes.push_back(problem + " (not compared)");
            }
        }
        if (an.sp)  // the ports are the drive: no source gets an AC value here
            pairs.push_back({"sp", job(original, o.original, sp_card(*an.sp), 1, ""),
                             job(scaled, o.scaled, sp_card(map_sweep(*an.sp, report.kf)), 1, "")});
        if (an.disto) {  // the DISTOF inputs are the drive
            DistoSpec mapped = *an.disto;
            mapped.sweep = map_sweep(an.disto->sweep, report.kf);
            pairs.push_back({"disto", job(original, o.original, disto_card(*an.disto), 1, ""),
                             job(scaled, o.scaled, disto_card(mapped), 1, "")});
        }
        if (an.tf) {
            pairs.push_back({"tf", job(original, o.original, tf_card(*an.tf), 1, ""),
                             job(scaled, o.scaled, tf_card(*an.tf), 1, "")});
            tf = an.tf;
        }
    }

    std::vector<SimJob> jobs;
    for (const auto& p : pairs) {
        jobs.push_back(p.original);
        jobs.push_back(p.scaled);
    }
    result.outcomes = simulate_all(jobs, 0, SimProcesses::automatic, head_start);
    const auto& outcomes = result.outcomes;
    for (std::size_t i = 0; i < jobs.size(); ++i) {
        if (outcomes[i].status == SimStatus::ok) continue;
        result.outcome = PairVerification::Outcome::sim_failed;
        result.failures.push_back(
            {jobs[i].label, pairs[i / 2].analysis, outcomes[i].status, outcomes[i].message});
    }
    if (!result.failures.empty()) {
        // A run of the original that fails says the deck itself does not run as written.
        for (std::size_t i = 0; i < jobs.size(); i += 2)
            if (outcomes[i].status != SimStatus::ok) {
                result.problems.push_back(fmt::format(
                    "the original deck fails in ngspice 39 too ({} run): the problem is in the "
                    "deck as written, not in the rewrite",
                    pairs[i / 2].analysis));
                break;
            }
        return result;
    }

    for (std::size_t i = 0; i < pairs.size(); ++i) {
        const std::string& a = pairs[i].analysis;
        if (a == "disto") {
            std::string problem;
            for (auto& c : compare_disto(outcomes[2 * i].plots, outcomes[2 * i + 1].plots,
                                         report.km, report.kf, report.tolerances, problem))
                report.comparisons.push_back(std::move(c));
            if (!problem.empty()) {
                result.outcome = PairVerification::Outcome::sim_failed;
                result.problems.push_back(problem);
                return result;
            }
            continue;
        }
        bool noise = a == "noise";
        const SimPlot* po =
            noise ? noise_plot(outcomes[2 * i], false) : plot_of(outcomes[2 * i], a);
        const SimPlot* ps =
            noise ? noise_plot(outcomes[2 * i + 1], false) : plot_of(outcomes[2 * i + 1], a);
        if (!po || !ps) {
            result.outcome = PairVerification::Outcome::sim_failed;
            result.problems.push_back(fmt::format("the simulator produced no {} plot", a));
            return result;
        }
        if (a == "ac") {
            report.comparisons.push_back(compare_ac(*po, *ps, report.km, report.kf, report.tolerances));
            result.ac_run = 2 * i;
        } else if (noise) {
            Comparison c = compare_noise(*po, *ps, noise_plot(outcomes[2 * i], true),
                                         noise_plot(outcomes[2 * i + 1], true), report.km,
                                         report.kf, report.tolerances);
            c.expected_differences = flicker;
            report.comparisons.push_back(std::move(c));
        } else if (a == "op") {
            report.comparisons.push_back(compare_op(*po, *ps, report.km, report.tolerances));
        } else if (a == "dc") {
            report.comparisons.push_back(compare_dc(*po, *ps, report.km,
                                                    dc_item_factor(dc_level, report.km).value_or(1),
                                                    dc_item_unit(dc_level), report.tolerances));
        } else if (a == "sp") {
            report.comparisons.push_back(compare_sp(*po, *ps, report.km, report.kf, report.tolerances));
        } else if (a == "tf") {
            report.comparisons.push_back(compare_tf(*po, *ps, *tf, report.km, report.tolerances));
        } else {
            report.comparisons.push_back(compare_tran(*po, *ps, report.km, report.kf, report.tolerances));
        }
        if (measured(a)) {
            double axis = a == "tran" ? 1 / report.kf
                          : a == "dc" ? dc_item_factor(dc_level, report.km).value_or(1)
                                      : report.kf;
            report.comparisons.push_back(
                compare_measures(measures, a, outcomes[2 * i], outcomes[2 * i + 1], report.km,
                                 axis, measure_base_tolerance(a, report.tolerances)));
        }
    }
    return result;
}

}  // namespace deckscale
