// Helpers shared by the tests: file I/O in temporary directories, running the real binary,
// and rebuilding a file from the tokens the card reader hands out.
#pragma once

#include <sys/wait.h>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "deck/card_reader.hpp"

namespace deckscale::test {

namespace fs = std::filesystem;

inline std::string source_dir() { return DECKSCALE_SOURCE_DIR; }
inline std::string binary_path() { return DECKSCALE_BINARY; }

inline std::string read_bytes(const fs::path& path) {
    std::ifstream in(path, std::ios::binary);
    std::ostringstream s;
    s << in.rdbuf();
    return s.str();
}

inline void write_bytes(const fs::path& path, std::string_view text) {
    fs::create_directories(path.parent_path());
    std::ofstream out(path, std::ios::binary);
    out.write(text.data(), static_cast<std::streamsize>(text.size()));
}

// A fresh directory under the system temp dir, removed with everything in it at scope end.
class TempDir {
public:
    TempDir() {
        std::string tmpl = (fs::temp_directory_path() / "deckscale-test-XXXXXX").string();
        if (!::mkdtemp(tmpl.data())) throw std::runtime_error("mkdtemp failed");
        path_ = tmpl;
    }
    ~TempDir() {
        std::error_code ec;
        fs::remove_all(path_, ec);
    }
    TempDir(const TempDir&) = delete;
    TempDir& operator=(const TempDir&) = delete;
    const fs::path& path() const { return path_; }
    std::string file(const std::string& name) const { return (path_ / name).string(); }

private:
    fs::path path_;
};

// The command line of an independent ngspice referee run: batch mode, and -n so that no
// start-up file (./.spiceinit or ~/.spiceinit) can change the run; one test puts a hostile
// one in the home folder while others run.
inline std::string ngspice_batch() { return "ngspice -b -n "; }

inline std::string shell_quote(const std::string& s) {
    std::string out = "'";
    for (char c : s) {
        if (c == '\'')
            out += "'\\''";
        else
            out += c;
    }
    return out + "'";
}

struct RunResult {
    int exit_code = -1;
    std::string out;
    std::string err;
};

// Runs build/deckscale with `args` in `dir`, capturing standard output and error.
inline RunResult run_binary(const std::vector<std::string>& args, const fs::path& dir) {
    TempDir capture;
    std::string command = "cd " + shell_quote(dir.string()) + " && " + shell_quote(binary_path());
    for (const auto& a : args) command += " " + shell_quote(a);
    command += " >" + shell_quote(capture.file("out")) + " 2>" + shell_quote(capture.file("err"));
    int status = std::system(command.c_str());
    RunResult r;
    r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    r.out = read_bytes(capture.file("out"));
    r.err = read_bytes(capture.file("err"));
    return r;
}

// What the reader made of one file: the text rebuilt from its tokens, the kinds of its
// cards in order, and a description of the first token-layout fault ("" when none).
struct ReadBack {
    std::string rebuilt;
    std::vector<CardKind> kinds;
    std::string fault;
};

inline ReadBack read_back(const SourceFile& file, FileRole role) {
    ReadBack r;
    std::uint32_t expected = 0;
    read_cards(file, role, [&](const Card& c) {
        r.kinds.push_back(c.kind);
        if (c.tokens.empty() && r.fault.empty()) r.fault = "a card without tokens";
        std::size_t next_field = 0;
        for (const Token& t : c.tokens) {
            if (r.fault.empty() && t.begin != expected)
                r.fault = fmt::format("token at {} does not start where the last ended ({})",
                                      t.begin, expected);
            if (r.fault.empty() && t.end <= t.begin)
                r.fault = fmt::format("empty token at {}", t.begin);
            expected = t.end;
            r.rebuilt += c.text(t);
            if (is_field(t.kind)) {
                if (r.fault.empty() &&
                    (next_field >= c.fields.size() || c.fields[next_field].begin != t.begin))
                    r.fault = fmt::format("field list out of step at {}", t.begin);
                ++next_field;
            }
        }
        if (r.fault.empty() && next_field != c.fields.size())
            r.fault = "a card lists fields that are not among its tokens";
    });
    if (r.fault.empty() && expected != file.text().size())
        r.fault = fmt::format("tokens end at {}, the file at {}", expected, file.text().size());
    return r;
}

// Every deck file under netlists/, sorted. Top-level decks end in ".cir"; anything else
// (".lib", ".inc", ".mod") is an included file without a title line. netlists/corpus/ is
// left out: some of its decks are refused on purpose, and tests/cli/corpus_test.cpp checks
// each against its manifest.
inline std::vector<fs::path> netlist_files() {
    std::vector<fs::path> files;
    const fs::path root = fs::path(source_dir()) / "netlists";
    for (auto it = fs::recursive_directory_iterator(root); it != fs::recursive_directory_iterator();
         ++it) {
        if (it->is_directory() && it->path() == root / "corpus") {
            it.disable_recursion_pending();
            continue;
        }
        if (it->is_regular_file()) files.push_back(it->path());
    }
    std::sort(files.begin(), files.end());
    return files;
}

inline bool is_top_deck(const fs::path& p) { return p.extension() == ".cir"; }

}  // namespace deckscale::test
