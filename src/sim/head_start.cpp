#include "sim/head_start.hpp"

#include <fcntl.h>
#include <signal.h>
#include <sys/socket.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <string>

#include "sim/child.hpp"
#include "sim/job_wire.hpp"

namespace deckscale {

SimHeadStart::SimHeadStart(unsigned processes) {
    for (unsigned i = 0; i < processes; ++i) {
        int pipe_fds[2];
        int sock[2];
        if (::pipe2(pipe_fds, O_CLOEXEC) != 0) return;
        if (::socketpair(AF_UNIX, SOCK_STREAM | SOCK_CLOEXEC, 0, sock) != 0) {
            ::close(pipe_fds[0]);
            ::close(pipe_fds[1]);
            return;
        }
        pid_t pid = ::fork();
        if (pid == 0) {
            ::close(pipe_fds[0]);
            ::close(sock[0]);
            run_early_child(pipe_fds[1], sock[1]);  // never returns
        }
        ::close(pipe_fds[1]);
        ::close(sock[1]);
        if (pid < 0) {
            ::close(pipe_fds[0]);
            ::close(sock[0]);
            return;
        }
        ::setpgid(pid, pid);  // also done by the child; whoever is first wins the race
        ::fcntl(pipe_fds[0], F_SETFL, O_NONBLOCK);
        ::fcntl(sock[0], F_SETFL, O_NONBLOCK);
        waiting_.push_back({pid, pipe_fds[0], sock[0]});
    }
}

SimHeadStart::~SimHeadStart() {
    for (Waiting& w : waiting_) stop(w);
    for (pid_t pid : exiting_) {
        ::kill(pid, SIGKILL);  // it only has to end; this makes sure it cannot linger
        int status = 0;
        while (::waitpid(pid, &status, 0) < 0 && errno == EINTR) {
        }
    }
}

void SimHeadStart::stop(Waiting& w) {
    ::close(w.job_fd);
    ::close(w.result_fd);
    ::kill(w.pid, SIGKILL);  // it may be loading libngspice still
    int status = 0;
    while (::waitpid(w.pid, &status, 0) < 0 && errno == EINTR) {
    }
}

pid_t SimHeadStart::hand_over(const SimJob& job, int& result_fd) {
    std::string message = wire::job_message(job);
    while (!waiting_.empty()) {
        Waiting w = waiting_.front();
        waiting_.erase(waiting_.begin());
        // The whole message at once or not at all: the socket is empty and non-blocking, so a
        // message larger than its buffer (a very large deck) goes to a process of its own.
        ssize_t n;
        do {
            n = ::send(w.job_fd, message.data(), message.size(), MSG_NOSIGNAL);
        } while (n < 0 && errno == EINTR);
        if (n == static_cast<ssize_t>(message.size())) {
            ::close(w.job_fd);  // end of stream: the message is complete
            result_fd = w.result_fd;
            return w.pid;
        }
        stop(w);
    }
    return -1;
}

}  // namespace deckscale
