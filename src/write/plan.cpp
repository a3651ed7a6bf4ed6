#include "write/plan.hpp"

#include <filesystem>
#include <set>
#include <thread>

#include <fmt/format.h>

#include "write/flatten.hpp"

namespace deckscale {

namespace fs = std::filesystem;

// Files at least this big are produced by two threads.
constexpr std::uint32_t kParallelOutputBytes = 8u << 20;

std::string scaled_copy_name(const std::string& original_path, std::string_view suffix) {
    fs::path p(original_path);
    return p.stem().string() + std::string(suffix) + p.extension().string();
}

namespace {

std::string quoted_like(std::string_view original, const std::string& path) {
    if (!original.empty() && (original.front() == '"' || original.front() == '\''))
        return original.front() + path + original.front();
    return path;
}

}  // namespace

void produce_output(const Deck& deck, const OutputPlan& plan, const OutputFile& file,
                    ByteSink& sink) {
    if (file.flattened || !file.origin.empty()) {
        sink.write(file.content);
        return;
    }
    std::string_view text = deck.files[file.source_file].source->text();
    const EditSet& edits = plan.edits[file.source_file];
    auto size = static_cast<std::uint32_t>(text.size());
    if (!plan.parallel || size < kParallelOutputBytes || edits.size() < 2) {
        apply_edits(text, edits, 0, size, sink);
        return;
    }
    // A large file: its second half (from an edit in the middle on) is produced into memory on
    // a second thread while this one produces and writes the first half.
    std::uint32_t mid = edits.at(edits.size() / 2).offset;
    std::size_t second_size = size - mid;
    edits.visit_from(mid, [&](const EditView& e) {
        second_size = second_size + e.text.size() - e.length;
        return true;
    });
    MemorySink second(second_size);
    std::jthread producer([&] { apply_edits(text, edits, mid, size, second); });
    apply_edits(text, edits, 0, mid, sink);
    producer.join();
    sink.write(second.bytes());
}

OutputPlan plan_output(const Deck& deck, std::vector<EditSet> edits_in, const std::string& output,
                       bool flatten, std::string_view copy_suffix) {
    OutputPlan plan;
    plan.edits = std::move(edits_in);
    std::vector<EditSet>& edits = plan.edits;
    std::size_t n = deck.files.size();
    if (flatten) {
        plan.files.push_back({output, 0, true, flatten_deck(deck, edits), ""});
        return plan;
    }
    // A file is copied if it changed or if it includes a file that is copied.
    std::vector<bool> copied(n, false);
    for (std::size_t i = 1; i < n; ++i) copied[i] = !edits[i].empty();
    for (bool again = true; again;) {
        again = false;
        for (const auto& inc : deck.includes)
            if (inc.from_file != 0 && copied[inc.target_file] && !copied[inc.from_file])
                copied[inc.from_file] = again = true;
    }
    bool any_copy = false;
    for (std::size_t i = 1; i < n; ++i) any_copy = any_copy || copied[i];
    if (output.empty()) {
        if (any_copy) {
            for (const auto& inc : deck.includes)
                if (copied[inc.target_file]) {
                    const auto& from = *deck.files[inc.from_file].source;
                    throw DeckError(from.diagnose(
                        Severity::error, inc.path_token.begin, inc.path_token.size(),
                        "this included file needs rescaling too: give -o OUT (a scaled copy is "
                        "written beside it) or --flatten"));
                }
        }
        plan.files.push_back({"", 0, false, {}, ""});
        return plan;
    }
    fs::path out_dir = fs::absolute(fs::path(output)).parent_path();
    std::vector<std::string> new_path(n);
    std::set<std::string> taken{fs::absolute(output).lexically_normal().string()};
    for (std::size_t i = 0; i < n; ++i)
        taken.insert(fs::absolute(deck.files[i].source->path()).lexically_normal().string());
    for (std::size_t i = 1; i < n; ++i) {
        if (!copied[i]) continue;
        std::string name = scaled_copy_name(deck.files[i].source->path(), copy_suffix);
        fs::path candidate = out_dir / name;
        for (int k = 2; taken.count(candidate.lexically_normal().string()); ++k)
            candidate = out_dir / (fs::path(name).stem().string() + fmt::format("-{}", k) +
                                   fs::path(name).extension().string());
        taken.insert(candidate.lexically_normal().string());
        new_path[i] = candidate.string();
    }
    // Repoint include lines of every written file so they resolve from the output folder.
    for (const auto& inc : deck.includes) {
        if (inc.from_file != 0 && !copied[inc.from_file]) continue;
        std::string target;
        if (copied[inc.target_file]) {
            target = fs::path(new_path[inc.target_file]).filename().string();
        } else {
            fs::path abs = fs::absolute(deck.files[inc.target_file].source->path()).lexically_normal();
            fs::path rel = abs.lexically_relative(out_dir);
            target = rel.empty() ? abs.string() : rel.string();
        }
        const SourceFile& from = *deck.files[inc.from_file].source;
        std::string_view old = from.view(inc.path_token.begin, inc.path_token.end);
        std::string text = quoted_like(old, target);
        edits[inc.from_file].add(from.text(), Edit{inc.path_token.begin, inc.path_token.size(), text});
    }
    for (std::size_t i = 1; i < n; ++i)
        if (copied[i]) plan.files.push_back({new_path[i], i, false, {}, ""});
    plan.files.push_back({output, 0, false, {}, ""});
    return plan;
}

}  // namespace deckscale
