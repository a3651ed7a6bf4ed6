#include "cli/options.hpp"

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include "batch/shard.hpp"
#include "scale/factor.hpp"

namespace deckscale {
namespace {

const char* kAbout =
    "deckscale: move a SPICE deck to a new impedance level (Km) and frequency (Kf), and\n"
    "prove by simulation that the rewritten deck behaves like the original.";

// Checks a factor text and stores its value; returns an error text or "".
std::string take_factor(const std::string& name, const std::string& text, double& value) {
    auto v = parse_factor(text);
    if (!v) return fmt::format("{}: '{}' is not a number (write e.g. 1k, 2.2MEG, 2*pi*1k)", name, text);
    if (!(*v > 0)) return fmt::format("{}: the factor must be positive, got '{}'", name, text);
    value = *v;
    return "";
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
    scale->add_flag("--verify", s.verify,
                    "Then simulate both decks and check that they are equivalent (needs -o)");
    scale->add_option("--threads", s.threads,
                      "Read decks of 8 MB and more on at most this many threads (default: one per "
                      "core; the result is the same)")
        ->check(CLI::Range(1u, 1024u));

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
    verify->add_option("--sim-timeout", v.timeout_s, "Seconds one simulation may take (default 60)")
        ->check(CLI::PositiveNumber);
    verify->add_option("--sim-memory", v.memory_mb,
                       "Megabytes of address space one simulation may use (default 8192; 0: no "
                       "limit)");

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
