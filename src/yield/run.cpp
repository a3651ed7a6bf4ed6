#include "yield/run.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <limits>
#include <thread>

#include "base/text_util.hpp"
#include "deck/analyses.hpp"
#include "deck/load.hpp"
#include "verify/sim_cards.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;
using Clock = std::chrono::steady_clock;

double db(std::complex<double> x) { return 20 * std::log10(std::max(std::abs(x), 1e-300)); }

YieldResult refuse(std::string problem) {
    YieldResult r;
    r.outcome = YieldResult::Outcome::bad_input;
    r.problems.push_back(std::move(problem));
    return r;
}

// The judged vector: the one named, else a node named like an output, else the first node.
const SimVector* output_vector(const SimPlot& p, const std::string& wanted) {
    if (!wanted.empty()) return p.find(wanted) ? p.find(wanted) : p.find("v(" + wanted + ")");
    for (const char* n : {"out", "vout", "output"})
        if (auto v = p.find(n)) return v;
    for (const auto& v : p.vectors)
        if (v.kind == VectorKind::voltage) return &v;
    return nullptr;
}

const SimVector* frequency_of(const SimPlot& p) {
    for (const auto& v : p.vectors)
        if (v.kind == VectorKind::frequency) return &v;
    return nullptr;
}

// The node of a voltage vector's name: "v(2)" -> "2", "out" -> "out".
std::string node_of(const std::string& vector) {
    if (istarts_with(vector, "v(") && vector.back() == ')')
        return vector.substr(2, vector.size() - 3);
    return vector;
}

std::vector<double> magnitude_db(const SimVector& v) {
    std::vector<double> out(v.values.size());
    for (std::size_t k = 0; k < out.size(); ++k) out[k] = db(v.values[k]);
    return out;
}

// The cards of one job: the prepared deck, then one .control block running trials
// [first, first + count).
std::vector<std::string> job_cards(std::vector<std::string> cards, const std::string& ac,
                                   const std::vector<Part>& parts, const YieldRequest& o,
                                   std::uint64_t first, std::uint64_t count) {
    cards.pop_back();  // ".end"
    cards.push_back(".control");
    for (std::uint64_t t = first; t < first + count; ++t) {
        std::vector<double> values = trial_values(parts, o.seed, t, o.spread);
        for (std::size_t p = 0; p < parts.size(); ++p)
            if (parts[p].tolerance > 0)
                cards.push_back(fmt::format("alter {} = {:.17g}", parts[p].name, values[p]));
        cards.push_back(ac);
    }
    cards.push_back(".endc");
    cards.push_back(".end");
    return cards;
}

// Fills the distributions, the sensitivities and the worst trial.
void summarize_trials(YieldResult& r, const YieldRequest& o) {
    std::vector<double> gain, deviation, ripple, corner;
    bool every_corner = r.nominal.corner_hz.has_value();
    bool limits = false;
    for (const TrialResult& t : r.trials) {
        gain.push_back(t.figures.gain_db);
        deviation.push_back(t.figures.deviation_db);
        ripple.push_back(t.figures.ripple_db);
        if (t.figures.corner_hz)
            corner.push_back(*t.figures.corner_hz);
        else
            every_corner = false;
        limits = limits || std::isfinite(t.figures.margin_db);
    }
    r.gain = summarize(gain);
    r.deviation = summarize(deviation);
    r.ripple = summarize(ripple);
    r.corner = summarize(corner);
    r.interval = wilson_interval(r.passed, r.trials.size());
    if (r.trials.empty()) return;
    // The worst trial: a failing one before a passing one, then the smallest margin to the
    // mask, then the largest deviation.
    auto worse = [&](const TrialResult& a, const TrialResult& b) {
        if (a.figures.pass != b.figures.pass) return !a.figures.pass;
        if (limits && a.figures.margin_db != b.figures.margin_db)
            return a.figures.margin_db < b.figures.margin_db;
        return a.figures.deviation_db > b.figures.deviation_db;
    };
    const TrialResult* worst = &r.trials.front();
    for (const TrialResult& t : r.trials)
        if (worse(t, *worst)) worst = &t;
    r.worst_trial = worst->trial;
    std::vector<double> values = trial_values(r.parts, o.seed, worst->trial, o.spread);
    for (std::size_t p = 0; p < r.parts.size(); ++p)
        r.worst_values.emplace_back(r.parts[p].name, values[p]);
    if (!every_corner) return;
    r.ranked_figure = "corner";
    std::vector<std::string> names;
    std::vector<std::vector<double>> x;
    for (const Part& p : r.parts) {
        names.push_back(p.name);
        x.emplace_back();
    }
    std::vector<double> y;
    for (const TrialResult& t : r.trials) {
        std::vector<double> v = trial_values(r.parts, o.seed, t.trial, o.spread);
        for (std::size_t p = 0; p < r.parts.size(); ++p)
            x[p].push_back(v[p] / r.parts[p].nominal - 1);
        y.push_back(*t.figures.corner_hz / *r.nominal.corner_hz - 1);
    }
    r.sensitivities = rank_sensitivities(names, x, y);
}

}  // namespace

std::uint64_t trials_per_job(std::uint64_t trials) {
    return std::clamp<std::uint64_t>((trials + 3) / 4, 25, 250);
}

std::vector<double> trial_values(const std::vector<Part>& parts, std::uint64_t seed,
                                 std::uint64_t trial, Spread spread) {
    std::vector<double> out;
    out.reserve(parts.size());
    for (const Part& p : parts)
        out.push_back(p.tolerance > 0
                          ? p.nominal * (1 + p.tolerance * draw(seed, trial, p.name, spread))
                          : p.nominal);
    return out;
}

YieldResult run_yield(const YieldRequest& o, const FileSystem& files) {
    YieldResult r;
    Deck deck = load_deck(o.deck, files);
    PartList parts = find_parts(deck, o.tolerances);
    if (!parts.errors.empty()) return refuse(parts.errors.front());
    r.parts = parts.parts;
    r.held = parts.held;

    DeckAnalyses an = find_analyses(deck);
    std::optional<AcSweep> sweep = an.ac;
    if (!o.sweep.empty()) {
        std::string e;
        sweep = parse_sweep(o.sweep, e);
        if (!sweep) return refuse("--sweep: " + e);
        sweep->reltol = deck.symbols.reltol;
    }
    if (!sweep)
        return refuse(
            fmt::format("{} has no .ac sweep; give one with --sweep dec N F1 F2", o.deck));
    std::string drive = to_lower(o.drive);
    if (!drive.empty() &&
        std::find(an.sources.begin(), an.sources.end(), drive) == an.sources.end())
        return refuse(
            fmt::format("--drive {}: no independent source of that name in {}", o.drive, o.deck));
    if (drive.empty() && an.ac_sources.empty())
        return refuse(
            fmt::format("no source of {} has an AC value; name the source that drives "
                        "the circuit with --drive NAME (it gets AC 1)",
                        o.deck));
    r.sweep_card = ac_card(*sweep);

    SimJob base;
    base.label = o.deck;
    base.work_dir = fs::absolute(o.deck).parent_path().string();
    base.timeout = o.timeout;
    base.memory_limit_mb = o.memory_mb;
    auto fail = [&](const SimJob& job, const SimOutcome& out) {
        r.outcome = YieldResult::Outcome::sim_failed;
        r.failures.push_back({job.label, out.status, out.message});
        return r;
    };

    // The nominal run: every vector, to find the output and the judge.
    SimJob nominal_job = base;
    nominal_job.label = o.deck + " (nominal)";
    nominal_job.cards = simulation_cards(deck, SimDeckOptions{r.sweep_card, drive, 1, std::nullopt});
    SimOutcome nominal = simulate(nominal_job);
    if (nominal.status != SimStatus::ok) return fail(nominal_job, nominal);
    const SimPlot* plot = nullptr;
    for (const auto& p : nominal.plots)
        if (istarts_with(p.name, "ac")) plot = &p;
    const SimVector* freq = plot ? frequency_of(*plot) : nullptr;
    const SimVector* out = plot ? output_vector(*plot, o.output) : nullptr;
    if (!freq) return refuse("the nominal run produced no AC sweep");
    if (!out)
        return refuse(
            o.output.empty()
                ? std::string("the deck has no node voltage to judge; name one with --output")
                : fmt::format("--output {}: no such node in the AC results", o.output));
    r.output = out->name;
    for (const auto& f : freq->values) r.frequency.push_back(f.real());
    r.nominal_db = magnitude_db(*out);
    std::string error;
    MaskJudge judge = make_judge(o.mask, r.frequency, r.nominal_db, error);
    if (!error.empty()) return refuse(error);
    r.mask_low = judge.lower;
    r.mask_high = judge.upper;
    r.nominal = judge.judge(r.nominal_db);
    r.low_db = r.high_db = r.nominal_db;

    // The trials, in rounds of `workers` jobs (a progress report after each).
    std::vector<std::string> cards =
        simulation_cards(
            deck, SimDeckOptions{".save v(" + node_of(r.output) + ")", drive, 1, std::nullopt});
    std::string ac = r.sweep_card.substr(1);  // the .ac card as a control command
    std::uint64_t per_job = trials_per_job(o.trials);
    std::vector<SimJob> jobs;
    for (std::uint64_t first = 1; first <= o.trials; first += per_job) {
        std::uint64_t count = std::min(per_job, o.trials - first + 1);
        SimJob job = base;
        job.label = fmt::format("{} (trials {}-{})", o.deck, first, first + count - 1);
        job.cards = job_cards(cards, ac, r.parts, o, first, count);
        jobs.push_back(std::move(job));
    }
    r.jobs = static_cast<unsigned>(jobs.size());
    unsigned workers = o.workers ? o.workers : std::max(1u, std::thread::hardware_concurrency());
    auto start = Clock::now();
    std::uint64_t trial = 1;
    for (std::size_t round = 0; round < jobs.size(); round += workers) {
        std::vector<SimJob> batch(
            jobs.begin() + static_cast<std::ptrdiff_t>(round),
            jobs.begin() + static_cast<std::ptrdiff_t>(std::min(jobs.size(), round + workers)));
        std::vector<SimOutcome> outcomes = simulate_all(batch, workers, SimProcesses::automatic);
        for (std::size_t j = 0; j < batch.size(); ++j) {
            if (outcomes[j].status != SimStatus::ok) return fail(batch[j], outcomes[j]);
            std::uint64_t expected = std::min(per_job, o.trials - trial + 1);
            std::uint64_t got = 0;
            for (const SimPlot& p : outcomes[j].plots) {
                if (!istarts_with(p.name, "ac")) continue;
                const SimVector* v = p.find(r.output);
                if (!v) v = p.find("v(" + node_of(r.output) + ")");
                if (!v || v->values.size() != r.frequency.size()) {
                    r.outcome = YieldResult::Outcome::sim_failed;
                    r.problems.push_back(fmt::format("{}: plot {} lacks {} at {} points",
                                                     batch[j].label, p.name, r.output,
                                                     r.frequency.size()));
                    return r;
                }
                std::vector<double> m = magnitude_db(*v);
                TrialResult t{trial + got, judge.judge(m)};
                r.passed += t.figures.pass;
                for (std::size_t k = 0; k < m.size(); ++k) {
                    r.low_db[k] = std::min(r.low_db[k], m[k]);
                    r.high_db[k] = std::max(r.high_db[k], m[k]);
                }
                r.trials.push_back(t);
                ++got;
            }
            if (got != expected) {
                r.outcome = YieldResult::Outcome::sim_failed;
                r.problems.push_back(
                    fmt::format("{}: {} AC plots for {} trials", batch[j].label, got, expected));
                return r;
            }
            trial += got;
        }
        r.seconds = std::chrono::duration<double>(Clock::now() - start).count();
        if (o.progress) o.progress({trial - 1, o.trials, r.passed, r.seconds});
    }
    summarize_trials(r, o);
    return r;
}

}  // namespace deckscale
