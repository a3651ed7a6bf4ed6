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

// The message with every quoted word (no blank inside: an apostrophe such as "ngspice's"
// never pairs with a real quote across words) longer than kLongQuote shortened to its start
// and end: a 100 MB word quoted in a message must not reach the terminal whole.
constexpr std::size_t kLongQuote = 80;
void append_message(std::string& out, const std::string& message) {
    std::size_t i = 0;
    while (i < message.size()) {
        std::size_t open = message.find('\'', i);
        std::size_t close = open == std::string::npos ? open : message.find('\'', open + 1);
        if (close == std::string::npos) break;
        std::size_t inner = close - open - 1;
        if (inner > kLongQuote &&
            message.find_first_of(" \t", open + 1) > close) {
            out.append(message, i, open + 1 + 40 - i);
            out += fmt::format("...({} bytes)...", inner);
            out.append(message, close - 20, 21);
        } else {
            out.append(message, i, close + 1 - i);
        }
        i = close + 1;
    }
    if (i < message.size()) out.append(message, i, std::string::npos);
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
    out += severity_word(d.severity);
    out += ": ";
    append_message(out, d.message);
    out += '\n';
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
