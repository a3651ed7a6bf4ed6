#include "stress/report.hpp"

#include <fmt/format.h>

#include <nlohmann/json.hpp>

namespace deckscale {
namespace {

std::string ratio_text(double x) { return x > 0 ? fmt::format("x{:.3g}", x) : "-"; }

nlohmann::json load_json(const PartLoad& l) {
    return {{"dc_voltage", l.dc_voltage},       {"dc_current", l.dc_current},
            {"dc_power", l.dc_power},           {"ac_voltage", l.ac_voltage},
            {"ac_current", l.ac_current},       {"ac_power", l.ac_power},
            {"tran_voltage", l.tran_voltage},   {"tran_current", l.tran_current},
            {"tran_power", l.tran_power},       {"peak_current", l.peak_current()},
            {"peak_voltage", l.peak_voltage()}, {"power", l.power()}};
}

}  // namespace

std::string stress_text(const StressResult& r, const StressRequest& o) {
    std::string s =
        fmt::format("stress of {} against {} (operating point; {}; {})\n", o.scaled, o.original,
                    r.ac ? "AC at the sources' stated amplitudes" : "no .ac in both decks",
                    r.tran ? "the decks' .tran" : "no .tran in both decks");
    s += fmt::format("  {:<8} {:>11} {:>11} {:>11} {:>11} {:>11} {:>8} {:>8}  {}\n", "part", "DC V",
                     "DC A", "peak V", "peak A", "power W", "power", "current", "flags");
    std::size_t flagged = 0;
    for (const PartStressRow& row : r.rows) {
        const PartLoad& l = row.scaled;
        std::string flags;
        for (const std::string& f : row.flags) flags += (flags.empty() ? "" : "; ") + f;
        flagged += !row.flags.empty();
        s += fmt::format("  {:<8} {:>11.4g} {:>11.4g} {:>11.4g} {:>11.4g} {:>11} {:>8} {:>8}  {}\n",
                         row.part, l.dc_voltage, l.dc_current, l.peak_voltage(), l.peak_current(),
                         row.part[0] == 'r' ? fmt::format("{:.4g}", l.power()) : std::string("-"),
                         row.original ? ratio_text(row.power_ratio) : "new",
                         ratio_text(row.current_ratio), flags.empty() ? "ok" : flags);
    }
    for (const std::string& h : r.held) s += "  not measured: " + h + "\n";
    s += fmt::format("{} of {} parts flagged (growth beyond x{:g}, or over a rating)\n", flagged,
                     r.rows.size(), o.ratio_limit);
    return s;
}

std::string stress_json(const StressResult& r, const StressRequest& o) {
    nlohmann::json rows = nlohmann::json::array();
    for (const PartStressRow& row : r.rows) {
        nlohmann::json j = {{"part", row.part},
                            {"value", row.value},
                            {"scaled", load_json(row.scaled)},
                            {"power_ratio", row.power_ratio},
                            {"current_ratio", row.current_ratio},
                            {"flags", row.flags}};
        j["original"] = row.original ? load_json(*row.original) : nlohmann::json(nullptr);
        rows.push_back(std::move(j));
    }
    nlohmann::json j = {{"original", o.original},
                        {"scaled", o.scaled},
                        {"ratio_limit", o.ratio_limit},
                        {"ac", r.ac},
                        {"tran", r.tran},
                        {"parts", rows},
                        {"not_measured", r.held}};
    return j.dump(1) + "\n";
}

}  // namespace deckscale
