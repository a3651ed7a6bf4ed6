// One file of a deck, read once in binary and never modified. Everything else refers to
// its bytes by offset.
#pragma once

#include <cstdint>
#include <memory>
#include <mutex>
#include <string>
#include <string_view>
#include <vector>

#include "base/file_system.hpp"
#include "deck/diagnostic.hpp"

namespace deckscale {

class SourceFile {
public:
    SourceFile(std::string path, std::string text)
        : SourceFile(std::move(path), owned_text(std::move(text))) {}
    SourceFile(std::string path, FileText text)
        : path_(std::move(path)), owner_(std::move(text.owner)), text_(text.bytes) {}

    const std::string& path() const { return path_; }  // as shown to the user
    std::string_view text() const { return text_; }
    std::string_view view(std::uint32_t begin, std::uint32_t end) const {
        return text_.substr(begin, end - begin);
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
    const std::vector<std::uint32_t>& line_starts() const;

    std::string path_;
    std::shared_ptr<const void> owner_;  // keeps text_ alive
    std::string_view text_;
    // Built on first use (diagnostics only), once even when pieces of the file are read on
    // several threads at a time.
    struct LineIndex {
        std::once_flag once;
        std::vector<std::uint32_t> starts;
    };
    std::shared_ptr<LineIndex> lines_ = std::make_shared<LineIndex>();
};

}  // namespace deckscale
