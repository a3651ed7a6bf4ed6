// Tests of reading files from disk: what is refused (and why), what never blocks, and the
// size limit that keeps an endless stream from exhausting memory.
#include "base/file_system.hpp"

#include <gtest/gtest.h>

#include <sys/stat.h>
#include <unistd.h>

#include <fcntl.h>

#include <atomic>
#include <filesystem>
#include <chrono>
#include <string>
#include <thread>

#include "support/common.hpp"

namespace deckscale {
namespace {

TEST(DiskFileSystem, ReadsARegularFileWhole) {
    test::TempDir tmp;
    test::write_bytes(tmp.file("a.cir"), "t\r\nR1 a 0 1k\n");
    auto text = DiskFileSystem().read(tmp.file("a.cir"));
    ASSERT_TRUE(text.has_value());
    EXPECT_EQ(text->bytes, "t\r\nR1 a 0 1k\n");
}

TEST(DiskFileSystem, SaysWhyItCannotRead) {
    test::TempDir tmp;
    std::filesystem::create_directory(tmp.file("models"));
    struct {
        int line;
        std::string path;
        std::string problem;
    } rows[] = {
        {__LINE__, tmp.file("missing.cir"), "No such file or directory"},
        {__LINE__, tmp.file("models"), "it is a directory"},
        {__LINE__, "/dev/zero", "it is a device or socket, not a file"},  // endless
        {__LINE__, "/dev/null", "it is a device or socket, not a file"},
    };
    for (const auto& row : rows) {
        SCOPED_TRACE(testing::Message() << "row at line " << row.line);
        std::string problem;
        EXPECT_FALSE(DiskFileSystem().read(row.path, &problem).has_value());
        EXPECT_EQ(problem, row.problem);
    }
}

TEST(DiskFileSystem, AFifoWithNoWriterReadsAsEmptyInsteadOfWaiting) {
    test::TempDir tmp;
    ASSERT_EQ(::mkfifo(tmp.file("pipe").c_str(), 0600), 0);
    auto text = DiskFileSystem().read(tmp.file("pipe"));
    ASSERT_TRUE(text.has_value());
    EXPECT_EQ(text->bytes, "");
}

// The writer's end is opened read-write before the reader comes: the pipe then always has a
// writer (no early end of file) and a reader (no SIGPIPE), whatever the threads' timing.
int open_writer_end(const std::string& fifo) { return ::open(fifo.c_str(), O_RDWR | O_NONBLOCK); }

// Writes `text` (repeated while `*endless`) without blocking forever: stops when told.
void feed(int fd, const std::string& text, const std::atomic<bool>& endless,
          const std::atomic<bool>& stop) {
    do {
        for (std::size_t done = 0; done < text.size() && !stop;) {
            ssize_t n = ::write(fd, text.data() + done, text.size() - done);
            if (n > 0) done += static_cast<std::size_t>(n);
            else std::this_thread::sleep_for(std::chrono::microseconds(200));
        }
    } while (endless && !stop);
    ::close(fd);
}

TEST(DiskFileSystem, AFifoIsReadToItsEnd) {
    test::TempDir tmp;
    std::string path = tmp.file("pipe");
    ASSERT_EQ(::mkfifo(path.c_str(), 0600), 0);
    int fd = open_writer_end(path);
    ASSERT_GE(fd, 0);
    // Larger than a pipe's buffer (64 KiB on Linux): the writer must wait for the reader.
    std::string deck = "t\n" + std::string(200000, '*') + "\n.end\n";
    std::atomic<bool> endless{false}, stop{false};
    std::thread writer(feed, fd, std::cref(deck), std::cref(endless), std::cref(stop));
    auto text = DiskFileSystem().read(path);
    writer.join();
    ASSERT_TRUE(text.has_value());
    EXPECT_EQ(text->bytes, deck);
}

TEST(DiskFileSystem, RefusesMoreThanItsLimitFromFilesAndPipes) {
    test::TempDir tmp;
    test::write_bytes(tmp.file("big.cir"), std::string(5000, '*'));
    std::string problem;
    EXPECT_FALSE(DiskFileSystem(std::size_t{4} << 10).read(tmp.file("big.cir"), &problem));
    EXPECT_EQ(problem, "it is larger than 0 MiB, the most deckscale reads");
    EXPECT_TRUE(DiskFileSystem(5000).read(tmp.file("big.cir")).has_value());

    // An endless stream: the read stops at the limit, with the reason.
    std::string path = tmp.file("endless");
    ASSERT_EQ(::mkfifo(path.c_str(), 0600), 0);
    int fd = open_writer_end(path);
    ASSERT_GE(fd, 0);
    std::string block(4096, '*');
    std::atomic<bool> endless{true}, stop{false};
    std::thread writer(feed, fd, std::cref(block), std::cref(endless), std::cref(stop));
    problem.clear();
    EXPECT_FALSE(DiskFileSystem(std::size_t{3} << 20).read(path, &problem).has_value());
    stop = true;
    writer.join();
    EXPECT_EQ(problem, "it is larger than 3 MiB, the most deckscale reads");
}

}  // namespace
}  // namespace deckscale
