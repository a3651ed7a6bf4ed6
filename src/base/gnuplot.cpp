#include "base/gnuplot.hpp"

#include <fcntl.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <vector>

#include <fmt/format.h>

extern char** environ;

namespace deckscale {
namespace {

// The last non-empty line of gnuplot's messages, which names the problem (earlier lines
// echo the script line and point at the column).
std::string last_line(const std::string& text) {
    std::size_t end = text.find_last_not_of(" \t\r\n");
    if (end == std::string::npos) return "";
    std::size_t begin = text.rfind('\n', end);
    begin = begin == std::string::npos ? 0 : begin + 1;
    std::string line = text.substr(begin, end + 1 - begin);
    std::size_t first = line.find_first_not_of(" \t");
    return first == std::string::npos ? "" : line.substr(first);
}

}  // namespace

std::string gnuplot_quote(const std::string& s) {
    std::string out = "'";
    for (char c : s) out += c == '\'' ? std::string("''") : std::string(1, c);
    return out + "'";
}

std::string run_gnuplot(const std::string& script, const std::string& dir) {
    // gnuplot's messages (warnings such as an autoscaled range that is empty, and errors) are
    // read from a pipe: library code prints nothing, and an error goes into the returned text.
    int pipe_fds[2];
    if (pipe2(pipe_fds, O_CLOEXEC) != 0) return "cannot run gnuplot: no pipe for its messages";
    std::string prog = "gnuplot";
    std::vector<char*> argv{prog.data(), const_cast<char*>(script.c_str()), nullptr};
    posix_spawn_file_actions_t fa;
    posix_spawn_file_actions_init(&fa);
    posix_spawn_file_actions_addopen(&fa, 0, "/dev/null", O_RDONLY, 0);
    posix_spawn_file_actions_addopen(&fa, 1, "/dev/null", O_WRONLY, 0);
    posix_spawn_file_actions_adddup2(&fa, pipe_fds[1], 2);
    posix_spawn_file_actions_addchdir_np(&fa, dir.c_str());
    pid_t pid;
    int rc = posix_spawnp(&pid, prog.c_str(), &fa, nullptr, argv.data(), environ);
    posix_spawn_file_actions_destroy(&fa);
    close(pipe_fds[1]);
    if (rc != 0) {
        close(pipe_fds[0]);
        return "cannot run gnuplot (install the gnuplot-nox package; scripts/setup does)";
    }
    std::string messages;
    char buf[4096];
    for (;;) {
        ssize_t n = read(pipe_fds[0], buf, sizeof buf);
        if (n > 0) {
            if (messages.size() < (1u << 20)) messages.append(buf, static_cast<std::size_t>(n));
        } else if (n == 0 || errno != EINTR) {
            break;
        }
    }
    close(pipe_fds[0]);
    int status = 0;
    while (waitpid(pid, &status, 0) < 0 && errno == EINTR) {
    }
    if (!WIFEXITED(status) || WEXITSTATUS(status) != 0) {
        std::string why = last_line(messages);
        return why.empty() ? fmt::format("gnuplot failed on {}", script)
                           : fmt::format("gnuplot failed on {}: {}", script, why);
    }
    return "";
}

}  // namespace deckscale
