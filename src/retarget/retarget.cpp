#include "retarget/retarget.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "base/output_file.hpp"
#include "base/text_util.hpp"
#include "deck/analyses.hpp"
#include "retarget/impedance.hpp"
#include "retarget/probe.hpp"
#include "retarget/quantity.hpp"
#include "scale/rescale.hpp"
#include "verify/factor_inference.hpp"
#include "write/data_files.hpp"
#include "write/plan.hpp"

namespace deckscale {
namespace {

RetargetResult refuse(RetargetResult r, RetargetResult::Outcome outcome, std::string problem) {
    r.outcome = outcome;
    r.problems.push_back(std::move(problem));
    return r;
}

// A measurement's problem, said of the node it was made on.
std::string measurement_problem(const Measurement& m, const std::string& node,
                                const std::string& deck) {
    return fmt::format("measuring the {} of {} in {}: {}", to_string(m.feature), node, deck,
                       m.problem);
}

RetargetResult::Outcome outcome_of(const Measurement& m) {
    return m.problem.rfind("simulating", 0) == 0 ? RetargetResult::Outcome::sim_failed
                                                 : RetargetResult::Outcome::bad_input;
}

}  // namespace

RetargetResult retarget(const RetargetRequest& o, const FileSystem& files) {
    using Outcome = RetargetResult::Outcome;
    RetargetResult r;
    if (!o.impedance && !o.frequency)
        return refuse(r, Outcome::bad_input,
                      "give an impedance target, a frequency target or both");
    std::optional<AcSweep> sweep;
    {
        Deck original = load_deck(o.deck, files);
        if (o.impedance) {
            if (o.impedance->element.empty()) {
                r.km = o.impedance->to / o.impedance->from;
            } else {
                NamedImpedance z = named_impedance(original, o.impedance->element);
                if (!z.problem.empty()) return refuse(r, Outcome::bad_input, z.problem);
                r.element_value = z.ohms;
                r.km = o.impedance->to / z.ohms;
            }
        }
        std::vector<ElementValue> parts = element_values(original);
        DeckAnalyses an = find_analyses(original);
        sweep = an.ac;
        if (!o.sweep.empty()) {
            std::string e;
            sweep = parse_sweep(o.sweep, e);
            if (!sweep) return refuse(r, Outcome::bad_input, "--sweep: " + e);
            sweep->reltol = original.symbols.reltol;
        }
        std::string drive = to_lower(o.drive);
        if (!drive.empty() &&
            std::find(an.sources.begin(), an.sources.end(), drive) == an.sources.end())
            return refuse(r, Outcome::bad_input,
                          fmt::format("--drive {}: no independent source of that name in {}",
                                      o.drive, o.deck));
        if (o.frequency && o.frequency->feature) {
            if (!sweep)
                return refuse(r, Outcome::bad_input,
                              fmt::format("{} has no .ac sweep to measure the {} on; give one with "
                                          "--sweep dec 50 F1 F2",
                                          o.deck, to_string(*o.frequency->feature)));
            if (drive.empty() && an.ac_sources.empty())
                return refuse(r, Outcome::bad_input,
                              fmt::format("no source of {} has an AC value, so the response shows "
                                          "nothing; name the source that drives the circuit with "
                                          "--drive NAME (it gets AC 1)",
                                          o.deck));
            ProbeSettings probe{o.frequency->node, drive, 1, o.timeout, o.memory_mb};
            Measurement m =
                measure(*o.frequency->feature, *sweep, node_sweeps(original, o.deck, probe));
            if (!m.ok())
                return refuse(r, outcome_of(m), measurement_problem(m, o.frequency->node, o.deck));
            r.before = m;
            r.kf = o.frequency->to / m.freq;
        } else if (o.frequency) {
            r.kf = o.frequency->to / o.frequency->from;
        }
        if (o.frequency) r.target_hz = o.frequency->to;
        if (o.impedance && o.impedance->to_high > 0) {
            // Values at Km = 1 after the frequency scaling: L/Kf, C/Kf.
            for (const auto& p : parts)
                r.fit_parts.push_back(
                    {p.name, p.letter, p.letter == 'r' ? p.value : p.value / r.kf});
            r.fit_km_low = o.impedance->to / r.element_value;
            r.fit_km_high = o.impedance->to_high / r.element_value;
            r.fit = best_fit(r.fit_parts, o.series, r.fit_km_low, r.fit_km_high);
            r.km = r.fit->km;
        }
    }

    ScaleSettings settings;
    settings.factors = {r.km, r.kf};
    settings.digits = o.digits;
    settings.record_changes = false;
    ScaledDeck scaled = load_and_scale(o.deck, files, settings);
    r.warnings = scaled.deck.warnings;
    r.warnings.insert(r.warnings.end(), scaled.result.notes.begin(), scaled.result.notes.end());
    r.change_count = scaled.result.change_count;
    if (!scaled.result.unscalable.empty()) {
        r.unscalable = scaled.result.unscalable;
        r.outcome = Outcome::refused;
        return r;
    }
    OutputPlan plan = plan_output(scaled.deck, std::move(scaled.result.edits), o.output, false);
    add_data_files(plan, data_file_outputs(scaled.deck, scaled.result.data_files, o.output, files,
                                           settings.digits));
    OutputBatch batch;
    for (const auto& f : plan.files) {
        auto produce = [&](ByteSink& sink) { produce_output(scaled.deck, plan, f, sink); };
        if (auto e = batch.add(f.path, produce); !e.empty())
            return refuse(r, Outcome::bad_input, e);
        r.written.push_back(f.path);
    }
    if (auto e = batch.commit(); !e.empty()) return refuse(r, Outcome::bad_input, e);

    if (r.before) {
        Deck output = load_deck(o.output, files);
        std::string drive = to_lower(o.drive);
        // An AC current drive of 1 A in the original is 1/Km A at the new impedance level.
        double drive_ac = !drive.empty() && drive[0] == 'i' ? 1 / r.km : 1;
        ProbeSettings probe{o.frequency->node, drive, drive_ac, o.timeout, o.memory_mb};
        Measurement m = measure(r.before->feature, map_sweep(*sweep, r.kf),
                                node_sweeps(output, o.output, probe));
        if (!m.ok())
            return refuse(r, outcome_of(m), measurement_problem(m, o.frequency->node, o.output));
        r.after = m;
    }

    PairRequest pair;
    pair.original = o.deck;
    pair.scaled = o.output;
    pair.factors_given = true;
    pair.km = r.km;
    pair.kf = r.kf;
    pair.sweep = o.sweep;
    pair.drive = o.drive;
    pair.timeout = o.timeout;
    pair.memory_mb = o.memory_mb;
    r.verification = verify_pair(pair, files);
    if (r.verification->outcome == PairVerification::Outcome::sim_failed)
        r.outcome = Outcome::sim_failed;
    if (r.verification->outcome == PairVerification::Outcome::bad_input)
        r.outcome = Outcome::bad_input;
    for (const auto& p : r.verification->problems) r.problems.push_back("verifying: " + p);
    return r;
}

}  // namespace deckscale
