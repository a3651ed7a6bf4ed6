#include "write/time_column.hpp"

#include <fmt/format.h>

#include <cctype>
#include <cstdlib>
#include <vector>

namespace deckscale {
namespace {

constexpr std::size_t kLineBuffer = 200;  // d_source's MAX_STRING_SIZE, the '\0' included

bool separator(char c) {
    return std::isspace(static_cast<unsigned char>(c)) || c == '=' || c == '(' || c == ')' ||
           c == ',';
}

// cnv_get_spice_value: a C number, then an optional scale letter.
std::optional<double> read_time(std::string_view token) {
    std::size_t i = 0;
    while (i < token.size() && !(std::isalpha(static_cast<unsigned char>(token[i])) &&
                                 token[i] != 'e' && token[i] != 'E'))
        ++i;
    std::string number(token.substr(0, i));
    char* end = nullptr;
    double value = std::strtod(number.c_str(), &end);
    if (end == number.c_str()) return std::nullopt;
    double scale = 1;
    if (i < token.size()) {
        char c = static_cast<char>(std::tolower(static_cast<unsigned char>(token[i])));
        char next = i + 1 < token.size()
                        ? static_cast<char>(std::tolower(static_cast<unsigned char>(token[i + 1])))
                        : '\0';
        switch (c) {
            case 't': scale = 1e12; break;
            case 'g': scale = 1e9; break;
            case 'k': scale = 1e3; break;
            case 'u': scale = 1e-6; break;
            case 'n': scale = 1e-9; break;
            case 'p': scale = 1e-12; break;
            case 'f': scale = 1e-15; break;
            case 'm': scale = next == 'e' ? 1e6 : next == 'i' ? 25.4e-6 : 1e-3; break;
            default: break;
        }
    }
    return value * scale;
}

struct DataLine {
    std::size_t line = 0;           // 1-based
    std::size_t begin = 0, end = 0;  // the time token in the text
    std::size_t length = 0;          // the line's bytes, its line end included
    double time = 0;
};

}  // namespace

std::optional<std::string> scale_time_column(std::string_view text, double factor, int digits,
                                             std::string& why) {
    std::vector<DataLine> rows;
    std::size_t line = 0;
    for (std::size_t at = 0; at < text.size();) {
        std::size_t nl = text.find('\n', at);
        std::size_t stop = nl == std::string_view::npos ? text.size() : nl + 1;
        std::string_view s = text.substr(at, stop - at);
        ++line;
        std::size_t k = 0;
        while (k < s.size() && (std::isspace(static_cast<unsigned char>(s[k])) || s[k] == '*'))
            ++k;
        if (k < s.size() && s[0] != '*') {
            if (s.size() >= kLineBuffer) {
                why = fmt::format("line {} is longer than the {} bytes d_source reads as one "
                                  "line",
                                  line, kLineBuffer - 1);
                return std::nullopt;
            }
            std::size_t b = 0;
            while (b < s.size() && separator(s[b])) ++b;
            std::size_t e = b;
            while (e < s.size() && !separator(s[e])) ++e;
            auto time = read_time(s.substr(b, e - b));
            if (!time) {
                why = fmt::format("line {}: '{}' is not a time", line, s.substr(b, e - b));
                return std::nullopt;
            }
            if (!rows.empty() && *time <= rows.back().time) {
                why = fmt::format("line {}: the times do not increase (d_source refuses the file)",
                                  line);
                return std::nullopt;
            }
            rows.push_back({line, at + b, at + e, s.size(), *time});
        }
        at = stop;
    }
    // Fewest digits from `digits` up that keep the scaled times increasing.
    std::vector<std::string> written(rows.size());
    for (int d = digits; d <= 17; ++d) {
        bool increasing = true;
        double last = 0;
        for (std::size_t i = 0; i < rows.size(); ++i) {
            written[i] = fmt::format("{:.{}g}", rows[i].time * factor, d);
            double back = std::strtod(written[i].c_str(), nullptr);
            if (i > 0 && back <= last) increasing = false;
            last = back;
        }
        if (increasing) break;
    }
    std::string out;
    out.reserve(text.size() + rows.size() * 8);
    std::size_t from = 0;
    for (std::size_t i = 0; i < rows.size(); ++i) {
        const DataLine& r = rows[i];
        if (r.length - (r.end - r.begin) + written[i].size() >= kLineBuffer) {
            why = fmt::format("line {} would be longer than the {} bytes d_source reads as one "
                              "line",
                              r.line, kLineBuffer - 1);
            return std::nullopt;
        }
        out.append(text.substr(from, r.begin - from));
        out += written[i];
        from = r.end;
    }
    out.append(text.substr(from));
    return out;
}

}  // namespace deckscale
