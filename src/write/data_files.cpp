#include "write/data_files.hpp"

#include <fmt/format.h>

#include <array>
#include <string_view>

#include "base/text_util.hpp"

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
                                               const std::string& output,
                                               const FileSystem& fs) {
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

}  // namespace deckscale
