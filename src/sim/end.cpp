#include "sim/end.hpp"

#include <fmt/format.h>
#include <sys/wait.h>

#include <algorithm>
#include <cstring>
#include <string_view>

namespace deckscale {
namespace {

std::string last_words(const SimOutcome& out) {
    if (out.log.empty()) return "";
    std::string_view last = out.log.back();
    last.remove_prefix(std::min(last.size(), last.find_first_not_of(' ')));
    return fmt::format("; its last line was: {}", last);
}

}  // namespace

SimOutcome judge_child(const std::string& label, std::chrono::milliseconds timeout,
                       wire::StreamState state, SimOutcome out, ChildEnd end) {
    const std::string named = label.empty() ? "the deck" : label;
    if (state == wire::StreamState::complete && end.kind != ChildEnd::Kind::timed_out) return out;
    out.plots.clear();
    if (end.kind == ChildEnd::Kind::timed_out) {
        out.status = SimStatus::timed_out;
        out.message = fmt::format("{} did not finish within {} ms and was stopped{}", named,
                                  timeout.count(), last_words(out));
    } else if (end.kind == ChildEnd::Kind::exited && WIFSIGNALED(end.wait_status)) {
        int sig = WTERMSIG(end.wait_status);
        out.status = SimStatus::crashed;
        out.message = fmt::format("the simulator process for {} died from signal {} ({}){}", named,
                                  sig, ::strsignal(sig), last_words(out));
    } else {
        int code = end.kind == ChildEnd::Kind::exited && WIFEXITED(end.wait_status)
                       ? WEXITSTATUS(end.wait_status)
                       : -1;
        out.status = SimStatus::crashed;
        out.message = fmt::format(
            "the simulator process for {} exited (code {}) with {} result data{}", named, code,
            state == wire::StreamState::garbled ? "garbled" : "incomplete", last_words(out));
    }
    return out;
}

}  // namespace deckscale
