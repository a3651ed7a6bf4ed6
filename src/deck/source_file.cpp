#include "deck/source_file.hpp"

#include <algorithm>

namespace deckscale {

const std::vector<std::uint32_t>& SourceFile::line_starts() const {
    std::call_once(lines_->once, [this] {
        auto& starts = lines_->starts;
        starts.push_back(0);
        for (std::uint32_t i = 0; i < text_.size(); ++i)
            if (text_[i] == '\n') starts.push_back(i + 1);
    });
    return lines_->starts;
}

SourceFile::Position SourceFile::position(std::uint32_t offset) const {
    const auto& starts = line_starts();
    auto it = std::upper_bound(starts.begin(), starts.end(), offset);
    auto line = static_cast<std::uint32_t>(it - starts.begin());
    return {line, offset - starts[line - 1] + 1};
}

std::string_view SourceFile::line_text(std::uint32_t line) const {
    const auto& starts = line_starts();
    if (line == 0 || line > starts.size()) return {};
    std::uint32_t begin = starts[line - 1];
    std::uint32_t end = line < starts.size() ? starts[line] : static_cast<std::uint32_t>(text_.size());
    std::string_view s = view(begin, end);
    while (!s.empty() && (s.back() == '\n' || s.back() == '\r')) s.remove_suffix(1);
    return s;
}

Diagnostic SourceFile::diagnose(Severity severity, std::uint32_t offset, std::uint32_t length,
                                std::string message) const {
    Diagnostic d;
    d.severity = severity;
    d.file = path_;
    auto pos = position(std::min<std::uint32_t>(offset, text_.size()));
    d.line = pos.line;
    d.column = pos.column;
    d.source_line = std::string(line_text(pos.line));
    // Control bytes (binary data) would garble a terminal: show them as '?'.
    for (char& c : d.source_line)
        if ((static_cast<unsigned char>(c) < 0x20 && c != '\t') || c == 0x7f) c = '?';
    // A very long line is shown as a window around the column.
    constexpr std::uint32_t kBefore = 60, kAfter = 100;
    if (d.source_line.size() > kBefore + kAfter + 20) {
        std::uint32_t from = pos.column > kBefore ? pos.column - 1 - kBefore : 0;
        std::string window = (from > 0 ? "..." : "") + d.source_line.substr(from, kBefore + kAfter);
        if (from + kBefore + kAfter < d.source_line.size()) window += "...";
        d.source_line = window;
        // The column stays the file's; the caret goes under the same byte of the window.
        d.caret_column = pos.column - from + (from > 0 ? 3 : 0);
    }
    // Underline no further than the end of the line.
    std::uint32_t shown = d.caret_column ? d.caret_column : pos.column;
    std::uint32_t room = d.source_line.size() >= shown ? d.source_line.size() - shown + 1 : 1;
    d.length = std::max<std::uint32_t>(1, std::min(length, room));
    d.message = std::move(message);
    return d;
}

}  // namespace deckscale
