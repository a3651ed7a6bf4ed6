// The state of a simulator child process and the reading of plots out of ngspice's memory.
// Internal to sim/child.cpp and sim/child_plots.cpp; with sim/child.cpp the only files that
// include <ngspice/sharedspice.h>.
#pragma once

#include <fcntl.h>
#include <fmt/format.h>
#include <ngspice/sharedspice.h>
#include <sys/uio.h>
#include <unistd.h>

#include <cerrno>
#include <cstdint>
#include <string>
#include <vector>

#include "sim/process.hpp"
#include "sim/simulate.hpp"
#include "sim/verdict.hpp"
#include "sim/wire.hpp"

namespace deckscale::child_process {

struct Api {
    decltype(&ngSpice_Init) init = nullptr;
    decltype(&ngSpice_Circ) circ = nullptr;
    decltype(&ngSpice_Command) command = nullptr;
    decltype(&ngGet_Vec_Info) vec_info = nullptr;
    decltype(&ngSpice_AllPlots) all_plots = nullptr;
    decltype(&ngSpice_AllVecs) all_vecs = nullptr;
};

struct PlotRecord {  // what SendInitData said about one new plot
    std::string type, name, title;
};

struct Child {
    int fd = -1;
    Api api;
    std::vector<PrintedLine> lines;  // bounded: see keep_line in sim/child.cpp
    bool lines_capped = false;
    std::vector<PlotRecord> records;
    bool unreadable = false;  // some vector could not be read out of ngspice
    bool exit_requested = false;
    bool exit_by_quit = false;
    int exit_status = 0;

    void send(const std::string& bytes) { send(bytes.data(), bytes.size()); }

    void send(const char* p, std::size_t left) {
        while (left > 0) {
            ssize_t n = ::write(fd, p, left);
            if (n < 0 && errno == EINTR) continue;
            if (n <= 0) _exit(exit_pipe_broken);
            p += n;
            left -= static_cast<std::size_t>(n);
        }
    }

    // Like send, for memory that stays unchanged until the process ends: the pipe takes
    // references to its pages instead of copies (vmsplice).
    void give(const char* p, std::size_t left) {
        while (left > 0) {
            iovec piece{const_cast<char*>(p), left};
            ssize_t n = ::vmsplice(fd, &piece, 1, 0);
            if (n < 0 && errno == EINTR) continue;
            if (n < 0 && errno == EINVAL) return send(p, left);  // not a pipe
            if (n <= 0) _exit(exit_pipe_broken);
            p += n;
            left -= static_cast<std::size_t>(n);
        }
    }

    [[noreturn]] void finish(SimStatus status, const std::string& message) {
        send(wire::result_frame(status, message));
        _exit(0);
    }

    [[noreturn]] void finish_exit_request() {
        std::string quoted = quote_problems(lines, 0, lines.size());
        if (quoted.empty() && exit_by_quit) {
            for (const PrintedLine& l : lines)
                if (l.text.find("quit") != std::string::npos) quoted = l.text;
        }
        if (quoted.empty()) quoted = fmt::format("ngspice asked to exit (status {})", exit_status);
        finish(SimStatus::controlled_exit, quoted);
    }

    // Runs one API call that may end in ControlledExit; after one, ngspice is unusable.
    template <typename F>
    void guarded(F&& call) {
        call();
        if (exit_requested) finish_exit_request();
    }
};

// One vector as ngspice holds it: its values are read in place when they are sent.
struct VectorView {
    std::string name;
    VectorKind kind = VectorKind::other;
    const ngcomplex_t* complex = nullptr;  // complex data, or
    const double* real = nullptr;          // real data (imaginary part 0), or neither (empty)
    std::uint32_t length = 0;
};

struct PlotView {
    std::string name, analysis;
    std::vector<VectorView> vectors;
};

static_assert(sizeof(ngcomplex_t) == 2 * sizeof(double), "ngspice's complex is two doubles");

// Every plot except "const", oldest first, its vectors located in ngspice's memory (they stay
// there: nothing runs in ngspice until they are sent).
std::vector<PlotView> find_plots(Child& child);

// Sends a plot frame and its vector frames; values go from ngspice's memory to the pipe.
// Complex values are handed over by reference (give): nothing in this process writes to
// them after the run, and the process ends after sending.
void send_plot(Child& child, const PlotView& plot);

}  // namespace deckscale::child_process
