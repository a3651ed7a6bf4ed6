#include "batch/workers.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <poll.h>
#include <signal.h>
#include <stdlib.h>
#include <sys/prctl.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <filesystem>
#include <string>
#include <thread>

#include "base/file_system.hpp"
#include "batch/case_run.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;
using Clock = std::chrono::steady_clock;

// A private folder for the scaled decks of one run, removed with everything in it at the end
// (also what a killed worker left there).
class ScratchFolder {
  public:
    ScratchFolder() {
        std::string tmpl = (fs::temp_directory_path() / "deckscale-batch-XXXXXX").string();
        if (::mkdtemp(tmpl.data())) path_ = tmpl;
    }
    ~ScratchFolder() {
        std::error_code ec;
        if (!path_.empty()) fs::remove_all(path_, ec);
    }
    ScratchFolder(const ScratchFolder&) = delete;
    ScratchFolder& operator=(const ScratchFolder&) = delete;
    const std::string& path() const { return path_; }

  private:
    std::string path_;
};

struct Running {
    std::size_t slot = 0;  // index into cases
    pid_t pid = -1;
    int fd = -1;
    std::string record;
    Clock::time_point deadline;
    bool killed = false;
};

void write_all(int fd, const std::string& s) {
    std::size_t at = 0;
    while (at < s.size()) {
        ssize_t n = ::write(fd, s.data() + at, s.size() - at);
        if (n < 0 && errno == EINTR) continue;
        if (n <= 0) return;
        at += static_cast<std::size_t>(n);
    }
}

[[noreturn]] void worker_main(const SuiteCase& c, int fd, const std::string& scratch) {
    ::prctl(PR_SET_PDEATHSIG, SIGKILL);  // dies with the parent, and its simulations with it
    CaseResult r;
    try {
        std::string folder = scratch.empty() ? "" : scratch + "/" + std::to_string(c.index);
        std::error_code ec;
        if (!folder.empty()) fs::create_directory(folder, ec);
        DiskFileSystem disk;
        r = run_case(c, disk, ec ? "" : folder);
    } catch (const std::exception& e) {
        r.index = c.index;
        r.name = c.name;
        r.deck = c.deck;
        r.expect = c.expect;
        r.problems.push_back(std::string("internal error: ") + e.what());
    }
    write_all(fd, to_json(r).dump());
    ::_exit(0);
}

CaseResult failed_worker(const SuiteCase& c, const std::string& why) {
    CaseResult r;
    r.index = c.index;
    r.name = c.name;
    r.deck = c.deck;
    r.expect = c.expect;
    r.outcome = CaseOutcome::error;
    r.problems.push_back(why);
    return r;
}

}  // namespace

std::chrono::milliseconds case_deadline(const SuiteCase& c) {
    return 6 * c.timeout + std::chrono::milliseconds(60000);
}

std::vector<CaseResult> run_cases(const std::vector<SuiteCase>& cases,
                                  const WorkerSettings& settings) {
    unsigned workers =
        settings.workers ? settings.workers : std::max(1u, std::thread::hardware_concurrency());
    std::vector<CaseResult> results(cases.size());
    std::vector<Running> running;
    ScratchFolder scratch;
    BatchProgress progress;
    progress.total = cases.size();
    auto start = Clock::now();
    auto last_report = start;
    auto report = [&] {
        progress.elapsed_s = std::chrono::duration<double>(Clock::now() - start).count();
        last_report = Clock::now();
        if (settings.progress) settings.progress(progress);
    };
    auto deadline_of = [&](const SuiteCase& c) {
        return settings.deadline.value_or(case_deadline(c));
    };
    std::size_t next = 0;
    while (next < cases.size() || !running.empty()) {
        while (next < cases.size() && running.size() < workers) {
            const SuiteCase& c = cases[next];
            int fds[2];
            if (::pipe2(fds, O_CLOEXEC) != 0) {
                results[next++] = failed_worker(c, "cannot start a worker process: no pipe");
                ++progress.done;
                if (!results[next - 1].met()) ++progress.unmet;
                continue;
            }
            pid_t pid = ::fork();
            if (pid == 0) {
                ::close(fds[0]);
                for (const auto& r : running) ::close(r.fd);
                worker_main(c, fds[1], scratch.path());
            }
            ::close(fds[1]);
            if (pid < 0) {
                ::close(fds[0]);
                results[next++] = failed_worker(c, "cannot start a worker process (fork failed)");
                ++progress.done;
                if (!results[next - 1].met()) ++progress.unmet;
                continue;
            }
            running.push_back({next++, pid, fds[0], {}, Clock::now() + deadline_of(c), false});
        }
        std::vector<pollfd> polls;
        for (const auto& r : running) polls.push_back({r.fd, POLLIN, 0});
        ::poll(polls.data(), polls.size(), 200);
        auto now = Clock::now();
        for (std::size_t i = 0; i < running.size();) {
            Running& r = running[i];
            bool finished = false;
            if (polls[i].revents) {
                char buffer[65536];
                ssize_t n = ::read(r.fd, buffer, sizeof buffer);
                if (n > 0) r.record.append(buffer, static_cast<std::size_t>(n));
                finished = n == 0 || (n < 0 && errno != EINTR && errno != EAGAIN);
            }
            if (!finished && !r.killed && now > r.deadline) {
                ::kill(r.pid, SIGKILL);
                r.killed = true;
            }
            if (!finished) {
                ++i;
                continue;
            }
            ::close(r.fd);
            int status = 0;
            while (::waitpid(r.pid, &status, 0) < 0 && errno == EINTR) {
            }
            const SuiteCase& c = cases[r.slot];
            CaseResult result;
            if (r.killed) {
                result = failed_worker(
                    c, fmt::format("the case did not finish within {:g} s and was stopped",
                                   static_cast<double>(deadline_of(c).count()) / 1000));
            } else {
                try {
                    result = case_result_from_json(nlohmann::json::parse(r.record));
                } catch (const std::exception&) {
                    std::string how = WIFSIGNALED(status)
                                          ? fmt::format("killed by signal {}", WTERMSIG(status))
                                          : fmt::format("exit status {}", WEXITSTATUS(status));
                    result = failed_worker(c, "the worker process of this case died (" + how + ")");
                }
            }
            if (!result.met()) ++progress.unmet;
            ++progress.done;
            results[r.slot] = std::move(result);
            running.erase(running.begin() + static_cast<std::ptrdiff_t>(i));
            polls.erase(polls.begin() + static_cast<std::ptrdiff_t>(i));
            report();
        }
        if (Clock::now() - last_report > std::chrono::milliseconds(500)) report();
    }
    return results;
}

}  // namespace deckscale
