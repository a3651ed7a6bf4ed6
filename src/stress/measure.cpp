#include "stress/measure.hpp"

#include <fmt/format.h>

#include <charconv>
#include <cmath>
#include <complex>
#include <filesystem>
#include <numbers>

#include "base/text_util.hpp"
#include "deck/analyses.hpp"
#include "deck/circuit_cards.hpp"
#include "deck/deck_params.hpp"
#include "deck/load.hpp"
#include "deck/rcl_fields.hpp"
#include "deck/spice_number.hpp"
#include "verify/sim_cards.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

struct TwoTerminal {
    std::string name, a, b;  // lower case
    double value = 0;
};

// The R, C and L elements of the circuit's top level (in the deck and the files it includes)
// whose value is a number or evaluates with the deck's top-level parameters; the others in
// `held`.
std::vector<TwoTerminal> two_terminals(const Deck& deck, std::vector<std::string>& held) {
    std::vector<TwoTerminal> out;
    ParamTable params = top_level_params(deck);
    visit_circuit_elements(deck, [&](std::size_t f, const Card& c, bool in_subckt) {
        auto rcl = rcl_fields(c);
        if (!rcl) return;
        std::string kw = card_keyword(c);
        // Where it is: a part inside a .subckt often shares its name with one at the top level.
        if (in_subckt) {
            const SourceFile& file = *deck.files[f].source;
            return held.push_back(fmt::format("{} (inside a subcircuit, {}:{})", kw,
                                              fs::path(file.path()).filename().string(),
                                              file.position(c.begin()).line));
        }
        if (!rcl->value) return held.push_back(kw + " (no value)");
        auto value = value_with_params(c.field_text(*rcl->value), params);
        if (!value || !(*value > 0) || !std::isfinite(*value))
            return held.push_back(kw + " (its value is not a positive number)");
        out.push_back({kw, to_lower(c.field_text(rcl->node_a)), to_lower(c.field_text(rcl->node_b)),
                       *value});
    });
    return out;
}

std::complex<double> node_value(const SimPlot& p, const std::string& node, std::size_t k) {
    if (node == "0" || node == "gnd") return 0;
    const SimVector* v = p.find(node);
    if (!v) v = p.find("v(" + node + ")");
    return v && k < v->values.size() ? v->values[k] : std::complex<double>(0);
}

const SimPlot* plot_of(const SimOutcome& o, const char* prefix) {
    for (const auto& p : o.plots)
        if (istarts_with(p.name, prefix)) return &p;
    return nullptr;
}

// The transient columns: peaks over time and a resistor's power averaged over the run.
void add_tran(PartLoad& l, const TwoTerminal& t, const SimPlot& tran) {
    const SimVector* time = nullptr;
    for (const auto& v : tran.vectors)
        if (v.kind == VectorKind::time) time = &v;
    if (!time || time->values.empty()) return;
    char kind = t.name[0];
    const SimVector* branch = kind == 'l' ? tran.find(t.name + "#branch") : nullptr;
    std::size_t n = time->values.size();
    std::vector<double> v(n), i(n);
    for (std::size_t k = 0; k < n; ++k) {
        v[k] = (node_value(tran, t.a, k) - node_value(tran, t.b, k)).real();
        if (kind == 'r') i[k] = v[k] / t.value;
        if (kind == 'l') i[k] = branch && k < branch->values.size() ? branch->values[k].real() : 0;
    }
    for (std::size_t k = 1; kind == 'c' && k < n; ++k) {
        double dt = time->values[k].real() - time->values[k - 1].real();
        if (dt > 0) i[k] = t.value * (v[k] - v[k - 1]) / dt;
    }
    double energy = 0;
    for (std::size_t k = 0; k < n; ++k) {
        l.tran_voltage = std::max(l.tran_voltage, std::abs(v[k]));
        l.tran_current = std::max(l.tran_current, std::abs(i[k]));
        if (kind == 'r' && k > 0) {
            double dt = time->values[k].real() - time->values[k - 1].real();
            energy += dt * (v[k] * v[k] + v[k - 1] * v[k - 1]) / (2 * t.value);
        }
    }
    double span = time->values.back().real() - time->values.front().real();
    if (kind == 'r' && span > 0) l.tran_power = energy / span;
}

PartLoad load_of(const TwoTerminal& t, const SimPlot* op, const SimPlot* ac, const SimPlot* tran) {
    PartLoad l;
    char kind = t.name[0];
    if (op) {
        l.dc_voltage = (node_value(*op, t.a, 0) - node_value(*op, t.b, 0)).real();
        if (kind == 'r') {
            l.dc_current = l.dc_voltage / t.value;
            l.dc_power = l.dc_voltage * l.dc_voltage / t.value;
        } else if (kind == 'l') {
            const SimVector* i = op->find(t.name + "#branch");
            l.dc_current = i && !i->values.empty() ? i->values[0].real() : 0;
        }
    }
    if (tran) add_tran(l, t, *tran);
    if (!ac) return l;
    const SimVector* freq = nullptr;
    for (const auto& v : ac->vectors)
        if (v.kind == VectorKind::frequency) freq = &v;
    const SimVector* branch = kind == 'l' ? ac->find(t.name + "#branch") : nullptr;
    for (std::size_t k = 0; freq && k < freq->values.size(); ++k) {
        double v = std::abs(node_value(*ac, t.a, k) - node_value(*ac, t.b, k));
        double i = kind == 'r' ? v / t.value
                   : kind == 'c'
                       ? v * 2 * std::numbers::pi * freq->values[k].real() * t.value
                       : (branch && k < branch->values.size() ? std::abs(branch->values[k]) : 0);
        l.ac_voltage = std::max(l.ac_voltage, v);
        l.ac_current = std::max(l.ac_current, i);
        if (kind == 'r') l.ac_power = std::max(l.ac_power, v * v / (2 * t.value));
    }
    return l;
}

double rating(const std::map<std::string, double>& m, const std::string& part) {
    if (auto it = m.find(part); it != m.end()) return it->second;
    auto it = m.find(part.substr(0, 1));
    return it == m.end() ? 0 : it->second;
}

}  // namespace

double PartLoad::peak_current() const {
    return std::max(std::abs(dc_current) + ac_current, tran_current);
}
double PartLoad::peak_voltage() const {
    return std::max(std::abs(dc_voltage) + ac_voltage, tran_voltage);
}
double PartLoad::power() const { return std::max(dc_power + ac_power, tran_power); }

std::string parse_ratings(const std::string& text, Ratings& r) {
    std::size_t pos = 0;
    while (pos <= text.size()) {
        std::size_t comma = text.find(',', pos);
        std::string item =
            text.substr(pos, comma == std::string::npos ? std::string::npos : comma - pos);
        pos = comma == std::string::npos ? text.size() + 1 : comma + 1;
        std::size_t eq = item.find('=');
        std::string value = eq == std::string::npos ? "" : item.substr(eq + 1);
        char unit = value.empty() ? 0 : ascii_lower(value.back());
        if (eq == 0 || eq == std::string::npos || (unit != 'w' && unit != 'v' && unit != 'a'))
            return fmt::format("'{}' is not NAME=VALUE with a unit W, V or A (e.g. R=0.25W, C=50V)",
                               item);
        value.pop_back();
        NumberParse p = parse_spice_number(value);
        if (!p.number || p.problem != NumberProblem::none || !(p.number->value > 0) ||
            !p.number->tail.empty())
            return fmt::format("'{}': the rating must be a positive number", item);
        std::string name = to_lower(item.substr(0, eq));
        auto& m = unit == 'w' ? r.power : unit == 'v' ? r.voltage : r.current;
        m[name] = p.number->value;
    }
    return "";
}

StressResult run_stress(const StressRequest& o, const FileSystem& files) {
    StressResult result;
    Deck original = load_deck(o.original, files);
    Deck scaled = load_deck(o.scaled, files);
    std::vector<std::string> ignored;
    std::vector<TwoTerminal> parts_o = two_terminals(original, ignored);
    std::vector<TwoTerminal> parts_s = two_terminals(scaled, result.held);

    auto job = [&](const Deck& d, const std::string& path) {
        DeckAnalyses an = find_analyses(d);
        SimJob j;
        j.label = path;
        j.cards = simulation_cards(d, SimDeckOptions{".op", "", 1, std::nullopt});
        if (an.ac) j.cards.insert(j.cards.end() - 1, ac_card(*an.ac));
        if (an.tran) j.cards.insert(j.cards.end() - 1, tran_card(*an.tran));
        j.work_dir = fs::absolute(path).parent_path().string();
        j.timeout = o.timeout;
        j.memory_limit_mb = o.memory_mb;
        return j;
    };
    std::vector<SimJob> jobs{job(original, o.original), job(scaled, o.scaled)};
    std::vector<SimOutcome> outcomes = simulate_all(jobs, 2);
    for (std::size_t i = 0; i < 2; ++i)
        if (outcomes[i].status != SimStatus::ok) {
            result.outcome = StressResult::Outcome::sim_failed;
            result.problems.push_back(fmt::format("simulating {} failed: {}: {}", jobs[i].label,
                                                  to_string(outcomes[i].status),
                                                  outcomes[i].message));
        }
    if (!result.problems.empty()) return result;
    const SimPlot* ac_o = plot_of(outcomes[0], "ac");
    const SimPlot* ac_s = plot_of(outcomes[1], "ac");
    result.ac = ac_o && ac_s;
    if (!result.ac) ac_o = ac_s = nullptr;
    const SimPlot* tran_o = plot_of(outcomes[0], "tran");
    const SimPlot* tran_s = plot_of(outcomes[1], "tran");
    result.tran = tran_o && tran_s;
    if (!result.tran) tran_o = tran_s = nullptr;
    const SimPlot* op_o = plot_of(outcomes[0], "op");
    const SimPlot* op_s = plot_of(outcomes[1], "op");
    for (const TwoTerminal& t : parts_s) {
        PartStressRow row;
        row.part = t.name;
        row.value = t.value;
        row.scaled = load_of(t, op_s, ac_s, tran_s);
        for (const TwoTerminal& u : parts_o)
            if (u.name == t.name) row.original = load_of(u, op_o, ac_o, tran_o);
        // A ratio needs something to compare: below 1e-30 the original carries nothing.
        auto ratio = [](double s, double o) { return std::abs(o) > 1e-30 ? s / o : 0; };
        if (row.original) {
            row.power_ratio = ratio(row.scaled.power(), row.original->power());
            row.current_ratio = ratio(row.scaled.peak_current(), row.original->peak_current());
            if (row.power_ratio > o.ratio_limit)
                row.flags.push_back(
                    fmt::format("power x{:.3g} (limit x{:g})", row.power_ratio, o.ratio_limit));
            if (row.current_ratio > o.ratio_limit)
                row.flags.push_back(
                    fmt::format("current x{:.3g} (limit x{:g})", row.current_ratio, o.ratio_limit));
        }
        if (double p = rating(o.ratings.power, t.name); p > 0 && row.scaled.power() > p)
            row.flags.push_back(
                fmt::format("{:.4g} W over its {:g} W rating", row.scaled.power(), p));
        if (double v = rating(o.ratings.voltage, t.name); v > 0 && row.scaled.peak_voltage() > v)
            row.flags.push_back(
                fmt::format("{:.4g} V over its {:g} V rating", row.scaled.peak_voltage(), v));
        if (double i = rating(o.ratings.current, t.name); i > 0 && row.scaled.peak_current() > i)
            row.flags.push_back(
                fmt::format("{:.4g} A over its {:g} A rating", row.scaled.peak_current(), i));
        result.rows.push_back(std::move(row));
    }
    return result;
}

}  // namespace deckscale
