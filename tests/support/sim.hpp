// Helpers shared by the simulator tests.
#pragma once

#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <chrono>
#include <string>
#include <vector>

#include "sim/simulate.hpp"

namespace deckscale::test {

// A job with a label, its cards and a generous deadline.
inline SimJob make_job(std::string label, std::vector<std::string> cards,
                       std::chrono::milliseconds timeout = std::chrono::seconds(20)) {
    SimJob job;
    job.label = std::move(label);
    job.cards = std::move(cards);
    job.timeout = timeout;
    return job;
}

// Every child has been reaped: no zombies left behind.
inline bool no_children_left() {
    errno = 0;
    return ::waitpid(-1, nullptr, WNOHANG) == -1 && errno == ECHILD;
}

// A private scratch directory, removed at the end of the test.
struct ScratchDir {
    std::filesystem::path path;
    ScratchDir() {
        std::string tmpl = (std::filesystem::temp_directory_path() / "sim-test-XXXXXX").string();
        path = ::mkdtemp(tmpl.data());
    }
    ~ScratchDir() { std::filesystem::remove_all(path); }
    ScratchDir(const ScratchDir&) = delete;
    ScratchDir& operator=(const ScratchDir&) = delete;
    void write(const std::string& name, const std::string& text) const {
        std::ofstream(path / name) << text;
    }
};

}  // namespace deckscale::test
