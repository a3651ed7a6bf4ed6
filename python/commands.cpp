#include "python/commands.hpp"

#include <pybind11/stl.h>

#include <filesystem>

#include "base/text_util.hpp"
#include "batch/report.hpp"
#include "batch/summary.hpp"
#include "batch/workers.hpp"
#include "deckscale/internal.hpp"
#include "python/convert.hpp"
#include "python/interrupt.hpp"
#include "deck/analyses.hpp"
#include "retarget/response_change.hpp"
#include "retarget/retarget.hpp"
#include "stress/report.hpp"
#include "values/snap.hpp"
#include "yield/report.hpp"
#include "yield/run.hpp"
#include "scale/cautions.hpp"

namespace deckscale::python {
namespace {

using namespace pybind11::literals;
namespace fs = std::filesystem;

ESeries series_of(const std::string& name) {
    auto s = e_series(name);
    if (!s) raise_request_error("'" + name + "' is not an IEC 60063 series (E3 ... E192)");
    return *s;
}

py::list preferred_values(const std::string& name) {
    py::list values;
    for (int h : series_of(name).hundredths) values.append(h / 100.0);
    return values;
}

SnapSeries snap_series(const std::string& text) {
    std::string error;
    auto s = parse_snap_series(text, error);
    if (!s) raise_request_error("series: " + error);
    return *s;
}

void refuse_overwriting(const std::string& output, const std::string& deck) {
    std::error_code ec;
    if (fs::exists(output, ec) && fs::exists(deck, ec) && fs::equivalent(output, deck, ec))
        raise_request_error("'" + output + "' is the input deck; it is never overwritten");
}

// The response change rounding caused, as the snap command reports it: nullopt when the
// deck has no sweep or no driven source (with `why`), a dict with "problem" when the
// simulation failed.
py::object snap_response(const Deck& ideal, const std::string& ideal_path,
                         const std::string& rounded_path, const std::string& node,
                         py::handle sweep, py::handle drive, double timeout,
                         std::uint64_t memory_mb) {
    DeckAnalyses an = find_analyses(ideal);
    std::optional<AcSweep> ac = an.ac;
    if (std::vector<std::string> words = sweep_of(sweep); !words.empty()) {
        std::string error;
        ac = parse_sweep(words, error);
        if (!ac) raise_request_error("sweep: " + error);
    }
    std::string source = drive.is_none() ? "" : to_lower(drive.cast<std::string>());
    if (!ac || (an.ac_sources.empty() && source.empty())) return py::none();
    ProbeSettings probe{node, source, 1, std::chrono::milliseconds(static_cast<long>(timeout * 1000)),
                        memory_mb};
    ResponseChange c;
    {
        Simulating unlocked;
        DiskFileSystem disk;
        Deck rounded = load_deck(rounded_path, disk);
        c = response_change(ideal, ideal_path, rounded, rounded_path, probe, *ac);
    }
    raise_if_interrupted();
    if (!c.problem.empty()) return py::dict("problem"_a = c.problem);
    auto ripple = [](const Ripple& r) {
        return r.valley_hz > 0 ? py::dict("db"_a = r.db, "valley_hz"_a = r.valley_hz)
                               : py::dict("db"_a = py::none(), "valley_hz"_a = py::none());
    };
    auto optional = [](const std::optional<double>& x) {
        return x ? py::object(py::float_(*x)) : py::object(py::none());
    };
    return py::dict("node"_a = node, "points"_a = c.points, "max_db"_a = c.max_db,
                    "max_db_hz"_a = c.max_db_hz, "max_deg"_a = c.max_deg,
                    "max_deg_hz"_a = c.max_deg_hz, "ripple_ideal"_a = ripple(c.ripple_ideal),
                    "ripple_rounded"_a = ripple(c.ripple_rounded),
                    "corner_ideal_hz"_a = optional(c.corner_ideal),
                    "corner_rounded_hz"_a = optional(c.corner_rounded));
}

py::dict snap(py::handle deck_arg, const std::string& series, py::object output, bool write,
              const std::string& node, py::object sweep, py::object drive, double timeout,
              std::uint64_t memory_mb) {
    SnapSeries s = snap_series(series);
    api::Deck deck = deck_of(deck_arg);
    api::Scaled out;  // the written files, in the form write() takes
    out.original = deck;
    std::string path = output.is_none() ? "" : path_of(output);
    SnapResult r;
    {
        py::gil_scoped_release unlocked;
        const Deck& d = deck.impl().deck;
        r = snap_deck(d, s);
        OutputPlan plan = plan_output(d, std::move(r.edits), path, false, "-snapped");
        out.files = api::output_texts(d, plan);
        if (write && !path.empty()) api::write(out);
    }
    py::list parts;
    for (const auto& p : r.parts)
        parts.append(py::dict("name"_a = p.name, "file"_a = p.file, "line"_a = p.line,
                              "old"_a = p.old_text, "new"_a = p.new_text, "ideal"_a = p.ideal,
                              "rounded"_a = p.rounded, "error"_a = p.error(),
                              "parameter_of"_a = p.elements));
    // The response change needs the rounded deck on disk: it is simulated from there.
    py::object change = py::none();
    if (write && !path.empty())
        change = snap_response(deck.impl().deck, deck.path(), path, node, sweep, drive, timeout,
                               memory_mb);
    return py::dict("files"_a = out.files, "text"_a = text_of(out.text()), "parts"_a = parts,
                    "left_alone"_a = diagnostics(r.left_alone),
                    "warnings"_a = diagnostics(deck.warnings()), "response_change"_a = change,
                    "cautions"_a = nominal_value_cautions());
}

// ("R1", 600) -> name and value; a value may be a number or a factor text ("3.4k").
std::pair<std::string, double> named_value(py::handle pair, const char* what) {
    auto t = pair.cast<py::tuple>();
    if (t.size() != 2) raise_request_error(std::string(what) + ": give (name, value)");
    return {t[0].cast<std::string>(), factor_of(t[1])};
}

std::pair<double, double> mapping(py::handle pair, const char* what) {
    auto t = pair.cast<py::tuple>();
    if (t.size() != 2) raise_request_error(std::string(what) + ": give (old, new)");
    return {factor_of(t[0]), factor_of(t[1])};
}

py::object measurement(const std::optional<Measurement>& m) {
    if (!m) return py::none();
    return py::dict("feature"_a = to_string(m->feature), "frequency"_a = m->freq,
                    "level_db"_a = m->level_db, "sweeps"_a = m->sweeps);
}

py::dict retarget(py::handle deck, py::handle output, py::object impedance,
                  py::object impedance_map, py::object impedance_range, py::object series,
                  py::object corner, py::object center, py::object notch, py::object frequency_map,
                  py::object sweep, py::object drive, int digits, double timeout,
                  std::uint64_t memory_mb) {
    RetargetRequest q;
    q.deck = path_of(deck);
    q.output = path_of(output);
    refuse_overwriting(q.output, q.deck);
    if (!impedance.is_none()) {
        auto [name, ohms] = named_value(impedance, "impedance");
        q.impedance = ImpedanceTarget{name, 1, ohms};
    }
    if (!impedance_map.is_none()) {
        auto [from, to] = mapping(impedance_map, "impedance_map");
        q.impedance = ImpedanceTarget{"", from, to};
    }
    if (!impedance_range.is_none()) {
        auto t = impedance_range.cast<py::tuple>();
        if (t.size() != 3) raise_request_error("impedance_range: give (name, low, high)");
        double low = factor_of(t[1]), high = factor_of(t[2]);
        if (!(high > low)) raise_request_error("impedance_range: low must be below high");
        q.series = snap_series(series.is_none() ? "" : series.cast<std::string>());
        q.impedance = ImpedanceTarget{t[0].cast<std::string>(), 1, low, high};
    }
    for (auto [arg, feature] :
         {std::pair{&corner, Feature::corner}, std::pair{&center, Feature::center},
          std::pair{&notch, Feature::notch}}) {
        if (arg->is_none()) continue;
        auto [node, hz] = named_value(*arg, to_string(feature));
        q.frequency = FrequencyTarget{feature, node, 0, hz};
    }
    if (!frequency_map.is_none()) {
        auto [from, to] = mapping(frequency_map, "frequency_map");
        q.frequency = FrequencyTarget{std::nullopt, "", from, to};
    }
    q.sweep = sweep_of(sweep);
    q.drive = drive.is_none() ? "" : drive.cast<std::string>();
    q.digits = digits;
    q.timeout = std::chrono::milliseconds(static_cast<long>(timeout * 1000));
    q.memory_mb = memory_mb;
    RetargetResult r;
    {
        Simulating unlocked;
        DiskFileSystem disk;
        r = deckscale::retarget(q, disk);
    }
    raise_if_interrupted();
    using Outcome = RetargetResult::Outcome;
    const char* outcome = r.outcome == Outcome::done         ? "done"
                          : r.outcome == Outcome::refused    ? "refused"
                          : r.outcome == Outcome::sim_failed ? "sim_failed"
                                                             : "bad_input";
    if (r.outcome == Outcome::bad_input && r.written.empty()) {
        std::string why;
        for (const auto& p : r.problems) why += (why.empty() ? "" : "; ") + p;
        raise_request_error(why);
    }
    py::object verification = py::none();
    if (r.verification && r.verification->outcome != PairVerification::Outcome::bad_input)
        verification = verification_dict(api::verification_of(*r.verification));
    py::object fit = py::none();
    if (r.fit) fit = py::dict("km"_a = r.fit->km, "candidates"_a = r.fit->candidates);
    return py::dict(
        "outcome"_a = outcome, "km"_a = r.km, "kf"_a = r.kf, "element_value"_a = r.element_value,
        "before"_a = measurement(r.before), "after"_a = measurement(r.after),
        "target_hz"_a = r.target_hz, "target_error"_a = r.target_error(), "fit"_a = fit,
        "change_count"_a = r.change_count, "written"_a = r.written, "problems"_a = r.problems,
        "warnings"_a = diagnostics(r.warnings), "unscalable"_a = diagnostics(r.unscalable),
        "verification"_a = verification, "cautions"_a = nominal_value_cautions());
}

py::dict tolerance_yield(py::handle deck, std::uint64_t trials, std::uint64_t seed,
                         py::object tolerance, const std::string& spread, double mask_db,
                         py::object band, py::object corner, py::object mask_file, py::object sweep,
                         py::object drive, py::object node, py::object output, unsigned workers,
                         double timeout, std::uint64_t memory_mb) {
    YieldRequest q;
    q.deck = path_of(deck);
    q.trials = trials;
    q.seed = seed;
    if (!tolerance.is_none())
        if (auto e = parse_tolerances(tolerance.cast<std::string>(), q.tolerances); !e.empty())
            raise_request_error("tolerance " + e);
    if (spread != "uniform" && spread != "gauss")
        raise_request_error("spread: 'uniform' or 'gauss', not '" + spread + "'");
    q.spread = spread == "gauss" ? Spread::gauss : Spread::uniform;
    if (!(mask_db > 0)) raise_request_error("mask_db must be positive");
    q.mask.window_db = mask_db;
    DiskFileSystem disk;
    if (!mask_file.is_none()) {
        if (!band.is_none()) raise_request_error("mask_file excludes band");
        std::string path = path_of(mask_file), problem;
        auto text = disk.read(path, &problem);
        if (!text) raise_request_error("mask_file: cannot read '" + path + "': " + problem);
        if (auto e = parse_mask_rows(std::string(text->bytes), path, q.mask); !e.empty())
            raise_request_error(e);
    }
    if (!band.is_none()) {
        auto [lo, hi] = mapping(band, "band");
        q.mask.band_low = lo;
        q.mask.band_high = hi;
    }
    if (!corner.is_none()) {
        auto [lo, hi] = mapping(corner, "corner");
        q.mask.corner_low = lo;
        q.mask.corner_high = hi;
    }
    q.sweep = sweep_of(sweep);
    q.drive = drive.is_none() ? "" : drive.cast<std::string>();
    // `output` is the name `node` had first (elsewhere `output` names a file).
    if (!node.is_none() && !output.is_none()) raise_request_error("give node or output, not both");
    py::object judged = node.is_none() ? output : node;
    q.output = judged.is_none() ? "" : judged.cast<std::string>();
    q.workers = workers;
    q.timeout = std::chrono::milliseconds(static_cast<long>(timeout * 1000));
    q.memory_mb = memory_mb;
    YieldResult r;
    {
        Simulating unlocked;
        r = run_yield(q, disk);
    }
    raise_if_interrupted();
    if (r.outcome == YieldResult::Outcome::bad_input) {
        std::string why;
        for (const auto& p : r.problems) why += (why.empty() ? "" : "; ") + p;
        raise_request_error(why);
    }
    py::list failures;
    for (const auto& f : r.failures)
        failures.append(py::dict("deck"_a = f.label, "status"_a = to_string(f.status),
                                 "message"_a = f.message));
    if (r.outcome == YieldResult::Outcome::sim_failed)
        return py::dict("outcome"_a = "sim_failed", "problems"_a = r.problems,
                        "failures"_a = failures);
    YieldReportContext context{seed, q.spread, describe_mask(q.mask)};
    py::dict d = from_json(yield_json(r, context));
    d["outcome"] = "done";
    d["text"] = yield_text(r, context);
    d["held"] = diagnostics(r.held);
    for (auto [key, values] :
         {std::pair{"frequency", &r.frequency}, std::pair{"nominal_db", &r.nominal_db},
          std::pair{"low_db", &r.low_db}, std::pair{"high_db", &r.high_db},
          std::pair{"mask_low", &r.mask_low}, std::pair{"mask_high", &r.mask_high}})
        d[key] = array_of(*values);
    return d;
}

py::dict stress(py::handle original, py::handle scaled, double ratio, py::object ratings,
                double timeout, std::uint64_t memory_mb) {
    StressRequest q;
    q.original = path_of(original);
    q.scaled = path_of(scaled);
    q.ratio_limit = ratio;
    if (!ratings.is_none())
        if (auto e = parse_ratings(ratings.cast<std::string>(), q.ratings); !e.empty())
            raise_request_error("ratings " + e);
    q.timeout = std::chrono::milliseconds(static_cast<long>(timeout * 1000));
    q.memory_mb = memory_mb;
    StressResult r;
    {
        Simulating unlocked;
        DiskFileSystem disk;
        r = run_stress(q, disk);
    }
    raise_if_interrupted();
    if (r.outcome == StressResult::Outcome::bad_input) {
        std::string why;
        for (const auto& p : r.problems) why += (why.empty() ? "" : "; ") + p;
        raise_request_error(why);
    }
    if (r.outcome == StressResult::Outcome::sim_failed)
        return py::dict("outcome"_a = "sim_failed", "problems"_a = r.problems);
    py::dict d = from_json(stress_json(r, q));
    d["outcome"] = "done";
    d["text"] = stress_text(r, q);
    return d;
}

py::dict run_suite(Suite suite, const std::string& input, unsigned jobs, Shard shard) {
    BatchReport report;
    report.suite = input;
    report.name = suite.name;
    report.survey = suite.survey;
    report.shard = shard;
    report.suite_cases = suite.cases.size();
    {
        py::gil_scoped_release unlocked;
        WorkerSettings settings;
        settings.workers = jobs;
        auto start = std::chrono::steady_clock::now();
        report.cases = run_cases(shard_cases(suite.cases, shard), settings);
        report.seconds =
            std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    }
    py::dict d = from_json(batch_json(report));
    d["text"] = summary_text(report);
    d["unmet"] = report.unmet();
    return d;
}

py::dict batch(py::handle suite_path, unsigned jobs, py::tuple shard) {
    if (shard.size() != 2) raise_request_error("shard: give (k, n)");
    Shard s{shard[0].cast<unsigned>(), shard[1].cast<unsigned>()};
    if (s.n < 1 || s.k < 1 || s.k > s.n) raise_request_error("shard: 1 <= k <= n");
    std::string path = path_of(suite_path);
    DiskFileSystem disk;
    return run_suite(load_suite(path, disk), path, jobs, s);
}

py::dict survey(py::handle folder, py::handle km, py::handle kf, unsigned jobs) {
    std::string path = path_of(folder);
    FactorTarget f{factor_of(km), factor_of(kf), py::str(km).cast<std::string>(),
                   py::str(kf).cast<std::string>(), {}};
    return run_suite(survey_suite(path, f), path, jobs, Shard{});
}

}  // namespace

void add_commands(py::module_& m) {
    m.def("preferred_values", &preferred_values, "series"_a,
          "One decade of an IEC 60063 series ('E12' -> [1.0, 1.2, ..., 8.2]).");
    m.def(
        "nearest_preferred",
        [](double value, const std::string& series) {
            if (!(value > 0)) raise_request_error("the value must be positive");
            return nearest(series_of(series), value);
        },
        "value"_a, "series"_a,
        "The member of the series nearest to value on a logarithmic scale (midway goes up).");
    m.def("snap", &snap, "deck"_a, "series"_a = "R=E96,C=E12,L=E12", py::kw_only(),
          "output"_a = py::none(), "write"_a = true, "node"_a = "out", "sweep"_a = py::none(),
          "drive"_a = py::none(), "timeout"_a = 60.0, "memory_mb"_a = 8192,
          "Rounds every R, C and L to the nearest member of its series; returns the files' "
          "text, each part's error and what was left alone. With `output` the deck is written "
          "there (unless write=False), and `response_change` holds the change rounding caused "
          "at `node` over the deck's .ac sweep (or `sweep`), as the snap command reports it.");
    m.def("retarget", &retarget, "deck"_a, "output"_a, py::kw_only(), "impedance"_a = py::none(),
          "impedance_map"_a = py::none(), "impedance_range"_a = py::none(), "series"_a = py::none(),
          "corner"_a = py::none(), "center"_a = py::none(), "notch"_a = py::none(),
          "frequency_map"_a = py::none(), "sweep"_a = py::none(), "drive"_a = py::none(),
          "digits"_a = 9, "timeout"_a = 60.0, "memory_mb"_a = 8192,
          "Factors from design targets: impedance=('R1', 600), impedance_map=(1, 600), "
          "impedance_range=('R1', 500, 2000) with series; corner=('out', 3400), center=..., "
          "notch=..., frequency_map=(old_hz, new_hz). Writes `output`, measures again and "
          "verifies the pair.");
    m.def("yield_", &tolerance_yield, "deck"_a, py::kw_only(), "trials"_a = 500, "seed"_a = 1,
          "tolerance"_a = py::none(), "spread"_a = "uniform", "mask_db"_a = 1.0,
          "band"_a = py::none(), "corner"_a = py::none(), "mask_file"_a = py::none(),
          "sweep"_a = py::none(), "drive"_a = py::none(), "node"_a = py::none(),
          "output"_a = py::none(), "workers"_a = 0, "timeout"_a = 600.0, "memory_mb"_a = 8192,
          "Monte Carlo tolerance yield (the yield command): the --json report as a dict, with "
          "the swept frequencies, nominal response, envelope and mask as arrays.");
    m.def("stress", &stress, "original"_a, "scaled"_a, py::kw_only(), "ratio"_a = 2.0,
          "ratings"_a = py::none(), "timeout"_a = 60.0, "memory_mb"_a = 8192,
          "Per-part current, voltage and power of a rescaled deck against its original.");
    m.def("batch", &batch, "suite"_a, py::kw_only(), "jobs"_a = 0, "shard"_a = py::make_tuple(1, 1),
          "Runs a regression suite (TOML); the --json report as a dict, with 'text' and "
          "'unmet'.");
    m.def("survey", &survey, "folder"_a, "km"_a = 10, "kf"_a = 1000, py::kw_only(), "jobs"_a = 0,
          "Scales and verifies every deck under a folder, without expectations.");
}

}  // namespace deckscale::python
