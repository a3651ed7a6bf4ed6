// One file of a deck, read once in binary and never modified. Everything else refers to
// its bytes by offset.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "diagnostic.hpp"

namespace deckscale {

class SourceFile {
public:
    SourceFile(std::string path, std::string text) : path_(std::move(path)), text_(std::move(text)) {}

    const std::string& path() const { return path_; }  // as shown to the user
    const std::string& text() const { return text_; }
    std::string_view view(std::uint32_t begin, std::uint32_t end) const {
        return std::string_view(text_).substr(begin, end - begin);
    }

    struct Position {
        std::uint32_t line;    // 1-based
        std::uint32_t column;  // 1-based, in bytes
    };
    Position position(std::uint32_t offset) const;
    std::string_view line_text(std::uint32_t line) const;  // without its line end

    // A diagnostic pointing at [offset, offset+length) of this file.
    Diagnostic diagnose(Severity severity, std::uint32_t offset, std::uint32_t length,
                        std::string message) const;

private:
    void index_lines() const;

    std::string path_;
    std::string text_;
    mutable std::vector<std::uint32_t> line_starts_;  // built on first use (diagnostics only)
};

}  // namespace deckscale
