// Rewriting d_source's time column (write/time_column.hpp). How d_source reads its file is
// ngspice 39's src/xspice/icm/digital/d_source/cfunc.mod (cm_read_source, CNVgettok,
// cnv_get_spice_value); the hand-scaled pattern of the shared notes (codemodel-checks/
// dsrc_data_s.txt, every time / 1000) is the first case.
#include "write/time_column.hpp"

#include <gtest/gtest.h>

#include <string>

namespace deckscale {
namespace {

std::string scaled(const std::string& text, double factor, int digits = 9) {
    std::string why;
    auto out = scale_time_column(text, factor, digits, why);
    EXPECT_TRUE(out.has_value()) << why;
    return out.value_or("");
}

std::string refusal(const std::string& text) {
    std::string why;
    EXPECT_FALSE(scale_time_column(text, 1e-3, 9, why).has_value());
    return why;
}

TEST(TimeColumn, EveryDataLineTimeIsScaledAndEveryOtherByteKept) {
    EXPECT_EQ(scaled("* pattern\n* time s1 s2\n0         0s 1s\n1.5e-4    1s 1s\n\n"
                     "   \n4.0e-4    0s 1s\r\n1.6e-3    1s 1s",
                     1e-3),
              "* pattern\n* time s1 s2\n0         0s 1s\n1.5e-07    1s 1s\n\n"
              "   \n4e-07    0s 1s\r\n1.6e-06    1s 1s");
    // Separators d_source accepts before and after the time; a line of only '*' and blanks.
    EXPECT_EQ(scaled("(2, 1s)\n\t3=0s\n ** \n", 0.5), "(1, 1s)\n\t1.5=0s\n ** \n");
}

TEST(TimeColumn, SuffixesAreReadAsCnvGetSpiceValueReadsThem) {
    // t g k u n p f, m (milli), meg, mil; any other letter scales by 1; letters after the
    // first are ignored; e/E belong to the number.
    EXPECT_EQ(scaled("1u 1s\n2.5us 0s\n4mil 1s\n5ms 0s\n6x 1s\n3meg 0s\n7e3k 1s\n", 1),
              "1e-06 1s\n2.5e-06 0s\n0.0001016 1s\n0.005 0s\n6 1s\n3000000 0s\n7000000 1s\n");
    EXPECT_EQ(scaled("1f 1s\n1p 0s\n1n 1s\n1k 0s\n1g 1s\n1t 0s\n", 10),
              "1e-14 1s\n1e-11 0s\n1e-08 1s\n10000 0s\n1e+10 1s\n1e+13 0s\n");
}

TEST(TimeColumn, MoreDigitsWhereFewWouldMakeTwoTimesEqual) {
    EXPECT_EQ(scaled("1.0001 1s\n1.0002 0s\n", 1, 3), "1.0001 1s\n1.0002 0s\n");
    EXPECT_EQ(scaled("1.5 1s\n2.5 0s\n", 1, 3), "1.5 1s\n2.5 0s\n");
}

TEST(TimeColumn, WhatDSourceWouldNotReadIsRefusedWithItsLine) {
    EXPECT_EQ(refusal("* t\n0 1s\nx 0s\n"), "line 3: 'x' is not a time");
    EXPECT_EQ(refusal("0 1s\n2u 0s\n1u 1s\n"),
              "line 3: the times do not increase (d_source refuses the file)");
    EXPECT_EQ(refusal("0 1s\n1 " + std::string(200, 's') + "\n"),
              "line 2 is longer than the 199 bytes d_source reads as one line");
    // A line that only a longer time would push past the buffer.
    std::string why;
    std::string line = "1 " + std::string(195, 's') + "\n";
    ASSERT_EQ(line.size(), 198u);
    EXPECT_FALSE(scale_time_column(line, 1.0 / 3, 9, why).has_value());
    EXPECT_EQ(why, "line 1 would be longer than the 199 bytes d_source reads as one line");
}

}  // namespace
}  // namespace deckscale
