#include "scale/hold_items.hpp"

#include <fmt/format.h>

#include <charconv>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

constexpr std::string_view kHeldPrefix = "* deckscale held:";

std::optional<HoldItem> read_item(std::string_view text, std::string& error) {
    HoldItem item;
    item.text = std::string(text);
    std::string_view name = text;
    if (auto colon = text.find(':'); colon != std::string_view::npos) {
        std::string prefix = to_lower(text.substr(0, colon));
        if (prefix == "model")
            item.kind = HoldKind::model;
        else if (prefix == "subckt")
            item.kind = HoldKind::subckt;
        else {
            error = fmt::format(
                "--hold '{}': the prefixes are model: and subckt: (a bare name "
                "is an element or X instance, else a .subckt, else a .model)",
                text);
            return std::nullopt;
        }
        name = text.substr(colon + 1);
    }
    if (name.empty()) {
        error = text.empty() ? "--hold: an empty name (two commas in a row?)"
                             : fmt::format("--hold '{}': no name after the prefix", text);
        return std::nullopt;
    }
    if (name.find_first_of(" \t=") != std::string_view::npos) {
        error = fmt::format("--hold '{}': a name has no blanks or '='", text);
        return std::nullopt;
    }
    item.pattern = to_lower(name);
    return item;
}

}  // namespace

std::optional<std::vector<HoldItem>> read_hold_items(const std::vector<std::string>& texts,
                                                     std::string& error) {
    std::vector<HoldItem> out;
    for (const std::string& t : texts) {
        std::size_t start = 0;
        while (true) {
            std::size_t comma = t.find(',', start);
            std::string_view one = std::string_view(t).substr(
                start, comma == std::string::npos ? std::string::npos : comma - start);
            auto item = read_item(one, error);
            if (!item) return std::nullopt;
            out.push_back(std::move(*item));
            if (comma == std::string::npos) break;
            start = comma + 1;
        }
    }
    return out;
}

bool name_matches(std::string_view pattern, std::string_view name) {
    // Iterative wildcard matching: the last '*' seen is where a mismatch backtracks to.
    std::size_t p = 0, n = 0, star = std::string_view::npos, resume = 0;
    while (n < name.size()) {
        if (p < pattern.size() && (pattern[p] == '?' || pattern[p] == name[n])) {
            ++p;
            ++n;
        } else if (p < pattern.size() && pattern[p] == '*') {
            star = p++;
            resume = n;
        } else if (star != std::string_view::npos) {
            p = star + 1;
            n = ++resume;
        } else {
            return false;
        }
    }
    while (p < pattern.size() && pattern[p] == '*') ++p;
    return p == pattern.size();
}

std::string held_line(const std::vector<std::string>& items, ScaleFactors f) {
    std::string list;
    for (const auto& i : items) list += (list.empty() ? "" : ",") + i;
    return fmt::format("{} km={:.17g} kf={:.17g} items={}", kHeldPrefix, f.km, f.kf, list);
}

std::optional<HeldLine> find_held_line(const Deck& deck) {
    // The comment lines right after the title, read straight from the text: the line is
    // always written there, and a large deck is not read through once more for it.
    std::string_view text = deck.top().text();
    std::size_t at = text.find('\n');
    while (at != std::string_view::npos && at + 1 < text.size() && text[at + 1] == '*') {
        std::size_t end = text.find('\n', at + 1);
        std::string_view line =
            text.substr(at + 1, end == std::string_view::npos ? end : end - at - 1);
        at = end;
        if (!line.empty() && line.back() == '\r') line.remove_suffix(1);
        if (!istarts_with(line, kHeldPrefix)) continue;
        HeldLine held;
        bool km = false, kf = false;
        auto number = [](std::string_view v, double& to) {
            auto r = std::from_chars(v.data(), v.data() + v.size(), to);
            return r.ec == std::errc() && r.ptr == v.data() + v.size() && to > 0;
        };
        std::size_t pos = kHeldPrefix.size();
        while (pos < line.size()) {
            std::size_t blank = line.find(' ', pos);
            std::string_view word =
                line.substr(pos, blank == std::string_view::npos ? blank : blank - pos);
            pos = blank == std::string_view::npos ? line.size() : blank + 1;
            if (word.rfind("km=", 0) == 0) km = number(word.substr(3), held.factors.km);
            if (word.rfind("kf=", 0) == 0) kf = number(word.substr(3), held.factors.kf);
            if (word.rfind("items=", 0) != 0) continue;
            for (std::string_view list = word.substr(6); !list.empty();) {
                std::size_t comma = list.find(',');
                if (comma != 0) held.items.emplace_back(list.substr(0, comma));
                list =
                    comma == std::string_view::npos ? std::string_view() : list.substr(comma + 1);
            }
        }
        if (km && kf && !held.items.empty()) return held;
        return std::nullopt;
    }
    return std::nullopt;
}

}  // namespace deckscale
