// Atomic output files: the content arrives whole, a replaced file keeps its permissions, and
// a failure leaves neither a partial file nor a temporary one behind.
#include "base/output_file.hpp"

#include <gtest/gtest.h>

#include <sys/stat.h>

#include <filesystem>
#include <string>

#include "support/common.hpp"

namespace deckscale {
namespace {

TEST(OutputFile, WritesWholeContentInBothDurabilities) {
    test::TempDir dir;
    std::string big(5 << 20, 'x');  // several output blocks
    big[12345] = 'y';
    for (Durability d : {Durability::atomic, Durability::synced}) {
        std::string path = dir.file(d == Durability::synced ? "s.cir" : "a.cir");
        EXPECT_EQ(write_file_atomically(path, big, d), "");
        EXPECT_TRUE(test::read_bytes(path) == big);
        auto two_pieces = [](ByteSink& s) {
            s.write("R1 a 0 ");
            s.write("2k\n");
        };
        EXPECT_EQ(write_file_atomically(path, two_pieces, d), "");
        EXPECT_EQ(test::read_bytes(path), "R1 a 0 2k\n");
    }
    // Only the two files: no temporary file is left.
    EXPECT_EQ(std::distance(std::filesystem::directory_iterator(dir.path()), {}), 2);
}

TEST(OutputFile, ReplacedFileKeepsItsPermissions) {
    test::TempDir dir;
    std::string path = dir.file("deck.cir");
    test::write_bytes(path, "old\n");
    ASSERT_EQ(::chmod(path.c_str(), 0640), 0);
    EXPECT_EQ(write_file_atomically(path, "new\n", Durability::synced), "");
    struct stat st {};
    ASSERT_EQ(::stat(path.c_str(), &st), 0);
    EXPECT_EQ(st.st_mode & 0777, 0640u);
    EXPECT_EQ(test::read_bytes(path), "new\n");
}

TEST(OutputFile, MissingFolderIsAnErrorAndWritesNothing) {
    test::TempDir dir;
    std::string e = write_file_atomically(dir.file("no/such/out.cir"), "x");
    EXPECT_NE(e.find("does not exist"), std::string::npos) << e;
    EXPECT_EQ(std::distance(std::filesystem::directory_iterator(dir.path()), {}), 0);
}

}  // namespace
}  // namespace deckscale
