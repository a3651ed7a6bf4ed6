// End-to-end tests of `deckscale verify` through the real binary: each test writes its own
// decks into a fresh temporary directory.
#include <pwd.h>
#include <unistd.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <complex>
#include <optional>
#include <string>
#include <vector>

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include "deck/load.hpp"
#include "sim/simulate.hpp"
#include "support/common.hpp"
#include "verify/sim_cards.hpp"

namespace deckscale {
namespace {

using test::read_bytes;
using test::run_binary;
using test::RunResult;
using test::TempDir;
using test::write_bytes;
namespace fs = std::filesystem;

std::string demo_ladder() { return test::source_dir() + "/netlists/demo/ladder5_proto.cir"; }

// Scales `original` into `scaled` with the tool itself; fails the test if it does not work.
void scale(const TempDir& dir, const std::string& original, const std::string& scaled, const std::string& km,
           const std::string& kf) {
    RunResult r = run_binary({"scale", original, "--km", km, "--kf", kf, "-o", scaled}, dir.path());
    ASSERT_EQ(r.exit_code, 0) << r.err;
}

// An RC low-pass driven by an AC source.
const char* kRc =
    "rc low-pass for verify\n"
    "V1 in 0 dc 0 ac 1\n"
    "R1 in out 1k\n"
    "C1 out 0 1u\n"
    ".ac dec 10 10 10k\n"
    ".end\n";

TEST(VerifyCommand, ScaledLadderPassesAndOneCapacitorOffFails) {
    TempDir dir;
    scale(dir, demo_ladder(), "l.cir", "50", "2*pi*10meg");
    RunResult ok = run_binary({"verify", demo_ladder(), "l.cir"}, dir.path());
    EXPECT_EQ(ok.exit_code, 0) << ok.out << ok.err;
    EXPECT_NE(ok.out.find("\nPASS: "), std::string::npos) << ok.out;

    // C3 (from n2 to ground) 1 % too large, whatever digits the scaler wrote.
    std::string text = read_bytes(dir.file("l.cir"));
    const std::string c3_card = "\nC3    n2  0  ";
    auto line = text.find(c3_card);
    ASSERT_NE(line, std::string::npos) << text;
    auto at = line + c3_card.size(), end = text.find('\n', at);
    double c3 = std::stod(text.substr(at, end - at));
    EXPECT_NEAR(c3, 2 / (50 * 2 * M_PI * 1e7), 1e-6 * c3);
    text.replace(at, end - at, "6.429860e-10");
    write_bytes(dir.file("off.cir"), text);

    RunResult given = run_binary({"verify", demo_ladder(), "off.cir", "--km", "50", "--kf", "2*pi*10meg"},
                                 dir.path());
    EXPECT_EQ(given.exit_code, 1) << given.out << given.err;
    // The node the capacitor sits on is the worst vector of the sweep, and fails.
    auto table = given.out.find("phase deg\n");
    ASSERT_NE(table, std::string::npos) << given.out;
    EXPECT_EQ(given.out.substr(table + 10, 6), "    n2") << given.out;
    EXPECT_NE(given.out.find("FAIL: the scaled deck is NOT equivalent"), std::string::npos);

    // Inferred factors: the median ignores the outlier and the report names it with file:line.
    RunResult inferred = run_binary({"verify", demo_ladder(), "off.cir"}, dir.path());
    EXPECT_EQ(inferred.exit_code, 1) << inferred.out << inferred.err;
    EXPECT_NE(inferred.out.find("  elements   1 matched element(s) disagree with the factors:\n    " +
                                demo_ladder() + ":9: c3 is 2.000000 (scaled off.cir:9: 6.429860e-10)"),
              std::string::npos)
        << inferred.out;
}

TEST(VerifyCommand, DecksInDifferentFoldersWithTheirOwnIncludes) {
    TempDir dir;
    write_bytes(dir.path() / "proto/top.cir",
                "split across files\nV1 in 0 dc 0 ac 1\n.include parts/net.inc\n.ac dec 10 10 10k\n.end\n");
    write_bytes(dir.path() / "proto/parts/net.inc", "R1 in mid 1k\nC1 mid 0 1u\nR2 mid out 2k\nC2 out 0 100n\n");
    // A scaled pair written by hand into another folder, with its include in yet another
    // relative place and the same file name as the original's (Km = 10, Kf = 100).
    write_bytes(dir.path() / "far/away/top.cir",
                "split across files\nV1 in 0 dc 0 ac 1\n.include ../lib/parts/net.inc\n.ac dec 10 1k 1meg\n.end\n");
    write_bytes(dir.path() / "far/lib/parts/net.inc", "R1 in mid 10k\nC1 mid 0 1n\nR2 mid out 20k\nC2 out 0 100p\n");
    for (const fs::path& cwd : {dir.path(), dir.path() / "far/away"}) {
        SCOPED_TRACE(cwd.string());
        std::string o = fs::relative(dir.path() / "proto/top.cir", cwd).string();
        std::string s = fs::relative(dir.path() / "far/away/top.cir", cwd).string();
        RunResult r = run_binary({"verify", o, s}, cwd);
        EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
        EXPECT_NE(r.out.find("factors    Km = 10, Kf = 100  (inferred from 2 resistor and 2 C/L pairs)"),
                  std::string::npos)
            << r.out;
    }
    // The scale command's own output of the same split deck verifies as well.
    fs::create_directories(dir.path() / "out");
    scale(dir, "proto/top.cir", "out/top.cir", "10", "100");
    RunResult r = run_binary({"verify", "proto/top.cir", "out/top.cir"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
}

// A filesource model reads its data file from the folder its deck runs in (ngspice 39 manual
// 12.2.9). Scaled into another folder without the file, the scaled run fails ("timestep too
// small") or, as seen under the sanitizers, runs on values read from nowhere and fails the
// comparison; neither names the file: scale and verify both say which file is left behind,
// and with the file copied beside it the pair verifies.
TEST(VerifyCommand, ADataFileLeftBehindIsNamed) {
    TempDir dir;
    write_bytes(dir.path() / "bench/rec.cir",
                "recorded stimulus\n"
                "a1 [%v src] play\n"
                ".model play filesource(file=\"rec.txt\" timescale=1m amploffset=[0] "
                "amplscale=[1])\n"
                "R1 src out 1k\nC1 out 0 100n\n.tran 10u 3m\n.end\n");
    write_bytes(dir.path() / "bench/rec.txt", "0 0\n1 1\n2 1\n3 0\n");
    fs::create_directories(dir.path() / "out");
    RunResult s = run_binary({"scale", "bench/rec.cir", "--km", "10", "--kf", "100", "-o",
                              "out/rec.cir"},
                             dir.path());
    ASSERT_EQ(s.exit_code, 0) << s.err;
    const std::string named = "note: model 'play' reads 'rec.txt' from the folder ngspice runs in";
    EXPECT_NE(s.err.find(named), std::string::npos) << s.err;
    RunResult v = run_binary({"verify", "bench/rec.cir", "out/rec.cir"}, dir.path());
    EXPECT_TRUE(v.exit_code == 3 || v.exit_code == 1) << v.out << v.err;
    EXPECT_EQ(v.err.find("simulating bench/rec.cir"), std::string::npos) << v.err;
    EXPECT_NE(v.err.find(named), std::string::npos) << v.err;
    write_bytes(dir.path() / "out/rec.txt", read_bytes(dir.path() / "bench/rec.txt"));
    v = run_binary({"verify", "bench/rec.cir", "out/rec.cir"}, dir.path());
    EXPECT_EQ(v.exit_code, 0) << v.out << v.err;
    EXPECT_EQ(v.err.find(named), std::string::npos) << v.err;
}

TEST(VerifyCommand, ControlBlocksNeverRun) {
    struct Case {
        int line;
        std::string control;
    };
    const std::vector<Case> cases{
        {__LINE__, ".control\nshell touch marker\n.endc\n"},
        {__LINE__, ".control\nrun\nshell echo x > marker\n.endc\n"},
        // 'quit' inside the block would end ngspice; the block is stripped, so the run is clean.
        {__LINE__, ".control\nrun\nquit\n.endc\n"},
        {__LINE__, ".control\nshell touch marker\nquit\n.endc\n"},
        // A sourced script (written below as evil.cir) would run its own control block.
        {__LINE__, ".control\nsource evil.cir\n.endc\n"},
    };
    for (const auto& k : cases) {
        SCOPED_TRACE(k.line);
        TempDir dir;
        std::string deck = kRc;
        deck.insert(deck.find(".end\n"), k.control);
        write_bytes(dir.file("o.cir"), deck);
        write_bytes(dir.file("evil.cir"), "evil\n.control\nshell touch marker\n.endc\n.end\n");
        RunResult r = run_binary({"verify", "o.cir", "o.cir"}, dir.path());
        EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
        EXPECT_EQ(r.err, "");
        EXPECT_NE(r.out.find("\nPASS: "), std::string::npos);
        EXPECT_FALSE(fs::exists(dir.path() / "marker"));
    }
}

TEST(VerifyCommand, SimulatorFailuresExitThreeWithNgspicesWords) {
    struct Case {
        int line;
        std::string deck;
        std::vector<std::string> extra;
        std::string expected;  // a piece of ngspice's message in stderr
    };
    const std::vector<Case> cases{
        {__LINE__, "unknown model\nV1 in 0 dc 0 ac 1\nR1 in out 1k\nD1 out 0 nosuchdiode\n.ac dec 5 10 1k\n.end\n",
         {}, "can't find model 'nosuchdiode'"},
        {__LINE__, "undefined parameter\nV1 in 0 dc 0 ac 1\nR1 in out {rmissing}\nC1 out 0 1u\n.ac dec 5 10 1k\n.end\n",
         {}, "Undefined parameter [rmissing]"},
        {__LINE__, "voltage loop\nV1 a 0 dc 1 ac 1\nV2 a 0 dc 2\nR1 a 0 1k\n.ac dec 5 10 1k\n.end\n",
         {}, "singular matrix"},
        {__LINE__, "unknown subcircuit\nV1 in 0 dc 0 ac 1\nX1 in out nowhere\nR1 out 0 1k\n.ac dec 5 10 1k\n.end\n",
         {}, "nowhere"},
        {__LINE__,
         "long transient\nV1 in 0 dc 0 pulse(0 1 0 1n 1n 1u 2u)\nR1 in out 1k\nC1 out 0 1n\n.tran 1p 1\n.end\n",
         {"--sim-timeout", "0.3"}, "did not finish within 300 ms and was stopped"},
    };
    for (const auto& k : cases) {
        SCOPED_TRACE(k.line);
        TempDir dir;
        write_bytes(dir.file("bad.cir"), k.deck);
        std::vector<std::string> args{"verify", "bad.cir", "bad.cir", "--km", "1", "--kf", "1"};
        args.insert(args.end(), k.extra.begin(), k.extra.end());
        auto start = std::chrono::steady_clock::now();
        RunResult r = run_binary(args, dir.path());
        auto took = std::chrono::steady_clock::now() - start;
        EXPECT_EQ(r.exit_code, 3) << r.out << r.err;
        EXPECT_EQ(r.err.rfind("deckscale: error: simulating bad.cir (", 0), 0u) << r.err;
        EXPECT_NE(r.err.find(k.expected), std::string::npos) << r.err;
        EXPECT_EQ(r.out, "");
        EXPECT_LT(took, std::chrono::seconds(5));
    }
}

TEST(VerifyCommand, UnterminatedSubcircuitIsRefusedByTheReader) {
    // ngspice's own "missing .ends" never comes up: the reader refuses every unterminated
    // .subckt before any simulation, also when the only .ends is after .end, inside a
    // .control block or in the including file. So this class is bad input (exit 2).
    TempDir dir;
    write_bytes(dir.file("open.cir"),
                "open subcircuit\nV1 in 0 dc 0 ac 1\nX1 in out blk\n.subckt blk a b\nR1 a b 1k\n"
                "C1 b 0 1u\n.ac dec 10 10 10k\n.end\n.ends\n");
    RunResult r = run_binary({"verify", "open.cir", "open.cir"}, dir.path());
    EXPECT_EQ(r.exit_code, 2);
    EXPECT_EQ(r.err,
              "open.cir:4:1: error: unterminated .subckt 'blk': no .ends before the end of the file\n"
              "  .subckt blk a b\n"
              "  ^~~~~~~\n");
    EXPECT_EQ(r.out, "");
}

TEST(VerifyCommand, DriveSourceOperatingPointFallbackAndSweepOverride) {
    TempDir dir;
    write_bytes(dir.file("quiet.cir"), "no ac source\nV1 in 0 dc 2\nR1 in out 1k\nR2 out 0 3k\nC1 out 0 1u\n.ac dec 5 1 1k\n.end\n");
    scale(dir, "quiet.cir", "quiet_s.cir", "10", "100");

    RunResult no_drive = run_binary({"verify", "quiet.cir", "quiet_s.cir"}, dir.path());
    EXPECT_EQ(no_drive.exit_code, 2);
    EXPECT_EQ(no_drive.err,
              "deckscale: error: no source of quiet.cir has an AC value, so an AC sweep shows nothing; "
              "name the source that drives the circuit with --drive NAME (it gets AC 1)\n");

    RunResult driven = run_binary({"verify", "quiet.cir", "quiet_s.cir", "--drive", "V1"}, dir.path());
    EXPECT_EQ(driven.exit_code, 0) << driven.out << driven.err;
    EXPECT_NE(driven.out.find("  AC sweep: 16 points, 1 Hz .. 1000 Hz of the original, 3 vectors\n"),
              std::string::npos)
        << driven.out;

    RunResult wrong = run_binary({"verify", "quiet.cir", "quiet_s.cir", "--drive", "V9"}, dir.path());
    EXPECT_EQ(wrong.exit_code, 2);
    EXPECT_EQ(wrong.err, "deckscale: error: --drive V9: no independent source of that name in quiet.cir\n");

    // A current source as the drive: 1 A in the original is 1/Km A in the scaled deck.
    write_bytes(dir.file("idrive.cir"), "current driven\nI1 0 out dc 0\nR1 out 0 1k\nC1 out 0 1u\n.ac dec 5 1 1k\n.end\n");
    scale(dir, "idrive.cir", "idrive_s.cir", "10", "100");
    RunResult current = run_binary({"verify", "idrive.cir", "idrive_s.cir", "--drive", "i1"}, dir.path());
    EXPECT_EQ(current.exit_code, 0) << current.out << current.err;

    // No analysis at all: an operating point comparison.
    write_bytes(dir.file("bare.cir"), "no analysis\nV1 in 0 dc 2\nR1 in out 1k\nR2 out 0 3k\nC1 out 0 1u\n.end\n");
    scale(dir, "bare.cir", "bare_s.cir", "10", "100");
    RunResult op = run_binary({"verify", "bare.cir", "bare_s.cir"}, dir.path());
    EXPECT_EQ(op.exit_code, 0) << op.out << op.err;
    EXPECT_NE(op.out.find("  Operating point: 3 vectors\n"), std::string::npos) << op.out;
    EXPECT_EQ(op.out.find("AC sweep"), std::string::npos);

    // An operating point with the wrong DC level in the scaled deck fails.
    std::string wrong_dc = read_bytes(dir.file("bare_s.cir"));
    wrong_dc.replace(wrong_dc.find("dc 2"), 4, "dc 3");
    write_bytes(dir.file("bare_w.cir"), wrong_dc);
    EXPECT_EQ(run_binary({"verify", "bare.cir", "bare_w.cir"}, dir.path()).exit_code, 1);

    // --sweep replaces the deck's own sweep.
    write_bytes(dir.file("rc.cir"), kRc);
    scale(dir, "rc.cir", "rc_s.cir", "10", "100");
    RunResult swept = run_binary({"verify", "rc.cir", "rc_s.cir", "--sweep", "lin", "7", "100", "700"}, dir.path());
    EXPECT_EQ(swept.exit_code, 0) << swept.out << swept.err;
    EXPECT_NE(swept.out.find("  AC sweep: 7 points, 100 Hz .. 700 Hz of the original, 3 vectors\n"),
              std::string::npos)
        << swept.out;
    RunResult bad_sweep = run_binary({"verify", "rc.cir", "rc_s.cir", "--sweep", "log", "7", "100", "700"}, dir.path());
    EXPECT_EQ(bad_sweep.exit_code, 2);
    EXPECT_EQ(bad_sweep.err, "deckscale: error: --sweep: unknown sweep type 'log'\n");
}

TEST(VerifyCommand, TransientPairWithinATenthOfAPercent) {
    TempDir dir;
    write_bytes(dir.file("pulse.cir"),
                "pulsed rc\nV1 in 0 dc 0 pulse(0 1 1u 10n 10n 20u 50u)\nR1 in out 1k\nC1 out 0 2n\n"
                ".tran 50n 60u\n.end\n");
    scale(dir, "pulse.cir", "pulse_s.cir", "20", "1000");
    RunResult r = run_binary({"verify", "pulse.cir", "pulse_s.cir", "--json", "r.json"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    auto j = nlohmann::json::parse(read_bytes(dir.file("r.json")));
    ASSERT_EQ(j["analyses"].size(), 1u);
    EXPECT_EQ(j["analyses"][0]["analysis"], "tran");
    for (const auto& v : j["analyses"][0]["vectors"]) {
        SCOPED_TRACE(v["name"].get<std::string>());
        EXPECT_LE(v["worst"].get<double>(), 1e-3);
        EXPECT_GT(v["peak"].get<double>(), 0);
    }
    // The same pair with the capacitor 1 % off fails the transient comparison.
    std::string text = read_bytes(dir.file("pulse_s.cir"));
    ASSERT_NE(text.find("100f"), std::string::npos) << text;
    text.replace(text.find("100f"), 4, "101f");
    write_bytes(dir.file("pulse_w.cir"), text);
    RunResult w = run_binary({"verify", "pulse.cir", "pulse_w.cir", "--km", "20", "--kf", "1000"}, dir.path());
    EXPECT_EQ(w.exit_code, 1) << w.out;
}

TEST(VerifyCommand, AnalysisFromTheControlBlockWhenNoCardAsks) {
    TempDir dir;
    write_bytes(dir.file("c.cir"), "rc in control\nV1 in 0 dc 0 ac 1\nR1 in out 1k\nC1 out 0 1u\n"
                                   ".control\nac dec 20 1 1meg\nmeas ac f3 when vdb(out)=-3\n.endc\n.end\n");
    scale(dir, "c.cir", "c_s.cir", "10", "1000");
    EXPECT_NE(read_bytes(dir.file("c_s.cir")).find("ac dec 20 1000 1g\n"), std::string::npos);
    RunResult r = run_binary({"verify", "c.cir", "c_s.cir", "--json", "r.json"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    auto j = nlohmann::json::parse(read_bytes(dir.file("r.json")));
    ASSERT_EQ(j["analyses"].size(), 2u);
    EXPECT_EQ(j["analyses"][0]["analysis"], "ac");
    EXPECT_EQ(j["analyses"][0]["points"], 121);
    // The block's meas command, measured in both runs: the corner x Kf.
    EXPECT_EQ(j["analyses"][1]["analysis"], "meas");
    EXPECT_EQ(j["analyses"][1]["part"], "ac");
    ASSERT_EQ(j["analyses"][1]["vectors"].size(), 1u);
    const auto& f3 = j["analyses"][1]["vectors"][0];
    EXPECT_EQ(f3["name"], "f3");
    EXPECT_NEAR(f3["scaled_value"].get<double>() / f3["original_value"].get<double>(), 1000, 1e-6);
}

TEST(VerifyCommand, PlotWritesSvgDataAndScript) {
    TempDir dir;
    write_bytes(dir.file("rc.cir"), kRc);
    scale(dir, "rc.cir", "rc_s.cir", "10", "100");
    // The plot directory does not exist yet: refused before anything is simulated (exit 2).
    RunResult r = run_binary({"verify", "rc.cir", "rc_s.cir", "--plot", "plots/bode.svg"}, dir.path());
    EXPECT_EQ(r.exit_code, 2);
    EXPECT_EQ(r.out, "");
    EXPECT_EQ(r.err, "deckscale: error: cannot write 'plots/bode.svg': the folder '" + dir.file("plots") +
                         "' does not exist\n");
    fs::create_directories(dir.path() / "plots");
    r = run_binary({"verify", "rc.cir", "rc_s.cir", "--plot", "plots/bode.svg"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    EXPECT_NE(r.out.find("plot written to plots/bode.svg\n"), std::string::npos);
    std::string svg = read_bytes(dir.path() / "plots/bode.svg");
    ASSERT_FALSE(svg.empty());
    EXPECT_NE(svg.find("<svg"), std::string::npos);
    EXPECT_NE(svg.find("</svg>"), std::string::npos);
    EXPECT_EQ(svg.rfind("<?xml", 0), 0u);
    std::string dat = read_bytes(dir.path() / "plots/bode.dat");
    EXPECT_EQ(std::count(dat.begin(), dat.end(), '\n'), 2 + 31);  // two comment lines, 31 points
    EXPECT_NE(read_bytes(dir.path() / "plots/bode.gp").find("'bode.dat'"), std::string::npos);
    EXPECT_FALSE(fs::exists(dir.path() / "plots/.bode.svg.part"));
}

// Matthaei, Young & Jones 1964, sec. 4.05 (g_k = 2 sin((2k-1) pi / 2n)) and the shared
// reference values, sec. 5: the 5th-order maximally flat ladder denormalised to 50 ohm and
// 10 MHz is 3.0103 dB down from its passband (-6.0206 dB of the source EMF, as the
// terminations halve it) at 10 MHz.
TEST(VerifyCommand, DenormalisedButterworthCornerLandsAtTenMegahertz) {
    TempDir dir;
    scale(dir, demo_ladder(), "bw.cir", "50", "2*pi*10meg");
    RunResult r = run_binary({"verify", demo_ladder(), "bw.cir", "--json", "r.json"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    auto j = nlohmann::json::parse(read_bytes(dir.file("r.json")));
    EXPECT_EQ(j["passed"], true);
    EXPECT_NEAR(j["kf"].get<double>(), 2 * M_PI * 1e7, 2 * M_PI * 1e7 * 1e-6);

    DiskFileSystem disk;
    SimJob job;
    job.label = "bw.cir";
    job.cards = simulation_cards(load_deck(dir.file("bw.cir"), disk), {".ac lin 1 10meg 10meg", "", 1});
    job.work_dir = dir.path().string();
    SimOutcome out = simulate(job);
    ASSERT_EQ(out.status, SimStatus::ok) << out.message;
    ASSERT_EQ(out.plots.size(), 1u);
    const SimVector* v = out.plots[0].find("n3");
    ASSERT_NE(v, nullptr);
    ASSERT_EQ(v->values.size(), 1u);
    double attenuation_db = -20 * std::log10(2 * std::abs(v->values[0]));
    EXPECT_NEAR(attenuation_db, 10 * std::log10(2.0), 0.01);
}

// ngspice 39 runs ~/.spiceinit at start-up, the home folder taken from the password database
// (see sim/process.cpp). A hostile one there must change nothing: the simulator starts in a
// private folder with an empty start-up file of its own.
TEST(VerifyCommand, AStartUpFileInTheHomeFolderIsNotRun) {
    const passwd* pw = ::getpwuid(::getuid());
    ASSERT_NE(pw, nullptr);
    fs::path init = fs::path(pw->pw_dir) / ".spiceinit";
    struct Restore {  // the user's own file, if any, is put back whatever happens
        fs::path path;
        std::optional<std::string> saved;
        ~Restore() {
            std::error_code ec;
            if (saved) write_bytes(path, *saved);
            else fs::remove(path, ec);
        }
    } restore{init, fs::exists(init) ? std::optional(read_bytes(init)) : std::nullopt};
    TempDir dir;
    std::string marker = dir.file("marker");
    write_bytes(init, "shell touch " + marker + "\nset ngbehavior=lt\nalter r1 = 1\n");
    write_bytes(dir.file("o.cir"), kRc);
    RunResult r = run_binary({"verify", "o.cir", "o.cir"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    EXPECT_FALSE(fs::exists(marker));
}

// A simulation over its memory limit (RLIMIT_AS; not applied in sanitized builds, whose
// shadow memory takes terabytes of address space) ends as exit 3 with a hint.
TEST(VerifyCommand, AMemoryLimitEndsInExitThreeWithAHint) {
    TempDir dir;
    write_bytes(dir.file("d.cir"),
                "tiny memory\nV1 in 0 dc 0 ac 1\nR1 in out 1k\nC1 out 0 1u\n.ac dec 5 10 1k\n.end\n");
    RunResult r = run_binary({"verify", "d.cir", "d.cir", "--km", "1", "--kf", "1",
                              "--sim-memory", "1"},
                             dir.path());
    EXPECT_EQ(r.exit_code, 3) << r.out << r.err;
    EXPECT_NE(r.err.find("(each simulation may use 1 MB of memory; --sim-memory MB changes"),
              std::string::npos)
        << r.err;
}

}  // namespace
}  // namespace deckscale
