// The simulator child: one job in a fresh process, libngspice loaded with dlopen.
#include "sim/child.hpp"

#include <dlfcn.h>
#include <fcntl.h>
#include <fmt/format.h>
#include <ngspice/sharedspice.h>
#include <signal.h>
#include <sys/prctl.h>
#include <sys/resource.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <clocale>
#include <cstdint>
#include <cstdlib>
#include <cstring>
#include <exception>
#include <optional>
#include <string>
#include <vector>

#include "sim/child_state.hpp"
#include "sim/code_models.hpp"
#include "sim/job_wire.hpp"
#include "sim/process.hpp"
#include "sim/verdict.hpp"
#include "sim/wire.hpp"

namespace deckscale {
namespace {

using namespace child_process;


constexpr const char* library_name = "libngspice.so.0";
constexpr const char* no_home = "/nonexistent/deckscale-no-home";
// Heap mapped ahead for ngspice (prefault_heap): its initialisation and a small run (the
// bench's 1000-point AC pair) allocate about this much. Page faults of a verify of that pair,
// both children and the parent: 958 -> 772.
constexpr std::size_t child_heap = 448 << 10;


// What ngspice prints is kept and sent up to kAllLines lines; after that only error lines and
// substitution warnings (what a verdict quotes), up to kProblemLines more: a deck that prints
// megabytes of warnings cannot exhaust memory here or in the parent.
constexpr std::size_t kAllLines = 10000;
constexpr std::size_t kProblemLines = 10000;

bool keep_line(Child& child, const PrintedLine& line) {
    if (child.lines.size() < kAllLines) return true;
    if (!child.lines_capped) {
        child.lines_capped = true;
        PrintedLine note{fmt::format("[deckscale: ngspice printed more than {} lines; only error "
                                     "lines and substitution warnings are kept from here]",
                                     kAllLines),
                         false};
        if (child.fd >= 0) child.send(wire::log_frame(note.text));
        child.lines.push_back(std::move(note));
    }
    return child.lines.size() < kAllLines + 1 + kProblemLines &&
           (is_error_line(line.text) || is_substitution_warning(line.text));
}

int on_char(char* s, int, void* user) {
    auto* child = static_cast<Child*>(user);
    try {
        PrintedLine line = strip_channel(s ? s : "");
        if (!keep_line(*child, line)) return 0;
        if (child->fd >= 0) child->send(wire::log_frame(line.text));  // a template only records
        child->lines.push_back(std::move(line));
    } catch (...) {
        _exit(exit_internal);
    }
    return 0;
}

int on_exit_request(int status, NG_BOOL, NG_BOOL quit, int, void* user) {
    auto* child = static_cast<Child*>(user);
    child->exit_requested = true;
    child->exit_by_quit = quit;
    child->exit_status = status;
    return 0;
}

int on_init_data(pvecinfoall info, int, void* user) {
    auto* child = static_cast<Child*>(user);
    try {
        if (info) {
            child->records.push_back({info->type ? info->type : "", info->name ? info->name : "",
                                      info->title ? info->title : ""});
        }
    } catch (...) {
        _exit(exit_internal);
    }
    return 0;
}

template <typename T>
bool resolve(void* lib, const char* name, T& out) {
    out = reinterpret_cast<T>(::dlsym(lib, name));
    return out != nullptr;
}


// Loads libngspice, in the environment and locale the children run in, and finds its
// functions. Returns why it failed, or nothing.
std::optional<std::string> load_ngspice(Child& child) {
    // A scrubbed environment: ngspice reads SPICE_* and NGSPICE_* variables (library and
    // script folders, raw-file format, measure precision...) and the user's settings must not
    // change a verification. Only what the simulation needs is set again.
    ::clearenv();
    ::setenv("PATH", "/usr/bin:/bin", 1);
    ::setenv("HOME", no_home, 1);
    ::setenv("OMP_NUM_THREADS", "1", 1);  // parallel children, not parallel threads
    ::setenv("OMP_WAIT_POLICY", "passive", 1);  // an OpenMP thread that waits, sleeps
    // Digits of the .meas results ngspice prints that honour it (INTEG, PARAM; most print 7).
    ::setenv("NGSPICE_MEAS_PRECISION", "15", 1);
    std::setlocale(LC_ALL, "C");
    void* lib = ::dlopen(library_name, RTLD_NOW | RTLD_LOCAL);
    if (!lib) {
        const char* why = ::dlerror();
        return fmt::format("cannot load {}: {}", library_name, why ? why : "unknown reason");
    }
    Api& api = child.api;
    if (!resolve(lib, "ngSpice_Init", api.init) || !resolve(lib, "ngSpice_Circ", api.circ) ||
        !resolve(lib, "ngSpice_Command", api.command) ||
        !resolve(lib, "ngGet_Vec_Info", api.vec_info) ||
        !resolve(lib, "ngSpice_AllPlots", api.all_plots) ||
        !resolve(lib, "ngSpice_AllVecs", api.all_vecs)) {
        return fmt::format("{} lacks a function this program needs", library_name);
    }
    return std::nullopt;
}

// Initialises the loaded ngspice in a private start directory (see make_start_dir), then
// returns to the directory it was called in. Without `code_models` ngspice reads an init
// script that loads none. A ControlledExit during initialisation is left in
// child.exit_requested.
void init_ngspice(Child& child, bool code_models) {
    int call_dir = ::open(".", O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    std::string script = code_models ? "" : spinit_without_code_models();
    std::string start_dir = make_start_dir(script);
    // ngspice 39 reads spinit from the one directory SPICE_SCRIPTS names (the start directory,
    // which also replaces the scripts directory on its source path; decks reach ngspice with
    // their includes inlined).
    if (!script.empty() && !start_dir.empty()) ::setenv("SPICE_SCRIPTS", start_dir.c_str(), 1);
    if (call_dir < 0 || ::chdir(start_dir.empty() ? "/" : start_dir.c_str()) != 0)
        _exit(exit_setup_failed);
    Api& api = child.api;
    api.init(on_char, nullptr, on_exit_request, nullptr, on_init_data, nullptr, &child);
    remove_start_dir(start_dir);
    if (::fchdir(call_dir) != 0) _exit(exit_setup_failed);
    ::close(call_dir);
}


// Loads and runs the job's cards in an initialised ngspice whose current directory is the
// deck's, and reports.
// AddressSanitizer's shadow memory takes terabytes of address space, so under it RLIMIT_AS
// would make every later mapping fail: a sanitized build (scripts/test-sanitized) runs its
// simulations without the memory limit.
#if defined(__SANITIZE_ADDRESS__)
constexpr bool kAddressSpaceLimits = false;
#else
constexpr bool kAddressSpaceLimits = true;
#endif

[[noreturn]] void run_job(Child& child, const SimJob& job) {
    if (kAddressSpaceLimits && job.memory_limit_mb > 0) {
        rlim_t bytes = static_cast<rlim_t>(job.memory_limit_mb) << 20;
        struct rlimit limit {bytes, bytes};
        if (::setrlimit(RLIMIT_AS, &limit) != 0)
            child.finish(SimStatus::load_failed, fmt::format("cannot set the memory limit: {}",
                                                             std::strerror(errno)));
    }
    char unset_dialect[] = "unset ngbehavior";  // a .spiceinit may have set one
    child.guarded([&] { child.api.command(unset_dialect); });
    // ngspice runs its BSIM device loads on OpenMP threads, num_threads of them (2 unless
    // spinit says otherwise), whose barriers spin: two children of two threads each on two
    // cores took 0.1 s to 43 s for one BSIM3 inverter verification (the same 2315 points every
    // time). One thread per child; the children are the parallelism.
    char one_thread[] = "set num_threads=1";
    child.guarded([&] { child.api.command(one_thread); });
    // ngspice skips empty entries, so a blank title would silently make the first card
    // the title; it is replaced by a word (the title is not simulated).
    std::vector<std::string> cards = job.cards;
    if (cards.empty()) child.finish(SimStatus::load_failed, "no cards to simulate");
    if (cards[0].find_first_not_of(" \t\r") == std::string::npos) cards[0] = "untitled";
    std::vector<char*> argv;
    for (std::string& c : cards) argv.push_back(c.data());
    argv.push_back(nullptr);

    std::size_t load_begin = child.lines.size();
    child.guarded([&] { child.api.circ(argv.data()); });
    std::size_t load_end = child.lines.size();
    if (any_problem(child.lines, load_begin, load_end, true))
        child.finish(SimStatus::load_failed, quote_problems(child.lines, load_begin, load_end));

    char run_command[] = "run";
    child.guarded([&] { child.api.command(run_command); });
    std::size_t run_end = child.lines.size();
    if (any_problem(child.lines, load_end, run_end, false))  // e.g. "set to 1 mOhm" at setup
        child.finish(SimStatus::load_failed, quote_problems(child.lines, load_end, run_end));
    bool run_failed = any_problem(child.lines, load_end, run_end, true);
    std::string why = run_failed ? quote_problems(child.lines, load_end, run_end) : "";

    std::string title = expected_title(cards);
    for (const PlotRecord& r : child.records) {
        if (!same_title(title, r.title)) {
            child.finish(SimStatus::load_failed,
                         fmt::format("plot {} comes from a circuit titled '{}', not from this deck",
                                     r.type, r.title));
        }
    }
    std::vector<PlotView> plots = find_plots(child);
    if (child.unreadable) {
        run_failed = true;
        std::string lost = quote_problems(child.lines, run_end, child.lines.size());
        why += fmt::format("{}{}", why.empty() ? "" : "\n",
                           lost.empty() ? "a vector could not be read" : lost);
    }
    if (plots.empty() || child.records.empty()) {
        if (!run_failed) why = quote_problems(child.lines, load_end, run_end);
        if (!why.empty()) why += '\n';
        child.finish(SimStatus::run_failed, why + "the run produced no plot");
    }
    for (const PlotView& p : plots) send_plot(child, p);
    child.finish(run_failed ? SimStatus::run_failed : SimStatus::ok, why);
}

// A fresh child (direct or head-started) initialises ngspice itself; `load_failed` says why
// libngspice could not be loaded. The deck's directory is checked first; ngspice is
// initialised elsewhere (init_ngspice).
[[noreturn]] void run(Child& child, const SimJob& job,
                      const std::optional<std::string>& load_failed) {
    if (!job.work_dir.empty() && ::chdir(job.work_dir.c_str()) != 0) {
        child.finish(SimStatus::load_failed, fmt::format("cannot enter directory {}: {}",
                                                         job.work_dir, std::strerror(errno)));
    }
    if (load_failed) child.finish(SimStatus::load_failed, *load_failed);
    init_ngspice(child, needs_code_models(job.cards));
    if (child.exit_requested) child.finish_exit_request();
    run_job(child, job);
}

}  // namespace

void run_child(const SimJob& job, int fd) noexcept {
    Child child;
    child.fd = take_over_process(fd);
    prefault_heap(child_heap);
    try {
        run(child, job, load_ngspice(child));
    } catch (const std::exception& e) {
        child.finish(SimStatus::crashed, fmt::format("simulator process failed: {}", e.what()));
    } catch (...) {
        _exit(exit_internal);
    }
}

void run_early_child(int fd, int job_fd) noexcept {
    Child child;
    child.fd = take_over_process(fd, job_fd);
    prefault_heap(child_heap);
    try {
        std::optional<std::string> load_failed = load_ngspice(child);
        std::optional<std::string> message = read_to_end(4);
        std::optional<SimJob> job = message ? wire::read_job_message(*message) : std::nullopt;
        if (!job) _exit(0);  // never given a job (the parent says why, if it needs to)
        ::close(4);
        run(child, *job, load_failed);
    } catch (const std::exception& e) {
        child.finish(SimStatus::crashed, fmt::format("simulator process failed: {}", e.what()));
    } catch (...) {
        _exit(exit_internal);
    }
}

// ---- The template path: ngspice is initialised once, each job runs in a clone of it.
namespace {
Child the_template;  // the callbacks' user pointer: at the same address in every clone
}  // namespace

int prepare_template(int keep_fd, bool code_models) noexcept {
    try {
        int fd = take_over_process(keep_fd);
        the_template.fd = -1;  // no job yet: what ngspice prints is only recorded
        if (load_ngspice(the_template)) return -1;
        init_ngspice(the_template, code_models);
        if (the_template.exit_requested) return -1;
        return fd;
    } catch (...) {
        return -1;
    }
}

void run_cloned_child(const SimJob& job, int fd) noexcept {
    Child& child = the_template;
    // The pipe becomes fd 3; the template's socket and anything else it holds are closed.
    if (fd != 3 && ::dup2(fd, 3) < 0) _exit(exit_setup_failed);
    if (::close_range(4, ~0U, 0) != 0) {
        for (int i = 4; i < 4096; ++i) ::close(i);
    }
    child.fd = 3;
    ::prctl(PR_SET_PDEATHSIG, SIGKILL);  // not inherited across a clone
    ::setpgid(0, 0);
    try {
        if (!job.work_dir.empty() && ::chdir(job.work_dir.c_str()) != 0) {
            child.finish(SimStatus::load_failed, fmt::format("cannot enter directory {}: {}",
                                                             job.work_dir, std::strerror(errno)));
        }
        // What ngspice printed while the template was initialised, as a direct child sends it.
        for (const PrintedLine& line : child.lines) child.send(wire::log_frame(line.text));
        run_job(child, job);
    } catch (const std::exception& e) {
        child.finish(SimStatus::crashed, fmt::format("simulator process failed: {}", e.what()));
    } catch (...) {
        _exit(exit_internal);
    }
}

}  // namespace deckscale
