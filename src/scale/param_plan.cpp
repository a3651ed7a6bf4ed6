#include "scale/param_plan.hpp"

#include <algorithm>
#include <cfloat>
#include <cmath>

#include <fmt/format.h>

#include "deck/spice_number.hpp"
#include "scale/param_facts.hpp"

namespace deckscale {

bool ParamPlan::settled_at(std::size_t file, std::uint32_t begin) const {
    return std::binary_search(settled.begin(), settled.end(), std::make_pair(file, begin));
}

namespace {

std::string fraction_text(Fraction f) {
    return f.den == 1 ? fmt::format("{}", f.num) : fmt::format("{}/{}", f.num, f.den);
}

bool is(const Exponents& e, int km, int kf) {
    return e.km == Fraction::of(km) && e.kf == Fraction::of(kf);
}

}  // namespace

std::string kind_name(Fraction km, Fraction kf, std::string_view unit) {
    Exponents e{km, kf};
    if (is(e, 1, 0)) return "resistance";
    if (is(e, -1, -1)) return "capacitance";
    if (is(e, 1, -1)) return "inductance";
    // A junction capacitance or current of a .model card: the instances' m (or area) carries
    // Km, so the model's own value follows Kf alone.
    if (is(e, 0, -1)) return unit == "F" ? "model capacitance (m carries Km)" : "time";
    if (is(e, 0, 1)) return "frequency";
    if (is(e, -1, 0))
        return unit == "A" ? "current" : unit == "S" ? "conductance" : "current or conductance";
    if (is(e, 0, 0))
        return unit == "V"   ? "voltage"
               : unit == "-" ? "dimensionless"
               : unit == "A" ? "model current (m carries Km)"
                             : "voltage or ratio";
    return fmt::format("Km^{} Kf^{}", fraction_text(km), fraction_text(kf));
}

namespace {

double power_of(double base, Fraction e) {
    if (e.den == 1 && std::llabs(e.num) <= 64) return int_power(base, static_cast<int>(e.num));
    return std::pow(base, static_cast<double>(e.num) / static_cast<double>(e.den));
}

// The change list's unit for a definition: the one its uses name, else the SI one.
std::string unit_symbol(const Exponents& e, const std::string& used) {
    if (!used.empty()) return used;
    if (is(e, 1, 0)) return "Ohm";
    if (is(e, -1, -1)) return "F";
    if (is(e, 1, -1)) return "H";
    if (is(e, 0, -1)) return "s";
    if (is(e, 0, 1)) return "Hz";
    return "";
}

constexpr const char* kTooLarge =
    "its group of linked parameters is too large or its powers too high to solve";

struct Group {
    std::vector<int> members;
    std::vector<std::size_t> eqs;
    std::vector<ParamEquation> fixed;  // eqs with the numbers' unknowns at 0
    bool used = false;
    int opaque_member = -1;
    enum class State { solved, wrapped, unused } state = State::solved;
    std::string why;
};

class Decider {
public:
    Decider(const Deck& deck, const std::vector<ParamUse>& uses, const ParamFacts& facts,
            ScaleFactors f, int digits, ParamPlan& plan)
        : deck_(deck), uses_(uses), x_(facts), f_(f), digits_(digits), plan_(plan) {}

    void run() {
        for (std::size_t p = 0; p < x_.group.size(); ++p) {
            Group& g = groups_[x_.group[p]];
            g.members.push_back(static_cast<int>(p));
            if (!x_.opaque[p].empty() && g.opaque_member < 0) g.opaque_member = static_cast<int>(p);
        }
        for (std::size_t i = 0; i < x_.equations.size(); ++i) {
            Group& g = groups_[x_.group[x_.origins[i].anchor]];
            g.eqs.push_back(i);
            g.used = g.used || x_.origins[i].use;
        }
        for (const auto& e : x_.editables) editables_[e.param].push_back(&e);
        for (auto& [root, g] : groups_) decide(g);
        settle();
        describe();
    }

private:
    void wrap(Group& g, std::string why) {
        g.state = Group::State::wrapped;
        g.why = std::move(why);
    }

    void decide(Group& g) {
        if (g.opaque_member >= 0) return wrap(g, x_.opaque[g.opaque_member]);
        if (!g.used) {
            g.state = Group::State::unused;
            return;
        }
        // Exactness: the numbers in the expressions do not change, so their unknowns are 0.
        int first_number = static_cast<int>(x_.index.params.size());
        std::vector<ParamEquation>& fixed = g.fixed;
        std::vector<int> numbers = g.members;
        for (std::size_t i : g.eqs) {
            ParamEquation e = x_.equations[i];
            for (auto it = e.form.begin(); it != e.form.end();)
                if (it->first >= first_number) {
                    numbers.push_back(it->first);
                    it = e.form.erase(it);
                } else {
                    ++it;
                }
            fixed.push_back(std::move(e));
        }
        std::vector<const ParamEquation*> eqs, with_numbers;
        for (const auto& e : fixed) eqs.push_back(&e);
        for (std::size_t i : g.eqs) with_numbers.push_back(&x_.equations[i]);
        ParamSolution s = solve_params(g.members, eqs);
        switch (s.status) {
            case ParamSolution::Status::conflict: return wrap(g, conflict_reason(g, s.conflict));
            case ParamSolution::Status::open: return wrap(g, open_reason(g, s.open));
            case ParamSolution::Status::too_large: return wrap(g, kTooLarge);
            case ParamSolution::Status::solved: break;
        }
        // No guessing: each parameter's unit must follow without assuming a number written
        // with a unit (1k, 10n) is dimensionless (`{1/(2*pi*1k)}` as a capacitance would make
        // pi scale like 1/F).
        if (numbers.size() > g.members.size()) {
            ParamSolution free = solve_params(numbers, with_numbers);
            if (free.status == ParamSolution::Status::too_large) return wrap(g, kTooLarge);
            std::vector<int> open;
            for (int p : free.open)
                if (p < first_number) open.push_back(p);
            if (!open.empty()) return wrap(g, number_reason(g, open));
        }
        std::vector<DefinitionEdit> edits;
        for (int p : g.members) {
            const Exponents& e = s.dims.at(p);
            dims_[p] = e;
            double k = power_of(f_.km, e.km) * power_of(f_.kf, e.kf);
            factor_[p] = k;
            if (k == 1) continue;
            auto found = editables_.find(p);
            if (found == editables_.end()) continue;
            for (const EditableNumber* n : found->second) {
                std::string_view old =
                    deck_.files[n->file].source->view(n->begin, n->begin + n->length);
                NumberParse np = parse_spice_number(old);
                double v = np.number->value * int_power(k, n->power);
                if (!std::isfinite(v) || (v != 0 && std::fabs(v) < DBL_MIN) ||
                    (v == 0) != (np.number->value == 0))
                    return wrap(g, fmt::format("'{}' times {:.9g} is outside the range of a double",
                                               old, int_power(k, n->power)));
                std::string text = respell(*np.number, v, digits_);
                if (text != old)
                    edits.push_back(DefinitionEdit{n->file, n->begin, n->length, std::move(text),
                                                   n->key, unit_symbol(e, direct_unit(g, p)), k});
            }
        }
        for (auto& e : edits) plan_.edits.push_back(std::move(e));
    }

    // The unit of a use that is the parameter alone ({p} or p), if any.
    std::string direct_unit(const Group& g, int p) const {
        for (std::size_t j = 0; j < g.eqs.size(); ++j) {
            const auto& eq = g.fixed[j];
            const auto& o = x_.origins[g.eqs[j]];
            if (o.use && !o.unit.empty() && eq.form.size() == 1 && eq.form.begin()->first == p &&
                eq.form.begin()->second == Fraction::of(1))
                return o.unit;
        }
        return "";
    }

    // `bad`: the index in g.eqs of the first equation that disagreed.
    std::string conflict_reason(const Group& g, std::size_t bad) const {
        // Two uses of the parameter alone (times numbers) that want different scalings.
        std::map<int, std::size_t> first;
        for (std::size_t j = 0; j < g.eqs.size(); ++j) {
            const auto& eq = g.fixed[j];
            const auto& o = x_.origins[g.eqs[j]];
            if (!o.use || eq.form.size() != 1 || eq.form.begin()->second != Fraction::of(1))
                continue;
            auto [it, fresh] = first.try_emplace(eq.form.begin()->first, j);
            const auto& before = g.fixed[it->second];
            const auto& was = x_.origins[g.eqs[it->second]];
            if (fresh || before.rhs == eq.rhs) continue;
            return fmt::format("used as {}{} and as {}{}",
                               kind_name(before.rhs.km, before.rhs.kf, was.unit),
                               site_text(deck_, was.site), kind_name(eq.rhs.km, eq.rhs.kf, o.unit),
                               site_text(deck_, o.site));
        }
        // Agreement only if the numbers written with a unit in one definition scaled too
        // (`{1/(4*9.8696*455k*455k*l)}` as a capacitance, l an inductance: 455k would have to
        // be a frequency). Tried one place at a time, its numbers as unknowns.
        int first_number = static_cast<int>(x_.index.params.size());
        for (std::size_t j = 0; j < g.eqs.size(); ++j) {
            const auto& with = x_.equations[g.eqs[j]];
            if (x_.origins[g.eqs[j]].use || with.form.empty() ||
                with.form.rbegin()->first < first_number)
                continue;
            std::vector<int> unknowns = g.members;
            for (const auto& [id, c] : with.form)
                if (id >= first_number) unknowns.push_back(id);
            std::vector<const ParamEquation*> eqs;
            for (std::size_t k = 0; k < g.eqs.size(); ++k)
                eqs.push_back(k == j ? &with : &g.fixed[k]);
            auto st = solve_params(unknowns, eqs).status;
            if (st == ParamSolution::Status::conflict || st == ParamSolution::Status::too_large)
                continue;
            return fmt::format(
                "its uses agree only if the numbers written with a unit{} "
                "scaled too; deckscale rewrites no number inside an expression "
                "of parameters",
                site_text(deck_, x_.origins[g.eqs[j]].site));
        }
        const auto& o = x_.origins[g.eqs[bad]];
        return fmt::format("{}{} does not agree with the {} before it about its unit",
                           o.use ? "the use" : "the definition", site_text(deck_, o.site),
                           o.use ? "uses and definitions" : "definitions");
    }

    std::string open_reason(const Group& g, const std::vector<int>& open) const {
        std::string names;
        for (int p : open)
            names += (names.empty() ? "'" : ", '") + x_.index.params[p].written + "'";
        for (std::size_t i : g.eqs) {
            const auto& o = x_.origins[i];
            for (int p : open)
                if (o.use && x_.equations[i].form.count(p))
                    return fmt::format(
                        "its uses do not fix the unit of {}: only products or "
                        "ratios with other parameters are used{}",
                        names, site_text(deck_, o.site));
        }
        return fmt::format("its uses do not fix the unit of {}", names);
    }

    std::string number_reason(const Group& g, const std::vector<int>& open) const {
        int first_number = static_cast<int>(x_.index.params.size());
        for (std::size_t i : g.eqs) {
            const auto& form = x_.equations[i].form;
            bool number = !form.empty() && form.rbegin()->first >= first_number;
            for (int p : open)
                if (number && form.count(p))
                    return fmt::format(
                        "the unit of '{}' rests on a number written with a unit "
                        "of its own{}, which deckscale does not read",
                        x_.index.params[p].written, site_text(deck_, x_.origins[i].site));
        }
        return fmt::format("its unit rests on numbers written with a unit of their own");
    }

    bool solved(int p) const { return groups_.at(x_.group[p]).state == Group::State::solved; }

    void settle() {
        settled_.assign(uses_.size(), false);
        for (std::size_t i = 0; i < uses_.size(); ++i) {
            const auto& ps = x_.named[x_.use_params[i]];
            if (!x_.use_planned[i] || ps.empty() || !solved(*ps.begin())) continue;
            plan_.settled.emplace_back(uses_[i].file, uses_[i].begin);
            settled_[i] = true;
            if (uses_[i].factor != 1) plan_.changes_output = true;
        }
        std::sort(plan_.settled.begin(), plan_.settled.end());
        std::sort(plan_.edits.begin(), plan_.edits.end(), [](const auto& a, const auto& b) {
            return std::tie(a.file, a.begin) < std::tie(b.file, b.begin);
        });
        // One number can define two parameters linked to scale alike: written once.
        plan_.edits.erase(std::unique(plan_.edits.begin(), plan_.edits.end(),
                                      [](const auto& a, const auto& b) {
                                          return a.file == b.file && a.begin == b.begin;
                                      }),
                          plan_.edits.end());
        if (!plan_.edits.empty()) plan_.changes_output = true;
    }

    void describe() {
        std::map<int, std::size_t> wrapped;  // uses wrapped, per parameter
        for (std::size_t u = 0; u < uses_.size(); ++u)
            if (!settled_[u] && uses_[u].factor != 1)
                for (int p : x_.named[x_.use_params[u]]) ++wrapped[p];
        for (std::size_t i = 0; i < x_.index.params.size(); ++i) {
            int p = static_cast<int>(i);
            const ParamInfo& info = x_.index.params[i];
            const Group& g = groups_.at(x_.group[p]);
            ParamDecision d;
            d.name = info.written;
            d.subckt = x_.index.scopes[info.scope].subckt;
            d.defined = info.defined;
            if (g.state == Group::State::unused) {
                d.outcome = ParamOutcome::unused;
            } else if (g.state == Group::State::wrapped) {
                d.outcome = ParamOutcome::wrapped;
                d.why = g.why;
                if (g.opaque_member >= 0 && g.opaque_member != p)
                    d.why = fmt::format("linked to '{}': {}",
                                        x_.index.params[g.opaque_member].written, g.why);
                if (auto w = wrapped.find(p); w != wrapped.end()) d.wrapped_uses = w->second;
            } else {
                const Exponents& e = dims_.at(p);
                d.kind = kind_name(e.km, e.kf, direct_unit(g, p));
                d.factor = factor_.at(p);
                d.outcome = d.factor == 1              ? ParamOutcome::unchanged
                            : editables_.count(p) != 0 ? ParamOutcome::definition
                                                       : ParamOutcome::follows;
            }
            plan_.decisions.push_back(std::move(d));
        }
        std::stable_sort(plan_.decisions.begin(), plan_.decisions.end(),
                         [](const auto& a, const auto& b) {
                             return std::tie(a.defined.file, a.defined.offset) <
                                    std::tie(b.defined.file, b.defined.offset);
                         });
    }

    const Deck& deck_;
    const std::vector<ParamUse>& uses_;
    const ParamFacts& x_;
    ScaleFactors f_;
    int digits_;
    ParamPlan& plan_;
    std::map<int, Group> groups_;
    std::map<int, std::vector<const EditableNumber*>> editables_;
    std::map<int, Exponents> dims_;
    std::map<int, double> factor_;
    std::vector<bool> settled_;  // per recorded use
};

}  // namespace

ParamPlan plan_params(const Deck& deck, const std::vector<ParamUse>& uses, ScaleFactors factors,
                      int digits) {
    ParamPlan plan;
    if (deck.symbols.params.empty()) return plan;
    ParamFacts facts = gather_param_facts(deck, uses);
    if (facts.index.params.empty()) return plan;
    Decider(deck, uses, facts, factors, digits, plan).run();
    return plan;
}

}  // namespace deckscale
