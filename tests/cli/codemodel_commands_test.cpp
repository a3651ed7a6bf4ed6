// End-to-end tests of the commands on decks with XSPICE code models: a scaled code-model
// filter verifies PASS (ngspice loads its code models for both decks), a misspelled
// parameter name exits 2 with its location, and a refused code model exits 4.
#include <gtest/gtest.h>

#include "support/common.hpp"

namespace deckscale {
namespace {

using test::read_bytes;
using test::run_binary;
using test::TempDir;
using test::write_bytes;

TEST(CodeModelCommands, ScaledCodeModelFilterVerifiesPass) {
    TempDir dir;
    std::string deck = read_bytes(test::source_dir() + "/netlists/codemodels/sxfer_norm.cir");
    deck.insert(deck.rfind(".end"), ".ac dec 20 10 100k\n.tran 1u 5m 0 1u\n");
    write_bytes(dir.file("f.cir"), deck);
    auto r = run_binary({"scale", "f.cir", "--km", "7", "--kf", "1k", "-o", "fs.cir", "--verify"},
                        dir.path());
    EXPECT_EQ(r.exit_code, 0) << r.out << r.err;
    EXPECT_NE(r.out.find("PASS"), std::string::npos) << r.out;
    EXPECT_NE(read_bytes(dir.file("fs.cir")).find("denormalized_freq=6283185.31)"),
              std::string::npos);
    // A deliberately wrong scaled deck fails (denormalized_freq put back).
    std::string wrong = read_bytes(dir.file("fs.cir"));
    wrong.replace(wrong.find("denormalized_freq=6283185.31)"), 29, "denormalized_freq=6283.185307");
    write_bytes(dir.file("wrong.cir"), wrong);
    auto w = run_binary({"verify", "f.cir", "wrong.cir", "--km", "7", "--kf", "1k"}, dir.path());
    EXPECT_EQ(w.exit_code, 1) << w.out << w.err;
}

TEST(CodeModelCommands, MisspelledParameterExitsTwoWithItsLocation) {
    TempDir dir;
    write_bytes(dir.file("d.cir"),
                "t\na1 in out lp\n.model lp s_xfer(num_coeff=[1] den_coeff=[1 1]"
                " int_ic=[0] denormalised_freq=6283)\nR1 out 0 1k\n.end\n");
    auto r = run_binary({"scale", "d.cir", "--km", "1", "--kf", "1k", "-o", "out.cir"}, dir.path());
    EXPECT_EQ(r.exit_code, 2);
    EXPECT_EQ(
        r.err,
        "d.cir:3:59: error: code model 's_xfer' has no parameter 'denormalised_freq' (ngspice "
        "39 would ignore it without a word)\n"
        "  .model lp s_xfer(num_coeff=[1] den_coeff=[1 1] int_ic=[0] "
        "denormalised_freq=6283)\n"
        "                                                            ^~~~~~~~~~~~~~~~~\n");
}

TEST(CodeModelCommands, RefusedCodeModelExitsFourWithItsReason) {
    TempDir dir;
    write_bytes(dir.file("d.cir"),
                "t\nI1 0 in 1m\na1 %i(in) %v(out) sl\n.model sl slew\n"
                "R1 out 0 1k\n.end\n");
    auto r = run_binary({"scale", "d.cir", "--km", "10", "--kf", "1", "-o", "out.cir"}, dir.path());
    EXPECT_EQ(r.exit_code, 4) << r.err;
    EXPECT_NE(r.err.find("d.cir:3:1: error: slew's output follows its input 1:1"),
              std::string::npos)
        << r.err;
}

}  // namespace
}  // namespace deckscale
