#include "cli/batch_command.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <filesystem>
#include <iostream>

#include "base/output_file.hpp"
#include "batch/junit.hpp"
#include "batch/report.hpp"
#include "batch/shard.hpp"
#include "batch/summary.hpp"
#include "batch/workers.hpp"
#include "cli/exit_codes.hpp"
#include "deck/diagnostic.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

std::string missing_folder(const std::string& path) {
    if (path.empty()) return "";
    fs::path dir = fs::absolute(path).parent_path();
    std::error_code ec;
    if (fs::is_directory(dir, ec)) return "";
    return fmt::format("cannot write '{}': the folder '{}' does not exist", path, dir.string());
}

// Writes the requested reports (all or none) and the summary; returns the exit code.
int finish(const BatchOptions& o, const BatchReport& report, std::ostream& out, std::ostream& err) {
    OutputBatch files;
    for (auto [path, text] : {std::pair{o.junit, &junit_xml}, std::pair{o.json, &batch_json}}) {
        if (path.empty()) continue;
        if (auto e = files.add(path, text(report)); !e.empty()) {
            err << "deckscale: error: " << e << "\n";
            return exit_bad_input;
        }
    }
    if (auto e = files.commit(); !e.empty()) {
        err << "deckscale: error: " << e << "\n";
        return exit_bad_input;
    }
    out << summary_text(report);
    bool made_decks = false;
    for (const auto& c : report.cases) made_decks = made_decks || c.scaled.empty();
    if (made_decks && report.unmet() < report.cases.size())
        err << "deckscale: caution: a verified scaled deck holds ideal values. Before building, "
               "choose\n"
               "  real parts and check their power, voltage and current ratings at the new "
               "impedance\n"
               "  level; for mains-connected or high-voltage circuits, local codes and licensed\n"
               "  practice govern.\n";
    if (report.survey) return exit_ok;
    return report.unmet() == 0 ? exit_ok : exit_not_equivalent;
}

int merge(const BatchOptions& o, std::ostream& out, std::ostream& err) {
    std::vector<BatchReport> shards;
    DiskFileSystem disk;
    for (const auto& path : o.inputs) {
        std::string problem;
        auto text = disk.read(path, &problem);
        if (!text) {
            err << fmt::format("deckscale: error: cannot read '{}': {}\n", path, problem);
            return exit_bad_input;
        }
        try {
            shards.push_back(batch_from_json(std::string(text->bytes)));
        } catch (const std::exception& e) {
            err << fmt::format("deckscale: error: {}: {}\n", path, e.what());
            return exit_bad_input;
        }
    }
    try {
        return finish(o, merge_reports(shards), out, err);
    } catch (const std::exception& e) {
        err << "deckscale: error: " << e.what() << "\n";
        return exit_bad_input;
    }
}

std::string clock_text(double s) {
    auto t = static_cast<long>(s);
    return fmt::format("{}:{:02}", t / 60, t % 60);
}

}  // namespace

int run_batch(const BatchOptions& o, std::ostream& out, std::ostream& err) {
    for (const std::string& path : {o.junit, o.json})
        if (auto e = missing_folder(path); !e.empty()) {
            err << "deckscale: error: " << e << "\n";
            return exit_bad_input;
        }
    if (o.merge) return merge(o, out, err);
    const std::string& input = o.inputs.front();
    Suite suite;
    try {
        std::error_code ec;
        if (fs::is_directory(input, ec)) {
            suite = survey_suite(input, FactorTarget{o.km, o.kf, o.km_text, o.kf_text, {}});
        } else {
            DiskFileSystem disk;
            suite = load_suite(input, disk);
        }
    } catch (const DeckError& e) {
        err << render(e.diagnostic());
        return exit_bad_input;
    }
    BatchReport report;
    report.suite = input;
    report.name = suite.name;
    report.survey = suite.survey;
    report.shard = {o.shard_k, o.shard_n};
    report.suite_cases = suite.cases.size();
    std::vector<SuiteCase> cases = shard_cases(suite.cases, report.shard);

    // A progress line only on a terminal, rewritten in place and cleared at the end.
    bool terminal = &err == &std::cerr && ::isatty(STDERR_FILENO);
    WorkerSettings settings;
    settings.workers = o.jobs;
    if (terminal)
        settings.progress = [&](const BatchProgress& p) {
            err << fmt::format("\r\033[K{}/{} case(s) done, {} unexpected, {} elapsed", p.done,
                               p.total, p.unmet, clock_text(p.elapsed_s))
                << std::flush;
        };
    auto start = std::chrono::steady_clock::now();
    report.cases = run_cases(cases, settings);
    report.seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    if (terminal) err << "\r\033[K" << std::flush;
    return finish(o, report, out, err);
}

}  // namespace deckscale
