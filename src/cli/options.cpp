#include "cli/options.hpp"

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include "batch/shard.hpp"
#include "scale/factor.hpp"
#include "scale/hold_items.hpp"

namespace deckscale {
namespace {

const char* kAbout =
    "deckscale: move a SPICE deck to a new impedance level (Km) and frequency (Kf), and\n"
    "prove by simulation that the rewritten deck behaves like the original.";

// Checks a factor text (or another positive number: `what` names it) and stores its value;
// returns an error text or "".
std::string take_factor(const std::string& name, const std::string& text, double& value,
                        const char* what = "the factor") {
    auto v = parse_factor(text);
    if (!v) return fmt::format("{}: '{}' is not a number (write e.g. 1k, 2.2MEG, 2*pi*1k)", name, text);
    if (!(*v > 0)) return fmt::format("{}: {} must be positive, got '{}'", name, what, text);
    value = *v;
    return "";
}

void add_yield_options(CLI::App& c, YieldOptions& y) {
    c.add_option("DECK", y.deck, "The deck whose built units are simulated")->required();
    c.add_option("--trials", y.trials, "Number of trials (default 500)")
        ->check(CLI::Range(1ul, 10000000ul));
    c.add_option("--seed", y.seed,
                 "Seed of the draws (default 1); trial k's values depend only on seed and k");
    c.add_option(
        "--tolerance", y.tolerance,
        "Tolerances per kind or part, e.g. R=1%,C=5%,L=5%,C3=0.5% (default R=1%,C=5%,L=5%)");
    c.add_option("--spread", y.spread, "uniform (default) or gauss (the tolerance as 3 sigma)")
        ->check(CLI::IsMember({"uniform", "gauss"}));
    c.add_option("--mask", y.mask, "Window around the nominal response, e.g. 0.5dB (default 1dB)");
    c.add_option("--mask-file", y.mask_file, "Absolute limits: rows of 'frequency min_dB max_dB'");
    c.add_option("--band", y.band,
                 "Frequencies F1:F2 the --mask window applies to (default: the passband)");
    c.add_option("--corner", y.corner, "Window F1:F2 the -3 dB corner must lie in");
    c.add_option("--node", y.output,
                 "The node whose response is judged (default: out, vout, output, else the first)");
    // The name this option had first; hidden, since elsewhere --output names a file.
    c.add_option("--output", y.output, "Same as --node")->group("");
    c.add_option("--sweep", y.sweep, "AC sweep instead of the deck's .ac: dec|oct|lin N F1 F2")
        ->expected(4);
    c.add_option("--drive", y.drive, "The independent source that drives the circuit (gets AC 1)");
    c.add_option("--workers", y.workers, "Simulator processes at a time (default: one per core)")
        ->check(CLI::Range(1u, 1024u));
    c.add_option("--json", y.json,
                 "Write every figure and each trial's key figures as JSON to this file");
    c.add_option("--plot", y.plot,
                 "Write an SVG of nominal, envelope and mask, and beside it a histogram");
    c.add_option("--sim-timeout", y.timeout_s,
                 "Seconds one simulator process may take (default 600)")
        ->check(CLI::PositiveNumber);
    c.add_option("--sim-memory", y.memory_mb,
                 "Megabytes of address space per simulator process (default 8192)");
}

// --sim-timeout and --sim-memory, the same on every command that simulates.
void add_sim_limits(CLI::App& c, double& timeout_s, std::uint64_t& memory_mb) {
    c.add_option("--sim-timeout", timeout_s, "Seconds one simulation may take (default 60)")
        ->check(CLI::PositiveNumber);
    c.add_option("--sim-memory", memory_mb,
                 "Megabytes of address space one simulation may use (default 8192; 0: no limit)");
}

}  // namespace

Invocation parse_command_line(const std::vector<std::string>& args) {
    Invocation inv;
    CLI::App app(kAbout, "deckscale");
    app.set_help_flag("-h,--help", "Show this help");
    app.require_subcommand(0, 1);
    bool version = false;
    app.add_flag("--version", version, "Show the version");

    auto* scale = app.add_subcommand("scale", "Rewrite every unit-carrying value of a deck by Km and Kf");
    ScaleOptions& s = inv.scale;
    scale->add_option("DECK", s.deck, "The deck to scale (it is never modified unless -i)")->required();
    scale->add_option("--km", s.km_text, "Impedance factor: new/old impedance (e.g. 50, 1k, 1/50)");
    scale->add_option("--kf", s.kf_text, "Frequency factor: new/old frequency (e.g. 2*pi*10meg)");
    scale->add_option("-o,--output", s.output, "Write the scaled deck here (default: standard output)");
    scale->add_flag("-i,--in-place", s.in_place, "Replace DECK itself (written to a temporary file, then renamed)");
    scale->add_option("--digits", s.digits, "Significant digits of rewritten values (default 9)")
        ->check(CLI::Range(3, 17));
    scale->add_flag("--changes", s.list_changes, "List every rewritten value");
    scale->add_option("--changes-json", s.changes_json, "Write the change list as JSON to this file");
    scale->add_flag("--leave-unscalable", s.leave_unscalable,
                    "Write the deck even if some items cannot be scaled; each is left as it was and "
                    "marked by a comment line");
    scale->add_flag("--flatten", s.flatten, "Write one self-contained deck with every include inlined");
    scale->add_flag(
        "--follow-flicker", s.follow_flicker,
        "Rewrite the KF of models with flicker (1/f) noise so that it follows the scaling "
        "like thermal noise (otherwise KF is kept and the noise line says so)");
    scale->add_flag("--verify", s.verify,
                    "Then simulate both decks and check that they are equivalent (needs -o)");
    scale->add_option("--threads", s.threads,
                      "Read decks of 8 MB and more on at most this many threads (default: one per "
                      "core; the result is the same)")
        ->check(CLI::Range(1u, 1024u));
    scale
        ->add_option("--hold", s.hold,
                     "Keep these parts as written: NAME (a top-level element or X instance), "
                     "model:NAME (every instance), subckt:NAME (every X instance); commas or "
                     "repeats, wildcards * and ?")
        ->delimiter(',')
        ->allow_extra_args(false);

    auto* verify = app.add_subcommand("verify", "Prove a rescaled deck equivalent to its original by simulation");
    VerifyOptions& v = inv.verify;
    verify->add_option("ORIGINAL", v.original, "The original deck")->required();
    verify->add_option("SCALED", v.scaled, "The rescaled deck")->required();
    verify->add_option("--km", v.km_text, "Impedance factor (inferred from the element values if omitted)");
    verify->add_option("--kf", v.kf_text, "Frequency factor (inferred from the element values if omitted)");
    verify->add_option("--json", v.json, "Write the report as JSON to this file");
    verify->add_option("--plot", v.plot, "Write an SVG Bode overlay of original and scaled responses");
    verify->add_option("--sweep", v.sweep, "AC sweep of the original: dec|oct|lin N F1 F2")->expected(4);
    verify->add_option("--drive", v.drive, "The independent source that drives the AC comparison (gets AC 1)");
    verify->add_option("--tolerance", v.tolerance, "Relative tolerance for AC and operating point (default 1e-6)")
        ->check(CLI::PositiveNumber);
    verify->add_option("--tolerance-db", v.tolerance_db, "Also require the AC magnitude error within this many dB");
    verify->add_option("--tolerance-deg", v.tolerance_deg, "Also require the AC phase error within this many degrees");
    verify->add_option("--tran-tolerance", v.tran_tolerance,
                       "Tolerance for transients, relative to each waveform's peak (default 1e-3)")
        ->check(CLI::PositiveNumber);
    verify->add_option("--max-step", v.max_step_text,
                       "Largest transient time step, in the original's time (e.g. 50n); the "
                       "scaled run gets it divided by Kf (default: as the .tran card says)");
    add_sim_limits(*verify, v.timeout_s, v.memory_mb);

    auto* yield = app.add_subcommand(
        "yield", "Monte Carlo tolerance yield of a deck against a response mask");
    YieldOptions& y = inv.yield;
    add_yield_options(*yield, y);

    auto* stress = app.add_subcommand(
        "stress", "Per-part current, voltage and power of a rescaled deck against its original");
    StressOptions& st = inv.stress;
    stress->add_option("ORIGINAL", st.original, "The original deck")->required();
    stress->add_option("SCALED", st.scaled, "The rescaled deck")->required();
    stress
        ->add_option("--ratio", st.ratio,
                     "Flag parts whose power or peak current grew beyond this factor (default 2)")
        ->check(CLI::PositiveNumber);
    stress->add_option("--rating", st.ratings,
                       "Ratings per kind or part, e.g. R=0.25W,C=50V,L=1A,R3=1W");
    stress->add_option("--json", st.json, "Write the table as JSON to this file");
    add_sim_limits(*stress, st.timeout_s, st.memory_mb);

    auto* retarget = app.add_subcommand(
        "retarget",
        "Move a deck to a target impedance level and band (corner, centre, notch or mapping)");
    RetargetOptions& t = inv.retarget;
    retarget->add_option("DECK", t.deck, "The proven deck (never modified)")->required();
    retarget->add_option("-o,--output", t.output, "Write the retargeted deck here")->required();
    auto* zi = retarget->add_option("--impedance", t.impedance,
                                    "NAME=VALUE: the named resistor (or T line or port Z0) gets this value (R1=600)");
    auto* zm = retarget->add_option("--impedance-map", t.impedance_map,
                                    "OLD:NEW: impedance level OLD becomes NEW (1:600)");
    auto* zr =
        retarget->add_option("--impedance-range", t.impedance_range,
                             "NAME=LOW:HIGH: the named resistor gets the value in this range at "
                             "which the parts round best to --series (R1=500:2k)");
    retarget->add_option("--plot", t.plot,
                         "Write an SVG overlay: the original moved to the new band, the "
                         "output, the target marked, and the deviation");
    retarget->add_option("--series", t.series,
                         "Series per kind for --impedance-range (R=E96,C=E12,L=E12, or E24 for all)");
    zi->excludes(zm);
    zr->excludes(zi);
    zr->excludes(zm);
    std::vector<CLI::Option*> freq{
        retarget->add_option("--corner", t.corner,
                             "NODE=FREQ: the -3 dB corner of NODE's response moves to FREQ"),
        retarget->add_option("--center", t.center,
                             "NODE=FREQ: the peak of NODE's band-pass response moves to FREQ"),
        retarget->add_option("--notch", t.notch,
                             "NODE=FREQ: the notch minimum of NODE's response moves to FREQ"),
        retarget->add_option("--frequency-map", t.frequency_map,
                             "OLD:NEW: frequency OLD becomes NEW (1rad/s:3.4k; rad/s or Hz)")};
    for (auto* a : freq)
        for (auto* b : freq)
            if (a != b) a->excludes(b);
    retarget
        ->add_option("--sweep", t.sweep,
                     "AC sweep of the original to measure on: dec|oct|lin N F1 F2 "
                     "(default: the deck's .ac)")
        ->expected(4);
    retarget->add_option("--drive", t.drive,
                         "The independent source that drives the response (gets AC 1)");
    retarget->add_option("--digits", t.digits, "Significant digits of rewritten values (default 9)")
        ->check(CLI::Range(3, 17));
    add_sim_limits(*retarget, t.timeout_s, t.memory_mb);

    auto* snap = app.add_subcommand(
        "snap", "Round every R, C and L to preferred values (IEC 60063 E series)");
    SnapOptions& n = inv.snap;
    snap->add_option("DECK", n.deck, "The deck with ideal values (never modified)")->required();
    snap->add_option("-o,--output", n.output, "Write the rounded deck here")->required();
    snap->add_option("--series", n.series, "Series per kind, e.g. R=E96,C=E12,L=E12 (E3 ... E192); a bare E24 is for every kind not named")
        ->required();
    snap->add_option("--plot", n.plot,
                     "Write an SVG overlay of the ideal and the rounded response with "
                     "the deviation");
    snap->add_option("--node", n.node, "The node whose response change is reported (default: out)");
    snap->add_option("--sweep", n.sweep,
                     "AC sweep for the response change: dec|oct|lin N F1 F2 "
                     "(default: the deck's .ac)")
        ->expected(4);
    snap->add_option("--drive", n.drive,
                     "The independent source that drives the response (gets AC 1)");
    add_sim_limits(*snap, n.timeout_s, n.memory_mb);

    auto* batch = app.add_subcommand(
        "batch",
        "Run a regression suite (SUITE.toml), survey a folder of decks, or merge shard reports");
    BatchOptions& b = inv.batch;
    batch->add_option("SUITE", b.inputs,
                      "The suite file, or a folder of decks to survey; with --merge: the "
                      "shards' JSON reports")
        ->required();
    batch->add_option("-j,--jobs", b.jobs,
                      "Cases run at once, each in a worker process (default: one per core)")
        ->check(CLI::Range(1u, 1024u));
    batch->add_option("--junit", b.junit, "Write a JUnit XML report to this file");
    batch->add_option("--json", b.json, "Write the JSON report (every figure) to this file");
    batch->add_option("--shard", b.shard_text,
                      "Run only shard K of N (cases chosen by a hash of their name)");
    batch->add_flag("--merge", b.merge, "Merge the JSON reports of all shards into one report");
    batch->add_option("--km", b.km_text, "Survey: the impedance factor to try (default 10)");
    batch->add_option("--kf", b.kf_text, "Survey: the frequency factor to try (default 1k)");

    std::vector<std::string> reversed(args.rbegin(), args.rend());
    try {
        app.parse(reversed);
    } catch (const CLI::CallForHelp&) {
        inv.what = Invocation::What::help;
        inv.text = app.get_subcommands().empty() ? app.help() : app.get_subcommands().front()->help();
        return inv;
    } catch (const CLI::ParseError& e) {
        inv.what = Invocation::What::usage_error;
        inv.text = e.what();
        return inv;
    }
    if (version) {
        inv.what = Invocation::What::version;
        inv.text = fmt::format("deckscale {}\n", DECKSCALE_VERSION);
        return inv;
    }
    auto usage = [&](std::string text) {
        inv.what = Invocation::What::usage_error;
        inv.text = std::move(text);
        return inv;
    };
    if (scale->parsed()) {
        inv.what = Invocation::What::scale;
        if (auto err = take_factor("--km", s.km_text, s.km); !err.empty()) return usage(err);
        if (auto err = take_factor("--kf", s.kf_text, s.kf); !err.empty()) return usage(err);
        if (s.in_place && !s.output.empty()) return usage("-i/--in-place and -o/--output exclude each other");
        if (s.verify && (s.output.empty() || s.in_place))
            return usage("--verify needs the original and the scaled deck in files: give -o OUT");
        std::string bad;
        if (!read_hold_items(s.hold, bad)) return usage(bad);
        return inv;
    }
    if (verify->parsed()) {
        inv.what = Invocation::What::verify;
        if (v.km_text.empty() != v.kf_text.empty())
            return usage("give both --km and --kf, or neither (then they are inferred)");
        if (!v.km_text.empty()) {
            v.factors_given = true;
            if (auto err = take_factor("--km", v.km_text, v.km); !err.empty()) return usage(err);
            if (auto err = take_factor("--kf", v.kf_text, v.kf); !err.empty()) return usage(err);
        }
        if (!v.max_step_text.empty())
            if (auto err = take_factor("--max-step", v.max_step_text, v.max_step, "the step");
                !err.empty())
                return usage(err);
        return inv;
    }
    if (yield->parsed()) {
        inv.what = Invocation::What::yield;
        return inv;
    }
    if (stress->parsed()) {
        inv.what = Invocation::What::stress;
        return inv;
    }
    if (retarget->parsed()) {
        inv.what = Invocation::What::retarget;
        if (t.impedance.empty() && t.impedance_map.empty() && t.impedance_range.empty() &&
            t.corner.empty() && t.center.empty() && t.notch.empty() && t.frequency_map.empty())
            return usage(
                "retarget needs a target: --impedance, --impedance-map or "
                "--impedance-range, and/or one of --corner, --center, --notch, --frequency-map");
        if (t.impedance_range.empty() != t.series.empty())
            return usage(
                "--impedance-range and --series go together: the range is searched for the "
                "level at which the parts round best to the series");
        return inv;
    }
    if (snap->parsed()) {
        inv.what = Invocation::What::snap;
        return inv;
    }
    if (batch->parsed()) {
        inv.what = Invocation::What::batch;
        if (auto err = take_factor("--km", b.km_text, b.km); !err.empty()) return usage(err);
        if (auto err = take_factor("--kf", b.kf_text, b.kf); !err.empty()) return usage(err);
        if (!b.merge && b.inputs.size() != 1)
            return usage("batch takes one suite file or folder (several files only with --merge)");
        if (!b.shard_text.empty()) {
            auto shard = parse_shard(b.shard_text);
            if (!shard)
                return usage(
                    fmt::format("--shard: '{}' is not K/N with 1 <= K <= N", b.shard_text));
            if (b.merge) return usage("--shard and --merge exclude each other");
            b.shard_k = shard->k;
            b.shard_n = shard->n;
        }
        return inv;
    }
    inv.what = Invocation::What::help;
    inv.text = app.help();
    return inv;
}

}  // namespace deckscale
