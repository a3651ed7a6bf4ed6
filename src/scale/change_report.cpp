#include "scale/change_report.hpp"

#include <cmath>

#include <fmt/format.h>
#include <nlohmann/json.hpp>

#include "scale/expression.hpp"
#include "scale/noise_effect.hpp"

namespace deckscale {

namespace {

// One change per line: a line break inside an inserted text (a card of its own) is shown as \n.
std::string one_line(const std::string& s) {
    std::string out;
    for (char ch : s) out += ch == '\n' ? "\\n" : ch == '\r' ? "\\r" : std::string(1, ch);
    return out;
}

}  // namespace

std::string change_list_text(const Deck& deck, const ScaleResult& result) {
    std::string out;
    for (const auto& c : result.changes) {
        const SourceFile& f = *deck.files[c.file].source;
        auto pos = f.position(c.offset);
        out += fmt::format("{}:{}:{}  {}  {}  {} -> {}  x{}{}\n", f.path(), pos.line, pos.column,
                           c.element, c.field, c.old_text.empty() ? "(none)" : one_line(c.old_text),
                           one_line(c.new_text), factor_text(c.factor),
                           c.unit.empty() || c.unit == "-" ? "" : " [" + c.unit + "]");
    }
    return out + held_list_text(deck, result);
}

std::string held_list_text(const Deck& deck, const ScaleResult& result) {
    std::string out;
    for (const auto& h : result.held) {
        const SourceFile& f = *deck.files[h.file].source;
        auto pos = f.position(h.offset);
        out += fmt::format("{}:{}:{}  {}  held ({}): {}{}\n", f.path(), pos.line, pos.column,
                           h.name, h.kind, h.why,
                           h.copy.empty() ? "" : "; the scaled parts use its scaled copy " + h.copy);
        for (const auto& d : h.could_not_follow)
            out += fmt::format("    could not have followed anyway: {}:{}:{}: {}\n", d.file,
                               d.line, d.column, d.message);
    }
    return out;
}

namespace {

nlohmann::json diagnostics_json(const std::vector<Diagnostic>& ds) {
    auto arr = nlohmann::json::array();
    for (const auto& d : ds)
        arr.push_back({{"file", d.file}, {"line", d.line}, {"column", d.column}, {"message", d.message}});
    return arr;
}

}  // namespace

std::string change_list_json(const Deck& deck, const ScaleResult& result, ScaleFactors factors,
                             const OutputPlan& plan, bool follow_flicker) {
    nlohmann::json j;
    j["km"] = factors.km;
    j["kf"] = factors.kf;
    auto files = nlohmann::json::array();
    for (const auto& f : plan.files)
        files.push_back({{"input", deck.files[f.source_file].source->path()},
                         {"output", f.path.empty() ? "-" : f.path}});
    j["files"] = files;
    auto changes = nlohmann::json::array();
    for (const auto& c : result.changes) {
        const SourceFile& f = *deck.files[c.file].source;
        auto pos = f.position(c.offset);
        changes.push_back({{"file", f.path()}, {"line", pos.line}, {"column", pos.column},
                           {"element", c.element}, {"field", c.field}, {"unit", c.unit},
                           {"old", c.old_text}, {"new", c.new_text}, {"factor", c.factor}});
    }
    j["changes"] = changes;
    auto held = nlohmann::json::array();
    for (const auto& h : result.held) {
        const SourceFile& f = *deck.files[h.file].source;
        auto pos = f.position(h.offset);
        held.push_back({{"kind", h.kind}, {"name", h.name}, {"file", f.path()},
                        {"line", pos.line}, {"column", pos.column}, {"why", h.why},
                        {"copy", h.copy}, {"could_not_follow", diagnostics_json(h.could_not_follow)}});
    }
    j["held"] = held;
    j["unscalable"] = diagnostics_json(result.unscalable);
    j["notes"] = diagnostics_json(result.notes);
    NoiseEffect n = noise_effect(deck, factors, follow_flicker);
    j["noise"] = {{"output_density_factor", n.density},
                  {"output_density_db", 20 * std::log10(n.density)},
                  {"integrated_factor", n.integrated},
                  {"integrated_db", 20 * std::log10(n.integrated)},
                  {"flicker_rewritten", n.flicker_rewritten},
                  {"flicker_not_following", n.flicker_off},
                  {"flicker_unknown", n.flicker_unknown},
                  {"line", n.line}};
    return j.dump(2) + "\n";
}

}  // namespace deckscale
