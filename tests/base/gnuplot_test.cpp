// Running gnuplot: its warnings stay off the user's terminal, and a failure names gnuplot's
// own message.
#include "base/gnuplot.hpp"

#include <gtest/gtest.h>

#include <filesystem>
#include <string>

#include "support/common.hpp"

namespace deckscale {
namespace {

TEST(Gnuplot, QuotesByDoublingTheQuote) {
    EXPECT_EQ(gnuplot_quote("it's"), "'it''s'");
    EXPECT_EQ(gnuplot_quote(""), "''");
}

TEST(Gnuplot, AWarningDoesNotReachTheTerminal) {
    test::TempDir dir;
    // A constant trace on a log axis: gnuplot warns that the autoscaled y range is empty,
    // and still draws the plot.
    test::write_bytes(dir.file("flat.gp"),
                      "set terminal svg\nset output 'flat.svg'\nset logscale y\n"
                      "plot '-' using 1:2 with lines\n1 1e-18\n2 1e-18\ne\n");
    testing::internal::CaptureStderr();
    std::string error = run_gnuplot("flat.gp", dir.path().string());
    std::string printed = testing::internal::GetCapturedStderr();
    EXPECT_EQ(error, "");
    EXPECT_EQ(printed, "");
    EXPECT_TRUE(std::filesystem::exists(dir.file("flat.svg")));
}

TEST(Gnuplot, AFailureEndsInGnuplotsMessage) {
    test::TempDir dir;
    test::write_bytes(dir.file("bad.gp"), "set terminal svg\nset output 'bad.svg'\nplot nofunction(x)\n");
    testing::internal::CaptureStderr();
    std::string error = run_gnuplot("bad.gp", dir.path().string());
    std::string printed = testing::internal::GetCapturedStderr();
    EXPECT_EQ(printed, "");
    EXPECT_EQ(error.rfind("gnuplot failed on bad.gp: ", 0), 0u) << error;
    EXPECT_NE(error.find("undefined function"), std::string::npos) << error;
}

}  // namespace
}  // namespace deckscale
