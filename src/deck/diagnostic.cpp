#include "deck/diagnostic.hpp"

#include <fmt/format.h>

namespace deckscale {
namespace {

const char* severity_word(Severity s) {
    switch (s) {
        case Severity::note: return "note";
        case Severity::warning: return "warning";
        case Severity::error: return "error";
    }
    return "error";
}

void render_into(std::string& out, const Diagnostic& d) {
    if (!d.file.empty()) {
        out += d.file;
        if (d.line > 0) {
            out += fmt::format(":{}", d.line);
            if (d.column > 0) out += fmt::format(":{}", d.column);
        }
        out += ": ";
    }
    out += fmt::format("{}: {}\n", severity_word(d.severity), d.message);
    if (d.line > 0 && d.column > 0) {
        out += "  ";
        out += d.source_line;
        out += "\n  ";
        // Keep tabs so the caret lines up under tab-indented source text.
        std::uint32_t caret = d.caret_column ? d.caret_column : d.column;
        for (std::uint32_t i = 0; i + 1 < caret && i < d.source_line.size(); ++i)
            out += d.source_line[i] == '\t' ? '\t' : ' ';
        out += '^';
        for (std::uint32_t i = 1; i < d.length; ++i) out += '~';
        out += '\n';
    }
    for (const auto& n : d.notes) render_into(out, n);
}

}  // namespace

std::string render(const Diagnostic& d) {
    std::string out;
    render_into(out, d);
    return out;
}

std::string render(const std::vector<Diagnostic>& ds) {
    std::string out;
    for (const auto& d : ds) render_into(out, d);
    return out;
}

}  // namespace deckscale
