#include "values/snap_params.hpp"

#include <fmt/format.h>

#include <cctype>
#include <cmath>
#include <optional>
#include <set>

#include "base/text_util.hpp"
#include "deck/param_eval.hpp"
#include "deck/spice_number.hpp"
#include "scale/param_dims.hpp"
#include "scale/param_index.hpp"

namespace deckscale {
namespace {

using Key = std::pair<std::size_t, std::uint32_t>;

std::string_view inner(std::string_view text) {
    if (text.size() >= 2 && ((text.front() == '{' && text.back() == '}') ||
                             (text.front() == '\'' && text.back() == '\'')))
        text = text.substr(1, text.size() - 2);
    while (!text.empty() && std::isspace(static_cast<unsigned char>(text.front())))
        text.remove_prefix(1);
    while (!text.empty() && std::isspace(static_cast<unsigned char>(text.back())))
        text.remove_suffix(1);
    return text;
}

bool identifier(std::string_view s) {
    if (s.empty() || !(std::isalpha(static_cast<unsigned char>(s[0])) || s[0] == '_')) return false;
    for (char c : s)
        if (!(std::isalnum(static_cast<unsigned char>(c)) || c == '_')) return false;
    return true;
}

const char* kind_name(char kind) {
    return kind == 'r' ? "resistor" : kind == 'c' ? "capacitor" : "inductor";
}

class Planner {
  public:
    Planner(const Deck& deck, const std::vector<ParamValueUse>& uses) : deck_(deck) {
        for (const auto& u : uses) by_token_[{u.file, u.begin}] = &u;
    }

    ParamSnapPlan run() {
        idx_ = index_params(deck_);
        std::size_t n = idx_.params.size();
        why_.assign(n, "");
        uses_.assign(n, {});
        definitions_.assign(n, {});
        for (const auto& r : idx_.refs) reference(r);
        for (const auto& d : idx_.definitions) {
            definitions_[d.param].push_back(&d);
            for (int p : names(d.site.file, d.value.begin, d.value.end, d.scope))
                if (p != d.param)
                    mark(p, fmt::format("is used in the definition of {}{}",
                                        idx_.params[d.param].written, site(d.site)));
        }
        for (const auto& [name, where] : idx_.control_words)
            for (std::size_t p = 0; p < n; ++p)
                if (idx_.params[p].name == name)
                    mark(static_cast<int>(p), "is used in a .control block" + site(where));
        for (int p : ambiguous_) mark(p, "has its name defined in more than one scope");
        if (!idx_.no_plan.empty())
            for (std::size_t p = 0; p < n; ++p)
                mark(static_cast<int>(p), "cannot be followed: " + idx_.no_plan);
        ParamSnapPlan plan;
        std::vector<int> slot(n, -1);
        for (std::size_t p = 0; p < n; ++p) {
            if (uses_[p].empty()) continue;
            check(static_cast<int>(p));
            if (!why_[p].empty()) continue;
            const ParamDefinition& d = *definitions_[p].front();
            SnappableParam s;
            s.name = idx_.params[p].written;
            s.file = d.site.file;
            s.begin = d.value.begin;
            s.end = d.value.end;
            s.value = value_;
            s.kind = uses_[p].front()->kind;
            for (const auto* u : uses_[p]) s.elements.push_back(u->element);
            slot[p] = static_cast<int>(plan.params.size());
            plan.params.push_back(std::move(s));
        }
        for (const auto& [key, p] : whole_) {
            plan.use_of[key] = p < 0 ? -1 : slot[p];
            if (p >= 0 && slot[p] < 0)
                plan.why[key] =
                    fmt::format("parameter {}, which {}", idx_.params[p].written, why_[p]);
        }
        return plan;
    }

  private:
    std::set<int> names(std::size_t file, std::uint32_t begin, std::uint32_t end, int scope) {
        std::string_view text = inner(deck_.files[file].source->view(begin, end));
        DimContext context{
            [&](const std::string& name) { return idx_.resolve(name, scope, ambiguous_); },
            [&](const std::string& name) { return idx_.function(name); }};
        return analyze_dims(text, context).params;
    }

    std::string site(const ParamSite& s) const {
        const SourceFile& f = *deck_.files[s.file].source;
        return fmt::format(" ({}, {}:{})", s.element, f.path(), f.position(s.offset).line);
    }

    void mark(int p, const std::string& why) {
        if (why_[p].empty()) why_[p] = why;
    }

    void reference(const ParamRef& r) {
        Key key{r.site.file, r.begin};
        auto use = by_token_.find(key);
        std::optional<int> whole;
        if (use != by_token_.end() && r.kind == ParamRef::Kind::value) {
            std::string_view name = inner(deck_.files[r.site.file].source->view(r.begin, r.end));
            if (identifier(name))
                whole = idx_.resolve(to_lower(std::string(name)), r.scope, ambiguous_);
            whole_[key] = whole.value_or(-1);
        }
        for (int p : names(r.site.file, r.begin, r.end, r.scope)) {
            if (whole && *whole == p) {
                uses_[p].push_back(use->second);
                continue;
            }
            std::string_view text = deck_.files[r.site.file].source->view(r.begin, r.end);
            mark(p, r.kind == ParamRef::Kind::condition
                        ? "decides an .if" + site(r.site)
                        : fmt::format("is also used in '{}'{}", text, site(r.site)));
        }
    }

    // Sets why_[p] if the parameter cannot be rounded at its definition; else value_.
    void check(int p) {
        const ParamInfo& info = idx_.params[p];
        if (info.scope != 0) {
            mark(p, fmt::format("is a parameter of subcircuit {}", idx_.scopes[info.scope].subckt));
            return;
        }
        if (definitions_[p].size() != 1) {
            mark(p, definitions_[p].empty() ? std::string("is not defined by a .param card")
                                            : std::string("is defined more than once"));
            return;
        }
        const ParamDefinition& d = *definitions_[p].front();
        if (!iequals(d.site.element, ".param")) {
            mark(p, "is not defined by a .param card" + site(d.site));
            return;
        }
        std::string_view text = deck_.files[d.site.file].source->view(d.value.begin, d.value.end);
        NumberParse number = parse_spice_number(text);
        auto evaluated = evaluate_param_expression(
            text, [](const std::string&) { return std::optional<double>(); });
        // A number the parameter reader and the element-line reader read alike ('1mil' is
        // 1e-3 in a .param but 25.4e-6 on an element line).
        if (d.value.kind != TokenKind::word || !number.number ||
            number.problem != NumberProblem::none || !evaluated || !(number.number->value > 0) ||
            std::fabs(*evaluated - number.number->value) > 1e-12 * number.number->value) {
            mark(p, fmt::format("is defined as '{}', not as a plain number{}", text, site(d.site)));
            return;
        }
        for (const auto* u : uses_[p])
            if (u->kind != uses_[p].front()->kind) {
                mark(p, fmt::format("is the value of both a {} ({}) and a {} ({})",
                                    kind_name(uses_[p].front()->kind), uses_[p].front()->element,
                                    kind_name(u->kind), u->element));
                return;
            }
        value_ = number.number->value;
    }

    const Deck& deck_;
    std::map<Key, const ParamValueUse*> by_token_;
    ParamIndex idx_;
    std::set<int> ambiguous_;
    std::vector<std::string> why_;
    std::vector<std::vector<const ParamValueUse*>> uses_;
    std::vector<std::vector<const ParamDefinition*>> definitions_;
    std::map<Key, int> whole_;  // whole-value uses: the parameter named, or -1
    double value_ = 0;
};

}  // namespace

ParamSnapPlan plan_param_snap(const Deck& deck, const std::vector<ParamValueUse>& uses) {
    if (uses.empty()) return {};
    return Planner(deck, uses).run();
}

}  // namespace deckscale
