#include "base/gnuplot.hpp"

#include <fcntl.h>
#include <spawn.h>
#include <sys/wait.h>

#include <vector>

#include <fmt/format.h>

extern char** environ;

namespace deckscale {

std::string gnuplot_quote(const std::string& s) {
    std::string out = "'";
    for (char c : s) out += c == '\'' ? std::string("''") : std::string(1, c);
    return out + "'";
}

std::string run_gnuplot(const std::string& script, const std::string& dir) {
    std::string prog = "gnuplot";
    std::vector<char*> argv{prog.data(), const_cast<char*>(script.c_str()), nullptr};
    posix_spawn_file_actions_t fa;
    posix_spawn_file_actions_init(&fa);
    posix_spawn_file_actions_addopen(&fa, 1, "/dev/null", O_WRONLY, 0);
    posix_spawn_file_actions_addchdir_np(&fa, dir.c_str());
    pid_t pid;
    int rc = posix_spawnp(&pid, prog.c_str(), &fa, nullptr, argv.data(), environ);
    posix_spawn_file_actions_destroy(&fa);
    if (rc != 0) return "cannot run gnuplot (install the gnuplot-nox package; scripts/setup does)";
    int status = 0;
    waitpid(pid, &status, 0);
    if (!WIFEXITED(status) || WEXITSTATUS(status) != 0)
        return fmt::format("gnuplot failed on {}", script);
    return "";
}

}  // namespace deckscale
