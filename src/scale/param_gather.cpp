// The facts of the parameter plan: one equation per use and per definition from other
// parameters, the numbers that can carry a definition's scaling, and the parameters whose
// scaling cannot be known (scale/param_facts.hpp).
#include <algorithm>
#include <cmath>
#include <map>
#include <numeric>
#include <tuple>
#include <unordered_map>

#include <fmt/format.h>

#include "deck/param_eval.hpp"
#include "deck/spice_number.hpp"
#include "scale/param_facts.hpp"

namespace deckscale {

std::string site_text(const Deck& deck, const ParamSite& s) {
    const SourceFile& f = *deck.files[s.file].source;
    return fmt::format(" ({}, {}:{})", s.element, f.path(), f.position(s.offset).line);
}

namespace {

struct UnionFind {
    explicit UnionFind(std::size_t n) : parent(n) { std::iota(parent.begin(), parent.end(), 0); }
    int find(int x) {
        while (parent[x] != x) x = parent[x] = parent[parent[x]];
        return x;
    }
    void join(int a, int b) { parent[find(a)] = find(b); }
    std::vector<int> parent;
};

struct Analysis {
    std::size_t id = 0;  // one per distinct (scope, text)
    DimAnalysis dims;
    bool delimited = false;  // the text analysed starts one byte in, after a { or '
};

// A number that ngspice's parameter reader and its element-line reader read alike
// (`1mil` is 1e-3 in a .param but 25.4e-6 on an element line: left alone).
bool same_both_ways(std::string_view text) {
    NumberParse p = parse_spice_number(text);
    auto v =
        evaluate_param_expression(text, [](const std::string&) { return std::optional<double>(); });
    return p.number && p.problem == NumberProblem::none && v &&
           std::fabs(*v - p.number->value) <= 1e-12 * std::fabs(*v);
}

class Gatherer {
public:
    Gatherer(const Deck& deck, const std::vector<ParamUse>& uses, ParamFacts& facts)
        : deck_(deck), uses_(uses), x_(facts) {}

    void run() {
        x_.index = index_params(deck_);
        std::size_t n = x_.index.params.size();
        uf_ = UnionFind(n);
        next_ghost_ = static_cast<int>(n);
        x_.opaque.assign(n, "");
        for (const auto& d : x_.index.definitions) definition(d);
        same_value();
        std::size_t definitions_end = x_.equations.size();
        recorded();
        for (const auto& r : x_.index.refs) reference(r);
        in_file_order(definitions_end);
        for (const auto& [name, site] : x_.index.control_words)
            for (std::size_t p = 0; p < n; ++p)
                if (x_.index.params[p].name == name)
                    mark_one(static_cast<int>(p),
                             "used in a .control block" + site_text(deck_, site));
        for (int p : ambiguous_)
            mark_one(p,
                     "its name is defined in more than one scope, and ngspice 39 takes it "
                     "from whichever subcircuit calls");
        if (!x_.index.no_plan.empty())
            for (std::size_t p = 0; p < n; ++p) mark_one(static_cast<int>(p), x_.index.no_plan);
        x_.group.resize(n);
        for (std::size_t p = 0; p < n; ++p) x_.group[p] = uf_.find(static_cast<int>(p));
    }

private:
    // A large deck repeats the same few values: each (scope, text) is analysed once.
    const Analysis& analyze(std::size_t file, std::uint32_t begin, std::uint32_t end, int scope) {
        std::string_view text = deck_.files[file].source->view(begin, end);
        bool delimited = text.size() >= 2 && ((text.front() == '{' && text.back() == '}') ||
                                              (text.front() == '\'' && text.back() == '\''));
        if (delimited) text = text.substr(1, text.size() - 2);
        key_.assign(reinterpret_cast<const char*>(&scope), sizeof scope);
        key_ += delimited ? '{' : ' ';
        key_ += text;
        auto [it, fresh] = analyses_.try_emplace(key_);
        Analysis& a = it->second;
        if (!fresh) return a;
        a.id = x_.named.size();
        a.delimited = delimited;
        DimContext context{
            [&](const std::string& name) { return x_.index.resolve(name, scope, ambiguous_); },
            [&](const std::string& name) { return x_.index.function(name); }};
        a.dims = analyze_dims(text, context);
        x_.named.push_back(a.dims.params);
        return a;
    }

    void mark_one(int p, const std::string& why) {
        if (x_.opaque[p].empty()) x_.opaque[p] = why;
    }
    // `why()` is only worked out when one of the parameters is not marked yet.
    template <typename Why>
    void mark(const std::set<int>& ps, const Why& why) {
        for (int p : ps)
            if (x_.opaque[p].empty()) {
                std::string text = why();
                for (int q : ps) mark_one(q, text);
                return;
            }
    }

    // False when the same equations were added before (the same value with the same unit
    // elsewhere): they are added once.
    bool fresh(const Analysis& a, int self, const Exponents& rhs) {
        return seen_.insert({a.id, self, rhs.km.num, rhs.km.den, rhs.kf.num, rhs.kf.den}).second;
    }

    // The analysed value plus `extra` equals `rhs`, and the side conditions hold.
    void equations(const Analysis& a, const LinearForm& extra, Exponents rhs, EquationOrigin o) {
        const DimAnalysis& d = a.dims;
        std::set<int> params = d.params;
        for (const auto& [p, c] : extra) params.insert(p);
        if (params.empty()) return;
        o.anchor = *params.begin();
        for (int p : params) uf_.join(p, o.anchor);
        // The analysis numbers its unit-carrying numbers -1, -2, ...: give them ids of their own
        // after the parameters' (ParamFacts::equations).
        std::map<int, int> ghosts;
        auto renumbered = [&](const LinearForm& f) {
            LinearForm out;
            for (const auto& [id, c] : f) {
                int at = id;
                if (id < 0)
                    at = ghosts.try_emplace(id, next_ghost_ + static_cast<int>(ghosts.size()))
                             .first->second;
                out[at] = c;
            }
            return out;
        };
        LinearForm form = d.value;
        try {
            add_scaled(form, extra, Fraction::of(1));
        } catch (const ExponentOverflow&) {
            mark(params, [&] { return "powers too large to follow" + site_text(deck_, o.site); });
            return;
        }
        x_.equations.push_back(ParamEquation{renumbered(form), rhs});
        x_.origins.push_back(o);
        for (const auto& z : d.zero) {
            x_.equations.push_back(ParamEquation{renumbered(z), Exponents{}});
            x_.origins.push_back(o);
        }
        next_ghost_ += static_cast<int>(ghosts.size());
    }

    void definition(const ParamDefinition& d) {
        const Analysis& a = analyze(d.site.file, d.value.begin, d.value.end, d.scope);
        if (a.dims.opaque) {
            std::set<int> ps = a.dims.params;
            ps.insert(d.param);
            mark(ps,
                 [&] { return "its definition uses " + a.dims.why + site_text(deck_, d.site); });
            return;
        }
        const SourceFile& file = *deck_.files[d.site.file].source;
        if (a.dims.params.empty() && a.dims.number) {
            const auto& num = *a.dims.number;
            auto begin =
                static_cast<std::uint32_t>(d.value.begin + (a.delimited ? 1 : 0) + num.offset);
            auto length = static_cast<std::uint32_t>(num.length);
            if (same_both_ways(file.view(begin, begin + length))) {
                std::size_t key_length = x_.index.params[d.param].name.size();
                x_.editables.push_back(EditableNumber{
                    d.param, d.site.file, begin, length, num.power,
                    std::string(file.view(
                        d.site.offset, d.site.offset + static_cast<std::uint32_t>(key_length)))});
                return;
            }
        }
        // Defined by other parameters, or by numbers that cannot carry a factor (then the
        // parameter keeps its value: dimension 0).
        if (!fresh(a, d.param, Exponents{})) return;
        equations(a, LinearForm{{d.param, Fraction::of(-1)}}, Exponents{},
                  EquationOrigin{false, d.site, d.param, ""});
    }

    // An X-line override given to a subcircuit name that is defined more than once defines
    // a parameter of each: one number, one factor, so they scale alike.
    void same_value() {
        std::map<std::pair<std::size_t, std::uint32_t>, int> first;
        for (const auto& d : x_.index.definitions) {
            auto [it, fresh] = first.try_emplace({d.site.file, d.value.begin}, d.param);
            if (fresh || it->second == d.param) continue;
            uf_.join(d.param, it->second);
            x_.equations.push_back(ParamEquation{
                LinearForm{{std::min(d.param, it->second), Fraction::of(1)},
                           {std::max(d.param, it->second), Fraction::of(-1)}},
                Exponents{}});
            x_.origins.push_back(EquationOrigin{false, d.site, d.param, ""});
        }
    }

    void recorded() {
        std::vector<std::size_t> order(uses_.size());
        std::iota(order.begin(), order.end(), 0);
        auto before = [&](std::size_t a, std::size_t b) {
            return std::tie(uses_[a].file, uses_[a].begin) <
                   std::tie(uses_[b].file, uses_[b].begin);
        };
        if (!std::is_sorted(order.begin(), order.end(), before))  // the pass goes in file order
            std::sort(order.begin(), order.end(), before);
        x_.use_params.resize(uses_.size());
        x_.use_planned.assign(uses_.size(), false);
        covered_.reserve(uses_.size());
        for (std::size_t i : order) {
            const ParamUse& u = uses_[i];
            covered_.emplace_back(u.file, u.begin);
            auto site = [&] { return ParamSite{u.file, u.begin, u.element}; };
            const Analysis& a = analyze(u.file, u.begin, u.end, x_.index.scope_at(u.file, u.begin));
            x_.use_params[i] = a.id;
            if (!u.exponents) {
                mark(a.dims.params, [&] { return "used as " + u.why + site_text(deck_, site()); });
            } else if (a.dims.opaque) {
                mark(a.dims.params,
                     [&] { return "used with " + a.dims.why + site_text(deck_, site()); });
            } else {
                x_.use_planned[i] = true;
                Exponents rhs{Fraction::of(u.exponents->km), Fraction::of(u.exponents->kf)};
                if (fresh(a, -1, rhs))
                    equations(a, {}, rhs, EquationOrigin{true, site(), 0, u.unit});
            }
        }
    }

    void reference(const ParamRef& r) {
        if (std::binary_search(covered_.begin(), covered_.end(),
                               std::make_pair(r.site.file, r.begin)))
            return;
        const Analysis& a = analyze(r.site.file, r.begin, r.end, r.scope);
        if (r.kind == ParamRef::Kind::opaque)
            mark(a.dims.params, [&] { return r.why + site_text(deck_, r.site); });
        else if (a.dims.opaque)
            mark(a.dims.params,
                 [&] { return "used with " + a.dims.why + site_text(deck_, r.site); });
        else if (fresh(a, -1, Exponents{}))  // left as written by the pass, or an .if condition
            equations(a, {}, Exponents{}, EquationOrigin{true, r.site, 0, ""});
    }

    // Uses (recorded ones and references) by their place in the deck, for messages that
    // name the first use that disagrees.
    void in_file_order(std::size_t from) {
        std::vector<std::size_t> idx(x_.equations.size() - from);
        std::iota(idx.begin(), idx.end(), from);
        auto before = [&](std::size_t a, std::size_t b) {
            const auto& sa = x_.origins[a].site;
            const auto& sb = x_.origins[b].site;
            return std::tie(sa.file, sa.offset) < std::tie(sb.file, sb.offset);
        };
        if (std::is_sorted(idx.begin(), idx.end(), before)) return;
        std::stable_sort(idx.begin(), idx.end(), before);
        std::vector<ParamEquation> eqs(x_.equations.begin(), x_.equations.begin() + from);
        std::vector<EquationOrigin> origins(x_.origins.begin(), x_.origins.begin() + from);
        for (std::size_t i : idx) {
            eqs.push_back(std::move(x_.equations[i]));
            origins.push_back(std::move(x_.origins[i]));
        }
        x_.equations = std::move(eqs);
        x_.origins = std::move(origins);
    }

    const Deck& deck_;
    const std::vector<ParamUse>& uses_;
    ParamFacts& x_;
    UnionFind uf_{0};
    int next_ghost_ = 0;
    std::set<int> ambiguous_;
    std::vector<std::pair<std::size_t, std::uint32_t>> covered_;  // recorded uses, sorted
    std::unordered_map<std::string, Analysis> analyses_;
    std::string key_;
    std::set<std::tuple<std::size_t, int, std::int64_t, std::int64_t, std::int64_t, std::int64_t>>
        seen_;
};

}  // namespace

ParamFacts gather_param_facts(const Deck& deck, const std::vector<ParamUse>& uses) {
    ParamFacts facts;
    Gatherer(deck, uses, facts).run();
    return facts;
}

}  // namespace deckscale
