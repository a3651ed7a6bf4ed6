#include "write/data_files.hpp"

#include <fmt/format.h>

#include <array>
#include <string_view>

#include "base/text_util.hpp"
#include "write/time_column.hpp"

namespace deckscale {
namespace {

bool reads_data_file(std::string_view type, std::string_view key) {
    struct Param {
        std::string_view type, key;
    };
    static constexpr std::array<Param, 5> params = {{{"filesource", "file"},
                                                     {"d_source", "input_file"},
                                                     {"d_state", "state_file"},
                                                     {"table2d", "file"},
                                                     {"table3d", "file"}}};
    for (const auto& p : params)
        if (iequals(type, p.type) && iequals(key, p.key)) return true;
    return false;
}

bool absolute(std::string_view path) { return !path.empty() && path.front() == '/'; }

}  // namespace

std::vector<Diagnostic> data_files_left_behind(const Deck& deck, const std::string& original,
                                               const std::string& output, const FileSystem& fs,
                                               const std::vector<DataFileCopy>& copies) {
    std::vector<Diagnostic> notes;
    if (output.empty()) return notes;
    std::string from = directory_of(original), to = directory_of(output);
    if (fs.identity(from.empty() ? "." : from) == fs.identity(to.empty() ? "." : to))
        return notes;
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            const auto& x = c.fields;
            if (c.kind != CardKind::dot || x.size() < 3 || !iequals(c.field_text(0), ".model"))
                return;
            std::string_view type = c.field_text(2);
            for (std::size_t i = 3; i + 2 < x.size(); ++i) {
                if (x[i].kind != TokenKind::word || x[i + 1].kind != TokenKind::equals ||
                    !reads_data_file(type, c.field_text(i)))
                    continue;
                bool copied = false;
                for (const auto& copy : copies)
                    copied = copied || (copy.file == f && copy.offset == x[i + 2].begin);
                if (copied) continue;
                std::string_view value = c.field_text(i + 2);
                if (x[i + 2].kind == TokenKind::dquote && value.size() >= 2)
                    value = value.substr(1, value.size() - 2);
                std::string path(value);
                if (path.empty() || absolute(path)) continue;
                if (!fs.read(join_path(from, path)) || fs.read(join_path(to, path))) continue;
                notes.push_back(c.file->diagnose(
                    Severity::note, x[i + 2].begin, x[i + 2].size(),
                    fmt::format("model '{}' reads '{}' from the folder ngspice runs in; it is "
                                "beside the original but not beside the output in '{}': copy "
                                "it there as it is (the model's parameters carry the factors), "
                                "or the scaled deck will not find it",
                                c.field_text(1), path, to.empty() ? "." : to)));
            }
        });
    return notes;
}

std::vector<OutputFile> data_file_outputs(const Deck& deck, const std::vector<DataFileCopy>& copies,
                                          const std::string& output, const FileSystem& fs,
                                          int digits) {
    std::vector<OutputFile> files;
    std::vector<const DataFileCopy*> written;
    const std::string from = directory_of(deck.top().path());
    for (const auto& copy : copies) {
        const SourceFile& card = *deck.files[copy.file].source;
        auto fail = [&](const std::string& why) {
            throw DeckError(card.diagnose(Severity::error, copy.offset, copy.size, why));
        };
        if (output.empty())
            fail(fmt::format("the scaled deck reads '{}', a rewritten copy of '{}' (its times x "
                             "1/Kf), which is written beside the output deck: give an output "
                             "file (-o), not standard output",
                             copy.copy, copy.path));
        bool same = false;
        for (const DataFileCopy* w : written) {
            if (w->copy != copy.copy) continue;
            if (w->path != copy.path || w->time_factor != copy.time_factor)
                fail(fmt::format("'{}' and '{}' would both be rewritten as '{}' beside the output "
                                 "deck: give the data files different names",
                                 w->path, copy.path, copy.copy));
            same = true;
        }
        if (same) continue;
        written.push_back(&copy);
        std::string source = join_path(from, copy.path);
        std::string problem;
        auto text = fs.read(source, &problem);
        if (!text)
            fail(fmt::format("cannot read '{}' ({}; looked for from the folder of {}, where "
                             "ngspice runs): its times must be rewritten for the scaled deck",
                             copy.path, problem.empty() ? "not found" : problem,
                             deck.top().path()));
        std::string why;
        auto scaled = scale_time_column(text->bytes, copy.time_factor, digits, why);
        if (!scaled) fail(fmt::format("cannot rewrite the times of '{}': {}", copy.path, why));
        OutputFile f;
        f.path = join_path(directory_of(output), copy.copy);
        f.origin = source;
        f.content = std::move(*scaled);
        files.push_back(std::move(f));
    }
    return files;
}

void add_data_files(OutputPlan& plan, std::vector<OutputFile> files) {
    auto main = plan.files.empty() ? plan.files.end() : plan.files.end() - 1;
    plan.files.insert(main, std::make_move_iterator(files.begin()),
                      std::make_move_iterator(files.end()));
}

}  // namespace deckscale
