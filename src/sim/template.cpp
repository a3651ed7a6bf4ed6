// The template process (see sim/template.hpp): both its own loop and the caller's handle.
#include "sim/template.hpp"

#include <fcntl.h>
#include <poll.h>
#include <sched.h>
#include <signal.h>
#include <sys/socket.h>
#include <sys/syscall.h>
#include <sys/wait.h>
#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <cerrno>
#include <cstdint>
#include <cstring>

#include "sim/child.hpp"
#include "sim/code_models.hpp"

namespace deckscale {
namespace {

using Clock = std::chrono::steady_clock;

constexpr char ready_byte = 'R';
constexpr std::chrono::milliseconds reply_wait{10000};  // the template answers in about 1 ms

std::atomic<std::size_t> cloned_jobs{0};

// Receives one job index and its attached descriptor; false at end of stream or on error.
bool receive_job(int sock, std::uint32_t& index, int& fd) {
    alignas(cmsghdr) char control[CMSG_SPACE(sizeof(int))];
    iovec iov{&index, sizeof index};
    msghdr msg{};
    msg.msg_iov = &iov;
    msg.msg_iovlen = 1;
    msg.msg_control = control;
    msg.msg_controllen = sizeof control;
    ssize_t n;
    do {
        n = ::recvmsg(sock, &msg, MSG_CMSG_CLOEXEC);
    } while (n < 0 && errno == EINTR);
    if (n <= 0) return false;
    fd = -1;
    for (cmsghdr* c = CMSG_FIRSTHDR(&msg); c; c = CMSG_NXTHDR(&msg, c)) {
        if (c->cmsg_level == SOL_SOCKET && c->cmsg_type == SCM_RIGHTS)
            std::memcpy(&fd, CMSG_DATA(c), sizeof fd);
    }
    return n == sizeof index;
}

bool send_all(int sock, const void* data, std::size_t size) {
    ssize_t n;
    do {
        n = ::send(sock, data, size, MSG_NOSIGNAL);
    } while (n < 0 && errno == EINTR);
    return n == static_cast<ssize_t>(size);
}

// The template's life: initialise ngspice, then clone one process per job request. Its job
// processes are its siblings (CLONE_PARENT), so it has no children to wait for.
[[noreturn]] void serve(const std::vector<SimJob>& jobs, int sock) noexcept {
    bool code_models = std::any_of(jobs.begin(), jobs.end(),
                                   [](const SimJob& job) { return needs_code_models(job.cards); });
    sock = prepare_template(sock, code_models);
    if (sock < 0 || !send_all(sock, &ready_byte, 1)) _exit(0);
    for (;;) {
        std::uint32_t index = 0;
        int fd = -1;
        if (!receive_job(sock, index, fd)) _exit(0);
        std::int32_t reply = -EINVAL;
        if (fd >= 0 && index < jobs.size()) {
            long pid =
                ::syscall(SYS_clone, CLONE_PARENT | SIGCHLD, nullptr, nullptr, nullptr, nullptr);
            if (pid == 0) run_cloned_child(jobs[index], fd);
            reply = pid > 0 ? static_cast<std::int32_t>(pid) : -errno;
        }
        if (fd >= 0) ::close(fd);
        if (!send_all(sock, &reply, sizeof reply)) _exit(0);
    }
}

// Reads one message of exactly `size` bytes before `deadline`.
bool receive_reply(int sock, void* data, std::size_t size, Clock::time_point deadline) {
    for (;;) {
        auto left = std::chrono::ceil<std::chrono::milliseconds>(deadline - Clock::now());
        pollfd p{sock, POLLIN, 0};
        int ready = ::poll(&p, 1, static_cast<int>(std::clamp<long long>(left.count(), 0, 1000)));
        if (ready < 0 && errno != EINTR) return false;
        if (ready > 0) {
            ssize_t n = ::recv(sock, data, size, 0);
            if (n < 0 && errno == EINTR) continue;
            return n == static_cast<ssize_t>(size);
        }
        if (Clock::now() >= deadline) return false;
    }
}

}  // namespace

bool SimTemplate::start(const std::vector<SimJob>& jobs, std::chrono::milliseconds wait) {
    stop();
    int sv[2];
    if (::socketpair(AF_UNIX, SOCK_SEQPACKET | SOCK_CLOEXEC, 0, sv) != 0) return false;
    pid_t pid = ::fork();
    if (pid < 0) {
        ::close(sv[0]);
        ::close(sv[1]);
        return false;
    }
    if (pid == 0) {
        ::close(sv[0]);
        serve(jobs, sv[1]);  // never returns
    }
    ::close(sv[1]);
    pid_ = pid;
    socket_ = sv[0];
    char byte = 0;
    if (!receive_reply(socket_, &byte, 1, Clock::now() + wait) || byte != ready_byte) {
        stop();
        return false;
    }
    return true;
}

pid_t SimTemplate::spawn(std::size_t index, int pipe_fd) {
    if (!running()) return -1;
    auto request = static_cast<std::uint32_t>(index);
    iovec iov{&request, sizeof request};
    alignas(cmsghdr) char control[CMSG_SPACE(sizeof(int))] = {};
    msghdr msg{};
    msg.msg_iov = &iov;
    msg.msg_iovlen = 1;
    msg.msg_control = control;
    msg.msg_controllen = sizeof control;
    cmsghdr* c = CMSG_FIRSTHDR(&msg);
    c->cmsg_level = SOL_SOCKET;
    c->cmsg_type = SCM_RIGHTS;
    c->cmsg_len = CMSG_LEN(sizeof(int));
    std::memcpy(CMSG_DATA(c), &pipe_fd, sizeof pipe_fd);
    ssize_t n;
    do {
        n = ::sendmsg(socket_, &msg, MSG_NOSIGNAL);
    } while (n < 0 && errno == EINTR);
    std::int32_t reply = -1;
    if (n != sizeof request ||
        !receive_reply(socket_, &reply, sizeof reply, Clock::now() + reply_wait) || reply <= 0) {
        stop();
        return -1;
    }
    ++cloned_jobs;
    return static_cast<pid_t>(reply);
}

void SimTemplate::stop() {
    if (socket_ >= 0) ::close(socket_);  // the template ends at end of stream
    socket_ = -1;
    if (pid_ <= 0) return;
    ::kill(pid_, SIGKILL);  // in case it does not
    int status = 0;
    while (::waitpid(pid_, &status, 0) < 0 && errno == EINTR) {
    }
    pid_ = -1;
}

std::size_t jobs_started_from_template() { return cloned_jobs.load(); }

}  // namespace deckscale
