// The parent side of simulation: start children, read their pipes, enforce deadlines, reap.
#include "sim/simulate.hpp"

#include <fcntl.h>
#include <fmt/format.h>
#include <poll.h>
#include <signal.h>
#include <sys/syscall.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cstring>
#include <optional>
#include <thread>

#include "sim/child.hpp"
#include "sim/end.hpp"
#include "sim/head_start.hpp"
#include "sim/interrupt.hpp"
#include "sim/template.hpp"
#include "sim/wire.hpp"

namespace deckscale {
namespace {

using Clock = std::chrono::steady_clock;

struct Running {
    std::size_t index = 0;  // position in the job list
    pid_t pid = -1;
    int fd = -1;     // read end; -1 once the child closed its end
    int pidfd = -1;  // readable once the child has exited; -1 if the kernel offers none
    wire::StreamDecoder stream;  // decodes what has been read so far
    Clock::time_point deadline;
    bool judged = false;  // its outcome is known; only its exit is awaited
};

// A descriptor that becomes readable when the child exits (Linux 5.3), or -1.
int exit_descriptor(pid_t pid) {
#ifdef SYS_pidfd_open
    return static_cast<int>(::syscall(SYS_pidfd_open, pid, 0));
#else
    return -1;
#endif
}

void close_fd(int& fd) {
    if (fd >= 0) ::close(fd);
    fd = -1;
}

// Cards ngspice would silently mangle are refused before any process is started.
std::optional<std::string> invalid_cards(const SimJob& job) {
    if (job.cards.empty()) return "no cards to simulate";
    for (std::size_t i = 0; i < job.cards.size(); ++i) {
        const std::string& c = job.cards[i];
        if (c.find('\n') != std::string::npos || c.find('\0') != std::string::npos)
            return fmt::format("card {} contains a line break or NUL byte", i + 1);
    }
    return std::nullopt;
}

SimOutcome failure(SimStatus status, std::string message) {
    SimOutcome out;
    out.status = status;
    out.message = std::move(message);
    return out;
}

// Starts one child: a head-started one if one waits, else cloned from the template if one
// runs, else forked; returns the outcome directly when no child could be started.
std::optional<SimOutcome> start(const SimJob& job, std::size_t index, SimHeadStart* head,
                                SimTemplate* from, Running& r) {
    if (auto why = invalid_cards(job)) return failure(SimStatus::load_failed, *why);
    // Clamped so that the deadline arithmetic cannot overflow.
    auto timeout = std::clamp<std::chrono::milliseconds>(job.timeout, std::chrono::milliseconds(0),
                                                         std::chrono::hours(24 * 365));
    r.deadline = Clock::now() + timeout;
    int read_fd = -1;
    pid_t pid = head ? head->hand_over(job, read_fd) : -1;
    if (pid < 0) {
        int fds[2];
        if (::pipe2(fds, O_CLOEXEC) != 0) {
            return failure(SimStatus::crashed,
                           fmt::format("cannot create a pipe: {}", std::strerror(errno)));
        }
        pid = from ? from->spawn(index, fds[1]) : -1;
        if (pid < 0) pid = ::fork();  // the direct path: no template, or it failed
        if (pid < 0) {
            int err = errno;
            ::close(fds[0]);
            ::close(fds[1]);
            return failure(SimStatus::crashed, fmt::format("cannot start a simulator process: {}",
                                                           std::strerror(err)));
        }
        if (pid == 0) {
            ::close(fds[0]);
            run_child(job, fds[1]);  // never returns
        }
        ::setpgid(pid, pid);  // also done by the child; whoever is first wins the race
        ::close(fds[1]);
        ::fcntl(fds[0], F_SETFL, O_NONBLOCK);
        read_fd = fds[0];
    }
    r.index = index;
    r.pid = pid;
    r.fd = read_fd;
    r.pidfd = exit_descriptor(pid);
    return std::nullopt;
}

// Reads what is available; closes the descriptor at end of stream. A vector's values are
// read straight into the vector, everything else through a small buffer.
void drain(Running& r) {
    char buffer[4096];
    for (;;) {
        std::span<char> room = r.stream.value_room();
        ssize_t n = room.empty() ? ::read(r.fd, buffer, sizeof buffer)
                                 : ::read(r.fd, room.data(), room.size());
        if (!room.empty()) r.stream.fill_room(n > 0 ? static_cast<std::size_t>(n) : 0);
        if (n > 0) {
            if (room.empty()) r.stream.feed(std::string_view(buffer, static_cast<std::size_t>(n)));
            continue;
        }
        if (n < 0 && errno == EINTR) continue;
        if (n < 0 && (errno == EAGAIN || errno == EWOULDBLOCK)) return;
        ::close(r.fd);  // end of stream or a read error: nothing more will come
        r.fd = -1;
        return;
    }
}

// waitpid that survives EINTR; returns false while the child is still running (no_hang).
bool reap(pid_t pid, int& status, bool no_hang) {
    for (;;) {
        pid_t got = ::waitpid(pid, &status, no_hang ? WNOHANG : 0);
        if (got == pid) return true;
        if (got == 0) return false;
        if (errno == EINTR) continue;
        status = 0;  // ECHILD: someone else reaped it (SIGCHLD ignored); judge by the stream
        return true;
    }
}

}  // namespace

const char* to_string(SimStatus s) {
    switch (s) {
        case SimStatus::ok:
            return "ok";
        case SimStatus::load_failed:
            return "load failed";
        case SimStatus::run_failed:
            return "run failed";
        case SimStatus::controlled_exit:
            return "controlled exit";
        case SimStatus::crashed:
            return "crashed";
        case SimStatus::timed_out:
            return "timed out";
        case SimStatus::interrupted:
            return "interrupted";
    }
    return "unknown";
}

const SimVector* SimPlot::find(const std::string& wanted) const {
    auto same = [&](const std::string& candidate) {
        return candidate.size() == wanted.size() &&
               std::equal(candidate.begin(), candidate.end(), wanted.begin(), [](char a, char b) {
                   return std::tolower(static_cast<unsigned char>(a)) ==
                          std::tolower(static_cast<unsigned char>(b));
               });
    };
    for (const SimVector& v : vectors)
        if (same(v.name)) return &v;
    return nullptr;
}

namespace {

SimOutcome interrupted(const SimJob& job) {
    SimOutcome o;
    o.status = SimStatus::interrupted;
    o.message = fmt::format("{}: stopped on request", job.label);
    return o;
}

// Kills every running child with what it started (its process group) and waits for it; a
// child whose verdict was not in yet ends as interrupted.
void stop_all(std::vector<Running>& running, const std::vector<SimJob>& jobs,
              std::vector<SimOutcome>& outcomes) {
    for (Running& r : running) {
        if (::kill(-r.pid, SIGKILL) != 0) ::kill(r.pid, SIGKILL);
        int status = 0;
        reap(r.pid, status, false);
        close_fd(r.fd);
        close_fd(r.pidfd);
        if (!r.judged) outcomes[r.index] = interrupted(jobs[r.index]);
    }
    running.clear();
}

// Runs the jobs, cloned from a template process (see sim/template.hpp) if `how` says so.
std::vector<SimOutcome> run_jobs(const std::vector<SimJob>& jobs, unsigned parallel,
                                 SimProcesses how, SimHeadStart* head) {
    if (parallel == 0) parallel = std::thread::hardware_concurrency();
    parallel = std::max(parallel, 1u);
    if (how == SimProcesses::automatic)
        how = jobs.size() > parallel ? SimProcesses::from_template : SimProcesses::direct;
    std::vector<SimOutcome> outcomes(jobs.size());
    SimTemplate from;
    if (how == SimProcesses::from_template && !jobs.empty()) {
        // It gets as long to initialise as the most patient job would.
        std::chrono::milliseconds wait(2000);
        for (const SimJob& job : jobs)
            wait = std::clamp<std::chrono::milliseconds>(job.timeout, wait, std::chrono::hours(1));
        // If it cannot start, each job is forked directly and its own process says why.
        from.start(jobs, wait);
    }
    std::vector<Running> running;
    std::size_t next = 0;
    auto busy = [&] {
        return static_cast<std::size_t>(
            std::count_if(running.begin(), running.end(), [](const Running& r) { return !r.judged; }));
    };
    while (next < jobs.size() || !running.empty()) {
        if (interrupt_requested()) {
            stop_all(running, jobs, outcomes);
            for (; next < jobs.size(); ++next) outcomes[next] = interrupted(jobs[next]);
            break;
        }
        while (busy() < parallel && next < jobs.size()) {
            Running r;
            if (auto direct =
                    start(jobs[next], next, head, from.running() ? &from : nullptr, r)) {
                outcomes[next] = std::move(*direct);
            } else {
                running.push_back(std::move(r));
            }
            ++next;
        }
        if (running.empty()) continue;

        // Wait for data, for an exit, for the nearest deadline, or (without exit descriptors)
        // briefly for a child that closed its pipe but has not exited yet.
        std::vector<pollfd> fds;
        Clock::time_point wake = Clock::time_point::max();
        for (const Running& r : running) {
            if (r.fd >= 0) fds.push_back({r.fd, POLLIN, 0});
            if (r.pidfd >= 0) fds.push_back({r.pidfd, POLLIN, 0});
            wake = std::min(wake, r.fd >= 0 || r.pidfd >= 0
                                      ? r.deadline
                                      : Clock::now() + std::chrono::milliseconds(2));
        }
        auto wait = std::chrono::ceil<std::chrono::milliseconds>(wake - Clock::now());
        int timeout_ms = static_cast<int>(std::clamp<long long>(wait.count(), 0, 1000));
        if (::poll(fds.data(), fds.size(), timeout_ms) < 0 && errno != EINTR) {
            ::usleep(1000);  // should not happen (EFAULT/ENOMEM); do not spin
        }
        for (Running& r : running)
            if (r.fd >= 0) drain(r);

        for (auto it = running.begin(); it != running.end();) {
            Running& r = *it;
            const SimJob& job = jobs[r.index];
            // A complete stream is the verdict: judged now, the exit is awaited below.
            if (!r.judged && r.stream.state() == wire::StreamState::complete) {
                close_fd(r.fd);
                outcomes[r.index] = judge_child(job.label, job.timeout, r.stream.state(),
                                                std::move(r.stream.outcome()),
                                                {ChildEnd::Kind::result_received, 0});
                r.judged = true;
            }
            int status = 0;
            bool done = reap(r.pid, status, true);
            if (!done && r.judged && head) {  // its exit is awaited when `head` ends
                head->adopt(r.pid);
                close_fd(r.pidfd);
                it = running.erase(it);
                continue;
            }
            bool late = false;
            if (!done && Clock::now() >= r.deadline) {
                // The whole group: also a shell or other program ngspice may have started.
                if (::kill(-r.pid, SIGKILL) != 0) ::kill(r.pid, SIGKILL);
                reap(r.pid, status, false);
                done = late = true;
            }
            if (!done) {
                ++it;
                continue;
            }
            if (r.fd >= 0) {  // the child is gone: what it wrote is in the pipe
                drain(r);
                close_fd(r.fd);  // still open: held by a process it started
            }
            close_fd(r.pidfd);
            if (!r.judged) {
                ChildEnd end{late ? ChildEnd::Kind::timed_out : ChildEnd::Kind::exited, status};
                outcomes[r.index] = judge_child(job.label, job.timeout, r.stream.state(),
                                                std::move(r.stream.outcome()), end);
            }
            it = running.erase(it);
        }
    }
    return outcomes;
}

}  // namespace

SimOutcome simulate(const SimJob& job) {
    return std::move(run_jobs({job}, 1, SimProcesses::direct, nullptr).front());
}

std::vector<SimOutcome> simulate_all(const std::vector<SimJob>& jobs, unsigned parallel,
                                     SimProcesses how, SimHeadStart* head_start) {
    return run_jobs(jobs, parallel, how, head_start);
}

}  // namespace deckscale
