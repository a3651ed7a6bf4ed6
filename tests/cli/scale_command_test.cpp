// End-to-end tests of `deckscale scale` (the real binary) and whole-deck properties of the
// scaling pass: exit codes, refusals, included files, flattening, identity and round trips.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <filesystem>

#include "support/common.hpp"
#include "support/scale.hpp"

namespace deckscale {
namespace {

using test::read_bytes;
using test::run_binary;
using test::TempDir;
using test::write_bytes;

TEST(ScaleCommandTest, RefusesUnscalableItemsWithOneDiagnosticEach) {
    TempDir dir;
    write_bytes(dir.file("d.cir"), "t\nR1 a 0 1k\nY1 a 0 c 0 tm\nA1 a b amp\nV2 b 0 EXTERNAL\n"
                                   ".control\nlet x = a + 5\n.endc\n.end\n");
    auto r = run_binary({"scale", "d.cir", "--km", "10", "--kf", "1", "-o", "out.cir"}, dir.path());
    EXPECT_EQ(r.exit_code, 4) << r.err;
    for (const char* at : {"d.cir:3:1: error:", "d.cir:4:1: error:", "d.cir:5:8: error:", "d.cir:7:13: error:"})
        EXPECT_NE(r.err.find(at), std::string::npos) << at << "\n" << r.err;
    EXPECT_FALSE(std::filesystem::exists(dir.file("out.cir")));
    auto w = run_binary({"scale", "d.cir", "--km", "10", "--kf", "1", "-o", "out.cir",
                         "--leave-unscalable"}, dir.path());
    EXPECT_EQ(w.exit_code, 0) << w.err;
    std::string out = read_bytes(dir.file("out.cir"));
    EXPECT_NE(out.find("R1 a 0 10k\n* deckscale: left unscaled: ngspice 39 KSPICE"),
              std::string::npos)
        << out;
    EXPECT_NE(out.find("* deckscale: left unscaled: XSPICE"), std::string::npos) << out;
}

TEST(ScaleCommandTest, CautionsFollowWhatWasScaled) {
    // The cautions for whoever builds from the output: always the ratings line, the current
    // growth only for Km < 1, the semiconductor line only when a diode or transistor was
    // rewritten, and none at all for factors of one.
    TempDir dir;
    write_bytes(dir.file("rc.cir"),
                "t\nv1 a 0 ac 1\nr1 a b 1k\nc1 b 0 1n\n.ac dec 5 1k 1meg\n.end\n");
    write_bytes(dir.file("d.cir"), "t\nv1 a 0 ac 1\nr1 a b 1k\nd1 b 0 dm\n.model dm d(cjo=1p)\n"
                                   ".ac dec 5 1k 1meg\n.end\n");
    auto scale = [&](const char* deck, const char* km, const char* kf) {
        auto r = run_binary({"scale", deck, "--km", km, "--kf", kf, "-o", "out.cir"}, dir.path());
        EXPECT_EQ(r.exit_code, 0) << r.err;
        return r.err;
    };
    std::string rc = scale("rc.cir", "0.5", "1");
    EXPECT_NE(rc.find("check their power, voltage and current ratings"), std::string::npos) << rc;
    EXPECT_NE(rc.find("every current grows by 1/Km = 2"), std::string::npos) << rc;
    EXPECT_EQ(rc.find("Diodes and transistors"), std::string::npos) << rc;
    std::string d = scale("d.cir", "2", "1");
    EXPECT_EQ(d.find("every current grows"), std::string::npos) << d;
    EXPECT_NE(d.find("Diodes and transistors were scaled too"), std::string::npos) << d;
    EXPECT_NE(scale("d.cir", "1", "3").find("Diodes and transistors"), std::string::npos);
    EXPECT_EQ(scale("d.cir", "1", "1").find("caution"), std::string::npos);
}

// A deck with a changed include, an unchanged include and a .lib section, in sub-folders.
void write_project(const TempDir& dir) {
    write_bytes(dir.file("proj/lib/parts.inc"), "R9 a 0 2k\n");
    write_bytes(dir.file("proj/lib/same.inc"), "* only a comment\n.global gnd\n");
    write_bytes(dir.file("proj/lib/models.lib"), ".lib fast\nRf a 0 100\n.endl\n.lib slow\nRs a 0 200\n.endl\n");
    write_bytes(dir.file("proj/d.cir"), "include test\n.include lib/parts.inc\n.include \"lib/same.inc\"\n"
                                        ".lib lib/models.lib fast\nR1 a 0 1k\n.end\n");
}

TEST(ScaleCommandTest, ChangedIncludesAreCopiedBesideTheOutput) {
    TempDir dir;
    write_project(dir);
    std::filesystem::create_directories(dir.file("out"));
    auto r = run_binary({"scale", "proj/d.cir", "--km", "10", "--kf", "1", "-o", "out/d.cir"}, dir.path());
    ASSERT_EQ(r.exit_code, 0) << r.err;
    EXPECT_EQ(read_bytes(dir.file("out/d.cir")),
              "include test\n.include parts-scaled.inc\n.include \"../proj/lib/same.inc\"\n"
              ".lib models-scaled.lib fast\nR1 a 0 10k\n.end\n");
    EXPECT_EQ(read_bytes(dir.file("out/parts-scaled.inc")), "R9 a 0 20k\n");
    EXPECT_EQ(read_bytes(dir.file("out/models-scaled.lib")),
              ".lib fast\nRf a 0 1000\n.endl\n.lib slow\nRs a 0 2000\n.endl\n");
    // Originals are never modified.
    EXPECT_EQ(read_bytes(dir.file("proj/lib/parts.inc")), "R9 a 0 2k\n");
    EXPECT_EQ(read_bytes(dir.file("proj/d.cir")).find("1k\n") != std::string::npos, true);
}

TEST(ScaleCommandTest, FlattenWritesOneSelfContainedDeck) {
    TempDir dir;
    write_project(dir);
    auto r = run_binary({"scale", "proj/d.cir", "--km", "10", "--kf", "1", "-o", "flat.cir", "--flatten"},
                        dir.path());
    ASSERT_EQ(r.exit_code, 0) << r.err;
    std::string flat = read_bytes(dir.file("flat.cir"));
    EXPECT_EQ(flat.find(".include"), std::string::npos) << flat;
    EXPECT_EQ(flat.find("\n.lib"), std::string::npos) << flat;
    EXPECT_NE(flat.find("R9 a 0 20k\n"), std::string::npos) << flat;
    EXPECT_NE(flat.find("Rf a 0 1000\n"), std::string::npos) << flat;
    EXPECT_EQ(flat.find("Rs a 0"), std::string::npos) << "only the named section: " << flat;
    EXPECT_EQ(std::distance(std::filesystem::directory_iterator(dir.path()), {}), 2);  // proj, flat.cir
}

TEST(ScaleCommandTest, StandardOutputWithAChangedIncludeIsRefused) {
    TempDir dir;
    write_project(dir);
    auto r = run_binary({"scale", "proj/d.cir", "--km", "10", "--kf", "1"}, dir.path());
    EXPECT_EQ(r.exit_code, 2);
    EXPECT_EQ(r.out, "");
    EXPECT_NE(r.err.find("proj/d.cir:2:10: error: this included file needs rescaling too"),
              std::string::npos) << r.err;
}

TEST(ScaleCommandTest, StandardOutputKeepsEveryOtherByte) {
    TempDir dir;
    write_bytes(dir.file("d.cir"), "t\r\n* note 1k\r\nR1 a 0 1k ; tail\r\n+ tc1=0.1\r\n.end\r\n");
    auto r = run_binary({"scale", "d.cir", "--km", "2", "--kf", "1"}, dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.err;
    EXPECT_EQ(r.out, "t\r\n* note 1k\r\nR1 a 0 2k ; tail\r\n+ tc1=0.1\r\n.end\r\n");
}

// Km = Kf = 1 gives no edit on every deck of netlists/.
TEST(ScaleCommandTest, UnitFactorsLeaveEveryShippedDeckAlone) {
    for (const auto& p : test::netlist_files()) {
        if (!test::is_top_deck(p)) continue;
        SCOPED_TRACE(p.string());
        DiskFileSystem disk;
        Deck d = load_deck(p.string(), disk);
        ScaleSettings s;
        auto r = scale_deck(d, s);
        for (const auto& e : r.edits) EXPECT_TRUE(e.empty());
        EXPECT_TRUE(r.changes.empty());
    }
}

// Scaling by (a, b) then (1/a, 1/b) gives the original values back within 7 digits.
TEST(ScaleCommandTest, RoundTripRestoresValues) {
    const std::pair<double, double> factors[] = {{50, 2 * 3.14159265358979 * 1e7}, {0.003, 7}, {1e4, 1e-3}};
    for (const auto& p : test::netlist_files()) {
        if (!test::is_top_deck(p)) continue;
        std::string original = read_bytes(p);
        // In memory the top deck stands alone: decks with includes are covered by the
        // include tests above.
        if (original.find("\n.inc") != std::string::npos || original.find("\n.lib") != std::string::npos)
            continue;
        // Semiconductor decks gain an m= and a .options gmin line on the way there: their
        // round trip is checked in tests/scale/semiconductors_test.cpp (the decks for held
        // parts have transistors too).
        if (p.parent_path().filename() == "devices" || p.parent_path().filename() == "held")
            continue;
        for (const auto& [a, b] : factors) {
            SCOPED_TRACE(testing::Message() << p.filename() << " Km=" << a << " Kf=" << b);
            auto there = test::scale_text(original, a, b);
            auto back = test::scale_text(there.text(), 1 / a, 1 / b);
            std::size_t lines = std::count(original.begin(), original.end(), '\n');
            for (std::size_t n = 0; n < lines; ++n) {
                auto x = test::line_fields(original, n), y = test::line_fields(back.text(), n);
                if (!x.empty() && (x[0][0] == '*' || x[0][0] == 'B' || x[0][0] == 'b')) continue;
                if (x.size() != y.size()) {
                    // Only a wrapped parameter use may change the field layout of a line.
                    EXPECT_NE(test::line_fields(there.text(), n).size(), 0u);
                    bool wrapped = false;
                    for (const auto& f : y) wrapped = wrapped || f.find_first_of("{}'") != std::string::npos;
                    EXPECT_TRUE(wrapped) << "line " << n + 1;
                    continue;
                }
                for (std::size_t k = 0; k < x.size(); ++k) {
                    double u = test::number_value(x[k]), v = test::number_value(y[k]);
                    if (std::isnan(u)) continue;
                    EXPECT_TRUE(test::close_to(u, v, 1e-6))
                        << "line " << n + 1 << ": " << x[k] << " came back as " << y[k];
                }
            }
        }
    }
}

}  // namespace
}  // namespace deckscale

namespace deckscale {
namespace {

// -i replaces the user's own file: never through a symbolic link, never a read-only file.
TEST(ScaleCommandTest, InPlaceRefusesALinkAndAReadOnlyDeck) {
    test::TempDir dir;
    test::write_bytes(dir.file("d.cir"), "t\nR1 a 0 1k\n.end\n");
    std::filesystem::create_symlink("d.cir", dir.file("link.cir"));
    test::write_bytes(dir.file("ro.cir"), "t\nR1 a 0 1k\n.end\n");
    std::filesystem::permissions(dir.file("ro.cir"), std::filesystem::perms::owner_read |
                                                         std::filesystem::perms::group_read);
    struct {
        int line;
        std::string deck, err;
    } rows[] = {
        {__LINE__, "link.cir",
         "deckscale: error: 'link.cir' is a symbolic link; -i would replace the link with a file: "
         "run -i on the file it points to, or write with -o\n"},
        {__LINE__, "ro.cir",
         "deckscale: error: 'ro.cir' is read-only; -i does not replace a read-only deck: write "
         "with -o, or make it writable first\n"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "scale_command_test.cpp:" << row.line);
        auto r = test::run_binary({"scale", row.deck, "--km", "10", "--kf", "1", "-i"}, dir.path());
        EXPECT_EQ(r.exit_code, 2);
        EXPECT_EQ(r.err, row.err);
    }
    EXPECT_TRUE(std::filesystem::is_symlink(dir.file("link.cir")));
    EXPECT_EQ(test::read_bytes(dir.file("d.cir")), "t\nR1 a 0 1k\n.end\n");
    EXPECT_EQ(test::read_bytes(dir.file("ro.cir")), "t\nR1 a 0 1k\n.end\n");
    // A writable deck is replaced and keeps its permissions.
    std::filesystem::permissions(dir.file("d.cir"), std::filesystem::perms(0640));
    auto ok = test::run_binary({"scale", "d.cir", "--km", "10", "--kf", "1", "-i"}, dir.path());
    EXPECT_EQ(ok.exit_code, 0) << ok.err;
    EXPECT_EQ(test::read_bytes(dir.file("d.cir")), "t\nR1 a 0 10k\n.end\n");
    EXPECT_EQ(std::filesystem::status(dir.file("d.cir")).permissions(),
              std::filesystem::perms(0640));
}

}  // namespace
}  // namespace deckscale
