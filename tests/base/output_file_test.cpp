// Atomic output files: the content arrives whole, a replaced file keeps its permissions, and
// a failure leaves neither a partial file nor a temporary one behind.
#include "base/output_file.hpp"

#include <gtest/gtest.h>

#include <sys/stat.h>

#include <filesystem>
#include <stdexcept>
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

std::size_t entries(const std::filesystem::path& dir) {
    return static_cast<std::size_t>(std::distance(std::filesystem::directory_iterator(dir), {}));
}

TEST(OutputFile, ABatchChangesNoTargetUntilItCommits) {
    test::TempDir dir;
    test::write_bytes(dir.file("a.cir"), "old a\n");
    {
        OutputBatch batch;
        EXPECT_EQ(batch.add(dir.file("a.cir"), "new a\n"), "");
        EXPECT_EQ(batch.add(dir.file("b.inc"), "new b\n"), "");
        EXPECT_EQ(test::read_bytes(dir.file("a.cir")), "old a\n");
        EXPECT_FALSE(std::filesystem::exists(dir.file("b.inc")));
        EXPECT_EQ(batch.commit(), "");
    }
    EXPECT_EQ(test::read_bytes(dir.file("a.cir")), "new a\n");
    EXPECT_EQ(test::read_bytes(dir.file("b.inc")), "new b\n");
    EXPECT_EQ(entries(dir.path()), 2u);
}

TEST(OutputFile, AnUncommittedBatchLeavesTheOldFilesAndNoTemporaryOne) {
    test::TempDir dir;
    test::write_bytes(dir.file("a.cir"), "old a\n");
    {
        OutputBatch batch;
        EXPECT_EQ(batch.add(dir.file("a.cir"), "new a\n"), "");
        // The second file fails (its folder is missing): the run stops without committing.
        EXPECT_NE(batch.add(dir.file("gone/b.inc"), "new b\n"), "");
    }
    EXPECT_EQ(test::read_bytes(dir.file("a.cir")), "old a\n");
    EXPECT_EQ(entries(dir.path()), 1u);
}

TEST(OutputFile, AnExceptionWhileProducingLeavesNoTemporaryFile) {
    test::TempDir dir;
    OutputBatch batch;
    auto failing = [](ByteSink& sink) {
        sink.write(std::string(3 << 20, 'x'));
        throw std::runtime_error("produce failed");
    };
    EXPECT_THROW(batch.add(dir.file("a.cir"), failing), std::runtime_error);
    EXPECT_EQ(entries(dir.path()), 0u);
    EXPECT_EQ(batch.commit(), "");
    EXPECT_EQ(entries(dir.path()), 0u);
}

TEST(OutputFile, UnfinishedOutputsCanBeRemovedFromASignalHandler) {
    test::TempDir dir;
    OutputBatch batch;
    EXPECT_EQ(batch.add(dir.file("a.cir"), "done\n"), "");
    auto interrupted = [&](ByteSink& sink) {
        sink.write("half a de");
        sink.flush();
        EXPECT_EQ(entries(dir.path()), 2u);  // both temporary files exist now
        remove_unfinished_outputs();         // what the SIGINT handler calls
        EXPECT_EQ(entries(dir.path()), 0u);
    };
    batch.add(dir.file("b.cir"), interrupted);
}

}  // namespace
}  // namespace deckscale
