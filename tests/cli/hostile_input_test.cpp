// Decks written to break a reader: each ends with a diagnostic and exit 2 (or is scaled, when
// it is valid after all), never with a signal, and never writes a half deck.
#include <gtest/gtest.h>

#include <filesystem>
#include <string>

#include "cli/exit_codes.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

struct Hostile {
    int line;
    std::string name;
    std::string deck;
    int exit_code;
    std::string err_has;  // a piece of the diagnostic ("" when it scales)
};

std::string repeated(const std::string& s, int n) {
    std::string out;
    out.reserve(s.size() * static_cast<std::size_t>(n));
    for (int i = 0; i < n; ++i) out += s;
    return out;
}

TEST(HostileInput, EachEndsWithAnExitCodeAndNoSignal) {
    const Hostile cases[] = {
        {__LINE__, "a 10 MB line", "t\nR1 a 0 1k " + std::string(10 << 20, 'x') + "\n.end\n",
         exit_refused, "...(10485760 bytes)..."},
        {__LINE__, "a million continuation lines",
         "t\nV1 a 0 PWL(0 0\n" + repeated("+ 1u 1\n", 1000000) + "+ )\nR1 a 0 1k\n.end\n", exit_ok,
         ""},
        {__LINE__, "10,000 nested .subckt",
         "t\n" + repeated(".subckt s a b\n", 10000) + "R1 a b 1k\n" + repeated(".ends\n", 10000) +
             ".end\n",
         exit_ok, ""},
        {__LINE__, "10,000 nested parentheses",
         "t\nR1 a 0 {" + std::string(10000, '(') + "1k" + std::string(10000, ')') + "}\n.end\n",
         exit_ok, ""},
        // Braces are read by recursion: nesting beyond 256 is refused before it can overflow
        // the stack (it did, under AddressSanitizer's larger frames).
        {__LINE__, "10,000 nested braces",
         "t\n.param p={" + std::string(10000, '{') + "1" + std::string(10000, '}') +
             "}\nR1 a 0 1k\n.end\n",
         exit_bad_input, "d.cir:2:266: error: braces nested more than 256 deep"},
        {__LINE__, "256 nested braces",
         "t\n.param p=" + std::string(256, '{') + "1" + std::string(256, '}') +
             "\nR1 a 0 {p}\n.end\n",
         exit_ok, ""},
        {__LINE__, "invalid UTF-8", "t\nR1 a 0 1k \xff\xfe\n.end\n", exit_refused,
         "is neither a value, a parameter nor a model"},
        {__LINE__, "a NUL byte", std::string("t\nR1 a 0 1k\n\0\n.end\n", 17), exit_bad_input,
         "binary data (a NUL byte)"},
        {__LINE__, "an overflowing number", "t\nR1 a 0 1e999\n.end\n", exit_bad_input,
         "outside the range of a double"},
    };
    for (const auto& c : cases) {
        SCOPED_TRACE(testing::Message() << "hostile_input_test.cpp:" << c.line << ": " << c.name);
        test::TempDir dir;
        test::write_bytes(dir.file("d.cir"), c.deck);
        auto r = test::run_binary({"scale", "d.cir", "--km", "2", "--kf", "3", "-o", "out.cir"},
                                  dir.path());
        EXPECT_EQ(r.exit_code, c.exit_code) << r.err.substr(0, 2000);
        if (!c.err_has.empty())
            EXPECT_NE(r.err.find(c.err_has), std::string::npos) << r.err.substr(0, 2000);
        EXPECT_EQ(fs::exists(dir.file("out.cir")), c.exit_code == exit_ok);
        EXPECT_LT(r.err.size(), 100000u);  // no diagnostic repeats a huge input
    }
}

// Includes are followed by recursion: a chain deeper than 200 (GCC's #include limit) is refused
// with its location; one of 200 is read (a chain of 1,000 overflowed the stack under
// AddressSanitizer).
TEST(HostileInput, AnIncludeChainAThousandDeepIsRefusedTwoHundredIsRead) {
    test::TempDir dir;
    fs::create_directory(dir.file("chain"));
    for (int i = 0; i < 1000; ++i)
        test::write_bytes(dir.file("chain/i" + std::to_string(i) + ".inc"),
                          i < 999 ? ".include i" + std::to_string(i + 1) + ".inc\n" : "R9 a 0 1k\n");
    test::write_bytes(dir.file("d.cir"), "t\n.include chain/i0.inc\n.end\n");
    auto r = test::run_binary({"scale", "d.cir", "--km", "2", "--kf", "3"}, dir.path());
    EXPECT_EQ(r.exit_code, exit_bad_input);
    EXPECT_NE(r.err.find("i199.inc:1:10: error: includes nested more than 200 deep"),
              std::string::npos)
        << r.err.substr(0, 2000);
}

TEST(HostileInput, AnIncludeChainTwoHundredDeep) {
    test::TempDir dir;
    fs::create_directory(dir.file("chain"));
    for (int i = 0; i < 200; ++i)
        test::write_bytes(dir.file("chain/i" + std::to_string(i) + ".inc"),
                          i < 199 ? ".include i" + std::to_string(i + 1) + ".inc\n" : "R9 a 0 1k\n");
    test::write_bytes(dir.file("d.cir"), "t\n.include chain/i0.inc\n.end\n");
    auto r = test::run_binary({"scale", "d.cir", "--km", "2", "--kf", "3", "--flatten", "-o",
                               "out.cir"},
                              dir.path());
    EXPECT_EQ(r.exit_code, exit_ok) << r.err.substr(0, 2000);
    EXPECT_NE(test::read_bytes(dir.file("out.cir")).find("R9 a 0 2k"), std::string::npos);
}

TEST(HostileInput, IncludesThatAreNoFiles) {
    test::TempDir dir;
    fs::create_directory(dir.file("sub"));
    struct {
        int line;
        std::string include, err;
    } rows[] = {
        {__LINE__, "sub", "cannot read included file 'sub': it is a directory"},
        {__LINE__, "/dev/zero",
         "cannot read included file '/dev/zero': it is a device or socket, not a file"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "hostile_input_test.cpp:" << row.line);
        test::write_bytes(dir.file("d.cir"), "t\n.include " + row.include + "\n.end\n");
        auto r = test::run_binary({"scale", "d.cir", "--km", "2", "--kf", "3"}, dir.path());
        EXPECT_EQ(r.exit_code, exit_bad_input);
        EXPECT_NE(r.err.find("d.cir:2:10: error: " + row.err), std::string::npos) << r.err;
    }
}

}  // namespace
}  // namespace deckscale
