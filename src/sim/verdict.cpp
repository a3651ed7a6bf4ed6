#include "sim/verdict.hpp"

#include <fmt/format.h>

#include <array>
#include <cctype>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

bool contains(std::string_view hay, std::string_view needle) {
    return hay.find(needle) != std::string_view::npos;
}

template <std::size_t N>
bool contains_any(std::string_view line, const std::array<std::string_view, N>& needles) {
    for (std::string_view n : needles)
        if (contains(line, n)) return true;
    return false;
}

}  // namespace

bool is_error_line(std::string_view line) {
    static constexpr std::array<std::string_view, 6> needles{
        "Error", "ERROR", "Fatal error", "aborted", "not parsed", "cannot recover"};
    return contains_any(line, needles) && !is_measure_error(line);
}

bool is_measure_error(std::string_view line) {
    // "Error: measure  t1  WHEN(...) : ...", "Error: measure  dd failed:", "Error: syntax error
    // for measure statement; ..." (ngspice 39, frontend/com_measure2.c and measure.c), and
    // "Error: no such vector as idb(v1)." for a measured vector that does not exist (tried):
    // a verification run's own cards name no vectors, only a kept .meas card does.
    return contains(line, "Error: measure ") || contains(line, "error for measure statement") ||
           contains(line, "Error: no such vector as ");
}

bool is_substitution_warning(std::string_view line) {
    static constexpr std::array<std::string_view, 2> needles{"set to 1 mOhm", "can't find model"};
    return contains_any(line, needles);
}

bool is_chatter(std::string_view line) {
    line = trim(line);
    return line.empty() || line.starts_with("Note:") || line.starts_with("Supplies reduced") ||
           contains(line, "gmin");
}

bool any_problem(const std::vector<PrintedLine>& lines, std::size_t first, std::size_t last,
                 bool errors) {
    for (std::size_t i = first; i < last && i < lines.size(); ++i) {
        if (is_substitution_warning(lines[i].text)) return true;
        if (errors && is_error_line(lines[i].text)) return true;
    }
    return false;
}

std::string quote_problems(const std::vector<PrintedLine>& lines, std::size_t first,
                           std::size_t last) {
    constexpr std::size_t max_quoted = 12;
    std::vector<std::string_view> quoted;
    std::size_t left_out = 0;
    for (std::size_t i = first; i < last && i < lines.size(); ++i) {
        std::string_view text = trim(lines[i].text);
        bool problem = is_error_line(text) || is_substitution_warning(text);
        if (!problem && !(lines[i].to_stderr && !is_chatter(text))) continue;
        if (!quoted.empty() && quoted.back() == text) continue;  // repeated by ngspice
        if (quoted.size() < max_quoted) {
            quoted.push_back(text);
        } else {
            ++left_out;
        }
    }
    std::string out;
    for (std::string_view q : quoted) {
        if (!out.empty()) out += '\n';
        out += q;
    }
    if (left_out > 0) out += fmt::format("\n({} more lines in the log)", left_out);
    return out;
}

PrintedLine strip_channel(std::string_view raw) {
    PrintedLine line;
    if (raw.substr(0, 7) == "stderr ") {
        line.to_stderr = true;
        raw.remove_prefix(7);
    } else if (raw.substr(0, 7) == "stdout ") {
        raw.remove_prefix(7);
    }
    while (!raw.empty() && (raw.back() == '\r' || raw.back() == '\n')) raw.remove_suffix(1);
    line.text = std::string(raw);
    return line;
}

std::string expected_title(const std::vector<std::string>& cards) {
    std::string title = cards.empty() ? "" : cards[0];
    for (const std::string& card : cards) {
        std::string_view c = trim(card);
        if (c.size() > 6 && same_title(c.substr(0, 6), ".title") &&
            std::isspace(static_cast<unsigned char>(c[6])))
            title = std::string(trim(c.substr(7)));
    }
    return title;
}

bool same_title(std::string_view sent, std::string_view reported) {
    sent = trim(sent);
    reported = trim(reported);
    if (sent.size() != reported.size()) return false;
    for (std::size_t i = 0; i < sent.size(); ++i) {
        if (std::tolower(static_cast<unsigned char>(sent[i])) !=
            std::tolower(static_cast<unsigned char>(reported[i])))
            return false;
    }
    return true;
}

}  // namespace deckscale
