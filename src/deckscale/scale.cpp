#include "deckscale/scale.hpp"

#include <fmt/format.h>

#include <cmath>
#include <filesystem>

#include "base/byte_sink.hpp"
#include "base/output_file.hpp"
#include "deckscale/internal.hpp"
#include "scale/cautions.hpp"
#include "scale/change_report.hpp"
#include "scale/rescale.hpp"
#include "write/data_files.hpp"

namespace deckscale::api {
namespace {

namespace fs = std::filesystem;

ScaleSettings settings_of(const ScaleOptions& o) {
    for (auto [name, k] : {std::pair{"Km", o.km}, std::pair{"Kf", o.kf}})
        if (!std::isfinite(k) || !(k > 0))
            throw request_error(fmt::format("{} must be finite and positive, got {}", name, k));
    if (o.digits < 3 || o.digits > 17)
        throw request_error(fmt::format("digits must be 3 ... 17, got {}", o.digits));
    ScaleSettings s;
    s.factors = {o.km, o.kf};
    s.digits = o.digits;
    s.mark_unscalable = o.leave_unscalable;
    s.record_changes = true;
    s.threads = o.threads;
    return s;
}

// What the scale command would write for this run, as data (cli/scale_command.cpp writes the
// same plan's files).
Scaled outputs(Deck original, ScaleResult& result, const ScaleOptions& o) {
    const deckscale::Deck& deck = original.impl().deck;
    Scaled s;
    s.options = o;
    s.warnings = deck.warnings;
    s.notes = result.notes;
    s.refusals = result.unscalable;
    for (const auto& c : result.changes) {
        const SourceFile& f = *deck.files[c.file].source;
        auto pos = f.position(c.offset);
        s.changes.push_back({f.path(), pos.line, pos.column, c.element, c.field, c.unit, c.old_text,
                             c.new_text, c.factor});
    }
    s.changes_text = change_list_text(deck, result);
    s.cautions = scale_cautions({o.km, o.kf}, !result.held.empty(), result.semiconductors_scaled);
    if (s.refusals.empty() || o.leave_unscalable) {
        OutputPlan plan = plan_output(deck, std::move(result.edits), o.output, o.flatten);
        plan.parallel = o.threads != 1;
        add_data_files(plan, data_file_outputs(deck, result.data_files, o.output,
                                               OverlayFileSystem(original.impl().memory),
                                               o.digits));
        s.files = output_texts(deck, plan);
        s.changes_json = change_list_json(deck, result, {o.km, o.kf}, plan);
    } else {
        s.changes_json = change_list_json(deck, result, {o.km, o.kf}, OutputPlan{});
    }
    s.original = std::move(original);
    return s;
}

void refuse_if_refused(const Scaled& s) {
    if (s.refused())
        throw request_error(fmt::format(
            "{} item(s) cannot be scaled exactly; nothing to write (leave_unscalable writes the "
            "deck anyway, marking each item)",
            s.refusals.size()));
}

}  // namespace

std::vector<OutputText> output_texts(const deckscale::Deck& deck, const OutputPlan& plan) {
    std::vector<OutputText> files;
    for (const auto& f : plan.files) {
        std::string text;
        StringSink sink(text);
        produce_output(deck, plan, f, sink);
        sink.flush();
        files.push_back({f.path,
                         f.origin.empty() ? deck.files[f.source_file].source->path() : f.origin,
                         std::move(text)});
    }
    return files;
}

Scaled scale(const Deck& deck, const ScaleOptions& options) {
    ScaleSettings settings = settings_of(options);
    ScaleResult result = scale_deck(deck.impl().deck, settings);
    return outputs(deck, result, options);
}

Scaled scale_file(const std::string& path, const ScaleOptions& options) {
    ScaleSettings settings = settings_of(options);
    DiskFileSystem disk;
    ScaledDeck scaled = load_and_scale(path, disk, settings);
    auto impl = std::make_shared<Deck::Impl>();
    impl->deck = std::move(scaled.deck);
    return outputs(Deck(std::move(impl)), scaled.result, options);
}

Deck scaled_deck(const Scaled& s) {
    refuse_if_refused(s);
    const Deck& original = *s.original;
    MemoryFiles memory = original.impl().memory;
    std::string main = s.files.back().path;
    if (main.empty()) {
        fs::path from(original.path());
        main = (from.parent_path() / scaled_copy_name(original.path())).string();
    }
    for (const auto& f : s.files) memory[memory_key(f.path.empty() ? main : f.path)] = f.text;
    return load_with(main, std::move(memory));
}

void write(const Scaled& s) {
    refuse_if_refused(s);
    std::vector<std::string> inputs;
    for (const auto& path : s.original->files()) inputs.push_back(memory_key(path));
    for (const auto& f : s.files) {
        if (f.path.empty())
            throw request_error("no output path: set the output (ScaleOptions::output) to write");
        std::error_code ec;
        for (const auto& in : inputs)
            if (memory_key(f.path) == in || fs::equivalent(f.path, in, ec))
                throw request_error(fmt::format(
                    "'{}' is a file the deck was read from; the library never overwrites one",
                    f.path));
    }
    OutputBatch batch;
    for (const auto& f : s.files)
        if (auto e = batch.add(f.path, f.text); !e.empty()) throw request_error(e);
    if (auto e = batch.commit(); !e.empty()) throw request_error(e);
}

}  // namespace deckscale::api
