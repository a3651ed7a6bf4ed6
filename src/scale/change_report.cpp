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

const char* outcome_key(ParamOutcome o) {
    switch (o) {
        case ParamOutcome::definition: return "definition";
        case ParamOutcome::follows: return "follows";
        case ParamOutcome::unchanged: return "unchanged";
        case ParamOutcome::wrapped: return "wrapped";
        case ParamOutcome::unused: return "unused";
    }
    return "unused";
}

// "scaled at its definition as resistance  x2", "wrapped at 2 use sites: ..."
std::string outcome_text(const ParamDecision& d) {
    switch (d.outcome) {
        case ParamOutcome::definition:
            return fmt::format("scaled at its definition as {}  x{}", d.kind,
                               factor_text(d.factor));
        case ParamOutcome::follows:
            return fmt::format("follows from its definition as {}  x{}", d.kind,
                               factor_text(d.factor));
        case ParamOutcome::unchanged:
            return fmt::format("unchanged: {}, factor 1", d.kind);
        case ParamOutcome::wrapped:
            if (d.wrapped_uses == 0) return "left as written: " + d.why;
            return fmt::format("wrapped at {} use site{}: {}", d.wrapped_uses,
                               d.wrapped_uses == 1 ? "" : "s", d.why);
        case ParamOutcome::unused:
            return "used nowhere: left as it is";
    }
    return "";
}

std::string param_title(const ParamDecision& d) {
    return d.subckt.empty() ? d.name : fmt::format("{} of {}", d.name, d.subckt);
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
    for (const auto& d : result.params) {
        const SourceFile& f = *deck.files[d.defined.file].source;
        auto pos = f.position(d.defined.offset);
        out += fmt::format("{}:{}:{}  parameter {}  {}\n", f.path(), pos.line, pos.column,
                           param_title(d), outcome_text(d));
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
    auto params = nlohmann::json::array();
    for (const auto& d : result.params) {
        const SourceFile& f = *deck.files[d.defined.file].source;
        auto pos = f.position(d.defined.offset);
        nlohmann::json p{{"name", d.name},       {"subckt", d.subckt},
                         {"file", f.path()},     {"line", pos.line},
                         {"column", pos.column}, {"outcome", outcome_key(d.outcome)}};
        if (!d.kind.empty()) p["kind"] = d.kind;
        if (d.outcome == ParamOutcome::definition || d.outcome == ParamOutcome::follows ||
            d.outcome == ParamOutcome::unchanged)
            p["factor"] = d.factor;
        if (d.outcome == ParamOutcome::wrapped) {
            p["wrapped_uses"] = d.wrapped_uses;
            p["why"] = d.why;
        }
        params.push_back(std::move(p));
    }
    j["parameters"] = params;
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
