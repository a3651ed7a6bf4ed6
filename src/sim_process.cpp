#include "sim_process.hpp"

#include <fcntl.h>
#include <signal.h>
#include <sys/prctl.h>
#include <unistd.h>

#include <cstdlib>
#include <filesystem>

namespace deckscale {

int take_over_process(int fd) {
    int pipe_fd = ::fcntl(fd, F_DUPFD, 3);
    int null_fd = ::open("/dev/null", O_RDWR);
    if (pipe_fd < 0 || null_fd < 0) _exit(exit_setup_failed);
    for (int std_fd = 0; std_fd <= 2; ++std_fd) ::dup2(null_fd, std_fd);
    if (pipe_fd != 3 && ::dup2(pipe_fd, 3) < 0) _exit(exit_setup_failed);
    if (::close_range(4, ~0U, 0) != 0) {
        for (int i = 4; i < 4096; ++i) ::close(i);
    }
    for (int sig : {SIGINT, SIGTERM, SIGHUP, SIGPIPE, SIGCHLD, SIGQUIT}) ::signal(sig, SIG_DFL);
    sigset_t none;
    sigemptyset(&none);
    ::sigprocmask(SIG_SETMASK, &none, nullptr);
    ::prctl(PR_SET_PDEATHSIG, SIGKILL);
    ::setpgid(0, 0);  // own process group, so that a timeout kills what ngspice started too
    return 3;
}

// ngspice 39 executes ./.spiceinit when it is initialised, or else ~/.spiceinit with the
// home directory taken from the password database, not from $HOME (seen with strace). A
// user's file there can change how decks are read, so ngspice is initialised in a fresh
// private directory holding an empty .spiceinit. Returns "" if none could be made.
std::string make_start_dir() {
    std::error_code ec;
    std::filesystem::path base = std::filesystem::temp_directory_path(ec);
    if (ec) base = "/tmp";
    std::string dir = (base / ("deckscale-sim-" + std::string(6, 'X'))).string();  // for mkdtemp
    if (!::mkdtemp(dir.data())) return "";
    std::string file = dir + "/.spiceinit";
    int fd = ::open(file.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0600);
    if (fd < 0) {
        ::rmdir(dir.c_str());
        return "";
    }
    ::close(fd);
    return dir;
}

void remove_start_dir(const std::string& dir) {
    if (dir.empty()) return;
    ::unlink((dir + "/.spiceinit").c_str());
    ::rmdir(dir.c_str());
}

}  // namespace deckscale
