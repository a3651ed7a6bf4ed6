// The one diagnostic type of deckscale: severity, place, message. Rendered in one place as
//   deck.cir:12:7: error: message
//     R1 in out 1.2.3k
//               ^~~~~~
// Library code never prints; it returns or throws diagnostics and the CLI renders them.
#pragma once

#include <cstdint>
#include <exception>
#include <string>
#include <vector>

namespace deckscale {

enum class Severity { note, warning, error };

struct Diagnostic {
    Severity severity = Severity::error;
    std::string file;         // path as the user sees it; empty when not tied to a file
    std::uint32_t line = 0;   // 1-based; 0 when unknown
    std::uint32_t column = 0; // 1-based byte column; 0 when unknown
    std::uint32_t length = 0; // bytes underlined after the caret (0 or 1 gives a lone caret)
    std::string source_line;  // the text of that line without its line end (or a window of it)
    std::string message;
    std::vector<Diagnostic> notes;  // e.g. "included from here", rendered after the main text
    std::uint32_t caret_column = 0;  // where the caret goes in source_line; 0 = `column`
};

// Renders one diagnostic (with its notes) as text ending in a newline.
std::string render(const Diagnostic& d);

// Renders a list, one after the other.
std::string render(const std::vector<Diagnostic>& ds);

// Thrown by library code for input it cannot accept; the CLI renders it and exits with 2.
class DeckError : public std::exception {
public:
    explicit DeckError(Diagnostic d) : diagnostic_(std::move(d)) {}
    const Diagnostic& diagnostic() const { return diagnostic_; }
    const char* what() const noexcept override { return diagnostic_.message.c_str(); }

private:
    Diagnostic diagnostic_;
};

}  // namespace deckscale
