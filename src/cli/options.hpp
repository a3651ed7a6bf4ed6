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
    bool follow_flicker = false;   // --follow-flicker: rewrite KF so flicker noise follows
    unsigned threads = 0;          // --threads N: large decks read on at most N threads (0: cores)
    std::vector<std::string> hold;  // --hold NAME[,NAME...]: parts kept as written
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
    std::string max_step_text;       // --max-step: the transient runs' largest step
    double max_step = 0;             // its value in seconds; 0 = as the .tran card says
};

struct YieldOptions {
    std::string deck;
    std::uint64_t trials = 500;
    std::uint64_t seed = 1;
    std::string tolerance;           // --tolerance R=1%,C=5%,L=5%,C3=0.5%
    std::string spread = "uniform";  // --spread uniform|gauss
    std::string mask;                // --mask 1dB: the window around the nominal
    std::string mask_file;           // --mask-file FILE
    std::string band;                // --band F1:F2
    std::string corner;              // --corner F1:F2
    std::string output;              // --output NODE
    std::vector<std::string> sweep;  // --sweep dec N F1 F2
    std::string drive;               // --drive SOURCE
    unsigned workers = 0;            // --workers N (0: one per core)
    std::string json;                // --json FILE
    std::string plot;                // --plot FILE.svg
    double timeout_s = 600;
    std::uint64_t memory_mb = 8192;
};

struct StressOptions {
    std::string original;
    std::string scaled;
    double ratio = 2;     // --ratio X: flag growth of power or current beyond this
    std::string ratings;  // --rating R=0.25W,C=50V,L=1A,R3=1W
    std::string json;     // --json FILE
    double timeout_s = 60;
    std::uint64_t memory_mb = 8192;
};

struct RetargetOptions {
    std::string deck;
    std::string output;                    // -o OUT (required)
    std::string impedance, impedance_map;  // NAME=VALUE | OLD:NEW
    std::string impedance_range;           // NAME=LOW:HIGH: best fit of the level (needs series)
    std::string series;                    // --series R=E96,C=E12,L=E12 for the best fit
    std::string plot;                      // --plot FILE.svg
    std::string corner, center, notch, frequency_map;  // NODE=FREQ | OLD:NEW
    std::vector<std::string> sweep;  // --sweep dec N F1 F2: where the feature is measured
    std::string drive;               // --drive SOURCE
    int digits = 9;
    double timeout_s = 60;
    std::uint64_t memory_mb = 8192;
};

struct SnapOptions {
    std::string deck;
    std::string output;  // -o OUT (required)
    std::string series;  // --series R=E96,C=E12,L=E12
    std::string node;    // --node: whose response change is reported ("" = out)
    std::string plot;    // --plot FILE.svg
    std::vector<std::string> sweep;
    std::string drive;
    double timeout_s = 60;
    std::uint64_t memory_mb = 8192;
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
    enum class What {
        help, version, scale, verify, retarget, snap, yield, stress, batch, usage_error
    } what = What::help;
    std::string text;  // help text or the usage error
    ScaleOptions scale;
    VerifyOptions verify;
    RetargetOptions retarget;
    SnapOptions snap;
    YieldOptions yield;
    StressOptions stress;
    BatchOptions batch;
};

// args excludes the program name.
Invocation parse_command_line(const std::vector<std::string>& args);

}  // namespace deckscale
