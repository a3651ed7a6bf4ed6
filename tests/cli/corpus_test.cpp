// The deck corpus (netlists/corpus/): decks written in many authors' styles, each of which
// ngspice 39 reads. Its manifest EXPECT.tsv says what the tool must do with every deck:
// scale it and verify the pair in embedded ngspice (`verifies`), or refuse it with a reason
// (`refused`, exit 4 or 2, the diagnostic containing the manifest's text). The test fails as
// soon as one deck's outcome changes, so the manifest is updated together with the code.
#include <fmt/format.h>
#include <gtest/gtest.h>

#include <cmath>
#include <cstdlib>
#include <future>
#include <map>
#include <regex>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "cli/exit_codes.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;
using test::read_bytes;
using test::run_binary;
using test::RunResult;
using test::TempDir;

fs::path corpus_dir() { return fs::path(test::source_dir()) / "netlists" / "corpus"; }

struct Row {
    int line = 0;  // line in EXPECT.tsv
    std::string deck, km, kf, outcome, group, diagnostic;
};

std::vector<Row> manifest() {
    std::istringstream in(read_bytes(corpus_dir() / "EXPECT.tsv"));
    std::vector<Row> rows;
    std::string text;
    int n = 0;
    while (std::getline(in, text)) {
        ++n;
        if (text.empty() || text[0] == '#') continue;
        std::vector<std::string> cols;
        std::size_t start = 0;
        for (std::size_t tab; (tab = text.find('\t', start)) != std::string::npos; start = tab + 1)
            cols.push_back(text.substr(start, tab - start));
        cols.push_back(text.substr(start));
        if (cols.size() != 6) {
            ADD_FAILURE() << "EXPECT.tsv:" << n << ": expected 6 tab-separated columns";
            continue;
        }
        rows.push_back({n, cols[0], cols[1], cols[2], cols[3], cols[4], cols[5]});
    }
    return rows;
}

// The top-level decks of the corpus: files directly in the folder, except the manifest and
// notes (included files live in subfolders).
std::set<std::string> corpus_decks() {
    std::set<std::string> out;
    for (const auto& e : fs::directory_iterator(corpus_dir()))
        if (e.is_regular_file() && e.path().extension() != ".tsv" && e.path().extension() != ".md")
            out.insert(e.path().filename().string());
    return out;
}

struct Outcome {
    RunResult scaled, verified, inferred, by_one;
    bool by_one_same = false;
    bool wrote_output = false;
};

Outcome run_row(const Row& r) {
    Outcome o;
    TempDir dir;
    std::string deck = (corpus_dir() / r.deck).string();
    o.scaled = run_binary({"scale", deck, "--km", r.km, "--kf", r.kf, "-o", dir.file("scaled.cir")},
                          corpus_dir());
    o.wrote_output = fs::exists(dir.file("scaled.cir"));
    if (r.outcome != "verifies" || o.scaled.exit_code != exit_ok) return o;
    // Transients to 1e-6 of each peak, like AC (the default allows 1e-3), unless the row's
    // group column says "tran-tolerance=X" (event-driven decks: see EXPECT.tsv).
    std::string tran = "1e-6";
    if (r.group.rfind("tran-tolerance=", 0) == 0) tran = r.group.substr(15);
    o.verified = run_binary({"verify", deck, dir.file("scaled.cir"), "--km", r.km, "--kf", r.kf,
                             "--tran-tolerance", tran},
                            corpus_dir());
    // Without factors they are read off the two decks (issue 10 section 5).
    o.inferred = run_binary({"verify", deck, dir.file("scaled.cir"), "--tran-tolerance", tran},
                            corpus_dir());
    // Factors of 1 give the deck back byte for byte (written beside it: include paths stay).
    o.by_one = run_binary({"scale", deck, "--km", "1", "--kf", "1"}, corpus_dir());
    o.by_one_same = o.by_one.out == read_bytes(deck);
    return o;
}

TEST(Corpus, EveryDeckScalesAndVerifiesOrIsRefusedAsTheManifestSays) {
    auto rows = manifest();
    std::set<std::string> listed;
    for (const auto& r : rows) {
        EXPECT_TRUE(listed.insert(r.deck).second)
            << "EXPECT.tsv:" << r.line << ": " << r.deck << " twice";
        EXPECT_TRUE(r.outcome == "verifies" || r.outcome == "refused")
            << "EXPECT.tsv:" << r.line << ": outcome '" << r.outcome << "'";
    }
    EXPECT_EQ(listed, corpus_decks()) << "every deck of netlists/corpus is in EXPECT.tsv and back";
    EXPECT_GE(rows.size(), 30u);

    // Two rows at a time (each verify runs two ngspice children of its own).
    std::vector<Outcome> outcomes(rows.size());
    for (std::size_t i = 0; i < rows.size(); i += 2) {
        auto second = i + 1 < rows.size()
                          ? std::async(std::launch::async, run_row, std::cref(rows[i + 1]))
                          : std::future<Outcome>();
        outcomes[i] = run_row(rows[i]);
        if (second.valid()) outcomes[i + 1] = second.get();
    }

    std::map<std::string, int> groups;
    int verified = 0;
    for (std::size_t i = 0; i < rows.size(); ++i) {
        const Row& r = rows[i];
        const Outcome& o = outcomes[i];
        SCOPED_TRACE(testing::Message() << "EXPECT.tsv:" << r.line << ": " << r.deck);
        if (r.outcome == "verifies") {
            ASSERT_EQ(o.scaled.exit_code, exit_ok) << o.scaled.err;
            EXPECT_EQ(o.verified.exit_code, exit_ok) << o.verified.out << o.verified.err;
            EXPECT_NE(o.verified.out.find("\nPASS: "), std::string::npos) << o.verified.out;
            EXPECT_EQ(o.inferred.exit_code, exit_ok) << o.inferred.out << o.inferred.err;
            EXPECT_EQ(o.by_one.exit_code, exit_ok) << o.by_one.err;
            EXPECT_TRUE(o.by_one_same) << "factors of 1 changed the deck";
            verified += o.verified.exit_code == exit_ok;
        } else {
            EXPECT_TRUE(o.scaled.exit_code == exit_refused || o.scaled.exit_code == exit_bad_input)
                << "exit " << o.scaled.exit_code << "\n"
                << o.scaled.err;
            EXPECT_NE(o.scaled.err.find(r.diagnostic), std::string::npos)
                << "expected '" << r.diagnostic << "' in:\n"
                << o.scaled.err;
            EXPECT_FALSE(o.wrote_output) << "a refused deck was written";
            ++groups[r.group];
        }
    }
    // The summary README.md quotes.
    std::string summary =
        fmt::format("corpus: {} decks, {} scale and verify", rows.size(), verified);
    for (const auto& [group, n] : groups) summary += fmt::format("; refused ({}): {}", group, n);
    std::cout << summary << "\n";
    RecordProperty("summary", summary);
}

// Issue 10 §5: verify without factors reads them off values written as expressions
// ({…}, '…', bare .param names), evaluated with each deck's parameters.
TEST(Corpus, VerifyInfersFactorsFromExpressionValues) {
    struct Case {
        int line;
        std::string deck, km, kf, expect;
    };
    const Case cases[] = {
        {__LINE__, "sallen_key_params.cir", "50", "1k", "Km = 50, Kf = 1000"},
        {__LINE__, "func_and_quotes.cir", "2k", "10", "Km = 2000, Kf = 10"},
        // No capacitor or inductor: Kf from the decks' own analyses.
        {__LINE__, "sources_all_functions.cir", "50", "1k", "Km = 50, Kf = 1000"},
        {__LINE__, "vol_and_current_switch.cir", "50", "1k", "Km = 50, Kf = 1000"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "corpus_test.cpp:" << c.line << ": " << c.deck);
        TempDir dir;
        std::string deck = (corpus_dir() / c.deck).string();
        RunResult s = run_binary(
            {"scale", deck, "--km", c.km, "--kf", c.kf, "-o", dir.file("s.cir")}, corpus_dir());
        ASSERT_EQ(s.exit_code, exit_ok) << s.err;
        RunResult v = run_binary({"verify", deck, dir.file("s.cir")}, corpus_dir());
        EXPECT_EQ(v.exit_code, exit_ok) << v.out << v.err;
        EXPECT_NE(v.out.find(c.expect), std::string::npos) << v.out;
        EXPECT_NE(v.out.find("(inferred from"), std::string::npos) << v.out;
    }
}

// The measurement of a deck with a bare parameter in `.meas` (issue 10 §4), run by the
// ngspice program itself on the original and on the rewritten deck: the threshold time
// maps to t/Kf and the voltage found at the mapped time is the same (scaling law: times
// divide by Kf, voltages stay; shared notes "scaling-rules.md" §0).
double measured(const std::string& log, const std::string& name) {
    std::smatch m;
    if (!std::regex_search(log, m, std::regex("\\n" + name + "\\s*=\\s*([-+0-9.eE]+)"))) {
        ADD_FAILURE() << "no measurement " << name << " in:\n" << log;
        return std::nan("");
    }
    return std::stod(m[1]);
}

TEST(Corpus, NgspiceMeasuresTheSameOnTheRewrittenDeck) {
    TempDir dir;
    std::string deck = (corpus_dir() / "meas_threshold_param.cir").string();
    RunResult s = run_binary({"scale", deck, "--km", "10", "--kf", "1k", "-o", dir.file("s.cir")},
                             corpus_dir());
    ASSERT_EQ(s.exit_code, exit_ok) << s.err;
    auto ngspice = [&](const std::string& path, const std::string& log) {
        // test::ngspice_batch() (-n): no start-up file, so that the test that puts a hostile
        // ~/.spiceinit in place while others run cannot be triggered from here.
        std::string cmd = "cd " + test::shell_quote(dir.path().string()) + " && " +
                          test::ngspice_batch() +
                          test::shell_quote(path) + " >" + test::shell_quote(log) + " 2>&1";
        EXPECT_EQ(std::system(cmd.c_str()), 0) << read_bytes(log);
        return read_bytes(log);
    };
    std::string a = ngspice(deck, dir.file("a.log"));
    std::string b = ngspice(dir.file("s.cir"), dir.file("b.log"));
    double t = measured(a, "t_half"), t_scaled = measured(b, "t_half");
    EXPECT_NEAR(t_scaled, t / 1000, 1e-3 * t / 1000);
    // v(out) = 1 - exp(-t/RC), RC = 1 ms: half at ln 2 ms (common practice).
    EXPECT_NEAR(t, std::log(2.0) * 1e-3, 2e-5);
    EXPECT_NEAR(measured(b, "v_late"), measured(a, "v_late"), 1e-4);
}

}  // namespace
}  // namespace deckscale
