// Tests of what an interrupted run leaves: a forked child plays the tool, the parent looks at
// the folder afterwards.
#include "cli/interrupts.hpp"

#include <gtest/gtest.h>

#include <signal.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <filesystem>
#include <string>

#include "base/output_file.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

std::size_t entries(const std::filesystem::path& dir) {
    return static_cast<std::size_t>(std::distance(std::filesystem::directory_iterator(dir), {}));
}

// Runs `body` in a forked child and returns its wait status.
template <class Body>
int in_child(Body body) {
    pid_t pid = ::fork();
    if (pid == 0) {
        body();
        ::_exit(0);
    }
    int status = 0;
    ::waitpid(pid, &status, 0);
    return status;
}

TEST(Interrupts, ASignalMidWriteLeavesTheOldFileAndNoTemporaryOne) {
    for (int sig : {SIGINT, SIGTERM, SIGHUP}) {
        SCOPED_TRACE(sig);
        test::TempDir dir;
        test::write_bytes(dir.file("out.cir"), "old\n");
        int status = in_child([&] {
            install_interrupt_cleanup();
            OutputBatch batch;
            batch.add(dir.file("inc-scaled.inc"), "a finished include\n");
            batch.add(dir.file("out.cir"), [&](ByteSink& sink) {
                sink.write(std::string(1 << 20, '*'));
                sink.flush();
                ::raise(sig);  // as if the user pressed Ctrl-C here
                sink.write("never reached\n");
            });
            batch.commit();
        });
        ASSERT_TRUE(WIFSIGNALED(status));  // it still dies of the signal, as callers expect
        EXPECT_EQ(WTERMSIG(status), sig);
        EXPECT_EQ(test::read_bytes(dir.file("out.cir")), "old\n");
        EXPECT_EQ(entries(dir.path()), 1u);
    }
}

TEST(Interrupts, AFileSizeLimitIsAnErrorNotADeath) {
    test::TempDir dir;
    int status = in_child([&] {
        install_interrupt_cleanup();
        struct rlimit limit {100000, 100000};  // as `ulimit -f` sets it
        ::setrlimit(RLIMIT_FSIZE, &limit);
        std::string e = write_file_atomically(dir.file("out.cir"), std::string(1 << 20, '*'));
        ::_exit(e.find("File too large") != std::string::npos ? 0 : 1);
    });
    ASSERT_TRUE(WIFEXITED(status));
    EXPECT_EQ(WEXITSTATUS(status), 0);
    EXPECT_EQ(entries(dir.path()), 0u);
}

}  // namespace
}  // namespace deckscale
