// Command-line options: a pure function from arguments to what to do.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace deckscale {

struct ScaleOptions {
    std::string deck;
    double km = 1;
    double kf = 1;
    std::string km_text = "1", kf_text = "1";  // as the user wrote them
    std::string output;            // empty: standard output
    bool in_place = false;
    int digits = 9;
    bool list_changes = false;     // --changes
    std::string changes_json;      // --changes-json FILE
    bool leave_unscalable = false; // --leave-unscalable
    bool flatten = false;          // --flatten
    bool verify = false;           // --verify (scale, then verify the pair)
    unsigned threads = 0;          // --threads N: large decks read on at most N threads (0: cores)
};

struct VerifyOptions {
    std::string original;
    std::string scaled;
    bool factors_given = false;
    double km = 1, kf = 1;
    std::string km_text, kf_text;
    std::string json;      // --json REPORT
    std::string plot;      // --plot FILE.svg
    std::vector<std::string> sweep;  // --sweep dec N F1 F2
    std::string drive;     // --drive SOURCE: the source that gets "AC 1"
    double tolerance = 1e-6;        // relative, AC and operating point
    double tran_tolerance = 1e-3;   // relative to each waveform's peak
    double tolerance_db = 0;        // 0 = not used
    double tolerance_deg = 0;       // 0 = not used
    double timeout_s = 60;
    std::uint64_t memory_mb = 8192;  // address space per simulator process; 0 = no limit
};

struct BatchOptions {
    std::vector<std::string> inputs;  // the suite file or a folder to survey; --merge: reports
    unsigned jobs = 0;                // -j N worker processes (0: one per core)
    std::string junit, json;          // --junit FILE, --json FILE
    std::string shard_text;           // --shard K/N as written ("" = all cases)
    unsigned shard_k = 1, shard_n = 1;
    bool merge = false;               // --merge: the inputs are shards' JSON reports
    double km = 10, kf = 1000;        // survey factors (--km, --kf)
    std::string km_text = "10", kf_text = "1k";
};

struct Invocation {
    enum class What { help, version, scale, verify, batch, usage_error } what = What::help;
    std::string text;  // help text or the usage error
    ScaleOptions scale;
    VerifyOptions verify;
    BatchOptions batch;
};

// args excludes the program name.
Invocation parse_command_line(const std::vector<std::string>& args);

}  // namespace deckscale
