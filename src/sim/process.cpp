#include "sim/process.hpp"

#include <fcntl.h>
#include <malloc.h>
#include <sys/mman.h>
#include <signal.h>
#include <sys/prctl.h>
#include <unistd.h>

#include <cerrno>
#include <cstdint>
#include <cstdlib>
#include <filesystem>

namespace deckscale {

int take_over_process(int fd, int job_fd) {
    // Out of the way of 0-4 first, so that neither lands on the other's place.
    int pipe_fd = ::fcntl(fd, F_DUPFD, 5);
    int keep_fd = job_fd >= 0 ? ::fcntl(job_fd, F_DUPFD, 5) : -1;
    int null_fd = ::open("/dev/null", O_RDWR);
    if (pipe_fd < 0 || null_fd < 0 || (job_fd >= 0 && keep_fd < 0)) _exit(exit_setup_failed);
    for (int std_fd = 0; std_fd <= 2; ++std_fd) ::dup2(null_fd, std_fd);
    if (::dup2(pipe_fd, 3) < 0) _exit(exit_setup_failed);
    if (keep_fd >= 0 && ::dup2(keep_fd, 4) < 0) _exit(exit_setup_failed);
    int first_closed = keep_fd >= 0 ? 5 : 4;
    if (::close_range(first_closed, ~0U, 0) != 0) {
        for (int i = first_closed; i < 4096; ++i) ::close(i);
    }
    for (int sig : {SIGINT, SIGTERM, SIGHUP, SIGPIPE, SIGCHLD, SIGQUIT}) ::signal(sig, SIG_DFL);
    sigset_t none;
    sigemptyset(&none);
    ::sigprocmask(SIG_SETMASK, &none, nullptr);
    ::prctl(PR_SET_PDEATHSIG, SIGKILL);
    ::setpgid(0, 0);  // own process group, so that a timeout kills what ngspice started too
    return 3;
}

void prefault_heap(std::size_t bytes) {
    ::mallopt(M_MMAP_THRESHOLD, static_cast<int>(bytes * 2));
    ::mallopt(M_TRIM_THRESHOLD, static_cast<int>(bytes * 16));
    char* block = static_cast<char*>(::malloc(bytes));
    if (!block) return;
#ifdef MADV_POPULATE_WRITE
    const std::uintptr_t page = static_cast<std::uintptr_t>(::sysconf(_SC_PAGESIZE));
    auto first = (reinterpret_cast<std::uintptr_t>(block) + page - 1) & ~(page - 1);
    auto last = (reinterpret_cast<std::uintptr_t>(block) + bytes) & ~(page - 1);
    if (last > first) ::madvise(reinterpret_cast<void*>(first), last - first, MADV_POPULATE_WRITE);
#endif
    ::free(block);  // back to malloc, mapped
}

namespace {

bool write_new_file(const std::string& path, const std::string& text) {
    int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, 0600);
    if (fd < 0) return false;
    bool ok = true;
    for (std::size_t done = 0; ok && done < text.size();) {
        ssize_t n = ::write(fd, text.data() + done, text.size() - done);
        if (n < 0 && errno == EINTR) continue;
        ok = n > 0;
        if (ok) done += static_cast<std::size_t>(n);
    }
    return ::close(fd) == 0 && ok;
}

// A fresh private directory (mkdtemp) in `base`, or "".
std::string make_private_dir(const std::string& base) {
    std::string dir = base + "/deckscale-sim-" + std::string(6, 'X');  // the mkdtemp template
    return ::mkdtemp(dir.data()) ? dir : "";
}

}  // namespace

// ngspice 39 executes ./.spiceinit when it is initialised, or else ~/.spiceinit with the
// home directory taken from the password database, not from $HOME (seen with strace). A
// user's file there can change how decks are read, so ngspice is initialised in a fresh
// private directory holding an empty .spiceinit. It is made in memory (/dev/shm) where
// possible: on the ext4 /tmp of the 2-core VM, making and removing it took 0.3-0.6 ms of
// each child's start, on tmpfs 0.03 ms. Otherwise it goes to the temporary directory.
std::string make_start_dir(const std::string& spinit) {
    std::error_code ec;
    std::filesystem::path temp = std::filesystem::temp_directory_path(ec);
    for (const std::string& base : {std::string("/dev/shm"), ec ? "/tmp" : temp.string()}) {
        std::string dir = make_private_dir(base);
        if (dir.empty()) continue;
        if (write_new_file(dir + "/.spiceinit", "") &&
            (spinit.empty() || write_new_file(dir + "/spinit", spinit)))
            return dir;
        remove_start_dir(dir);  // e.g. /dev/shm is full: the temporary directory may not be
    }
    return "";
}

void remove_start_dir(const std::string& dir) {
    if (dir.empty()) return;
    ::unlink((dir + "/.spiceinit").c_str());
    ::unlink((dir + "/spinit").c_str());
    ::rmdir(dir.c_str());
}

std::optional<std::string> read_small_file(const std::string& path) {
    int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
    if (fd < 0) return std::nullopt;
    std::optional<std::string> text = read_to_end(fd);
    ::close(fd);
    return text;
}

std::optional<std::string> read_to_end(int fd) {
    std::string text;
    char buffer[4096];
    for (;;) {
        ssize_t n = ::read(fd, buffer, sizeof buffer);
        if (n < 0 && errno == EINTR) continue;
        if (n < 0) return std::nullopt;
        if (n == 0) return text;
        text.append(buffer, static_cast<std::size_t>(n));
    }
}

}  // namespace deckscale
