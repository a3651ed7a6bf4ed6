#include "scale/param_index.hpp"

#include <algorithm>
#include <cctype>
#include <set>

#include <fmt/format.h>

#include "base/text_util.hpp"

namespace deckscale {

int ParamIndex::scope_at(std::size_t file, std::uint32_t offset) const {
    if (file >= transitions.size()) return 0;
    const auto& t = transitions[file];
    auto it = std::upper_bound(t.begin(), t.end(), std::make_pair(offset, 1 << 30));
    return it == t.begin() ? 0 : std::prev(it)->second;
}

std::optional<int> ParamIndex::resolve(const std::string& name, int scope,
                                       std::vector<int>& ambiguous) const {
    if (auto it = by_key_.find({scope, name}); it != by_key_.end()) return it->second;
    if (scope == 0) return std::nullopt;  // the top level sees global parameters only
    auto it = by_name_.find(name);
    if (it == by_name_.end()) return std::nullopt;
    if (it->second.size() > 1) ambiguous.insert(ambiguous.end(), it->second.begin(), it->second.end());
    return it->second.front();
}

const UserFunction* ParamIndex::function(const std::string& name) const {
    auto it = functions.find(name);
    return it != functions.end() && it->second.size() == 1 ? &it->second.front() : nullptr;
}

int ParamIndex::param(int scope, const std::string& name, const ParamSite& site,
                      std::string_view written) {
    auto [it, fresh] = by_key_.try_emplace({scope, name}, static_cast<int>(params.size()));
    if (fresh) {
        params.push_back(ParamInfo{scope, name, std::string(written), site});
        by_name_[name].push_back(it->second);
    }
    return it->second;
}

namespace {

bool is_value(TokenKind k) {
    return k == TokenKind::word || k == TokenKind::brace || k == TokenKind::squote;
}

// `key = value` at fields[i]: the value token, or nullptr.
const Token* keyed_value(const Card& c, std::size_t i) {
    const auto& f = c.fields;
    if (f[i].kind != TokenKind::word || i + 2 >= f.size() || f[i + 1].kind != TokenKind::equals ||
        !is_value(f[i + 2].kind))
        return nullptr;
    return &f[i + 2];
}

ParamSite site_of(std::size_t file, const Card& c, std::uint32_t offset) {
    return ParamSite{file, offset, std::string(c.field_text(0))};
}

// Cards whose words are names, files or output variables, never parameter values.
bool names_only(const std::string& kw) {
    static const std::set<std::string> k{".include", ".inc",  ".lib",   ".endl",  ".title",
                                         ".end",     ".ends", ".global", ".save", ".print",
                                         ".plot",    ".probe", ".width", ".else", ".endif",
                                         ".op",      ".func"};
    return k.count(kw) != 0;
}

class Indexer {
public:
    Indexer(const Deck& deck, ParamIndex& index) : deck_(deck), x_(index) {}

    void run() {
        x_.transitions.resize(deck_.files.size());
        for (std::size_t f = 0; f < deck_.files.size(); ++f) definitions(f);
        for (const auto& p : x_.params) names_.insert(p.name);
        for (std::size_t f = 0; f < deck_.files.size(); ++f) uses(f);
    }

private:
    // First pass: scopes, .param and params: definitions, .func.
    void definitions(std::size_t file) {
        std::vector<int> open{0};
        auto& trans = x_.transitions[file];
        deck_.visit_file(file, [&](const Card& c) {
            if (c.kind != CardKind::dot || c.fields.empty()) return;
            std::string kw = card_keyword(c);
            if (kw == ".subckt" && c.fields.size() > 1) {
                int scope = static_cast<int>(x_.scopes.size());
                std::string name = to_lower(c.field_text(1));
                x_.scopes.push_back(ParamScope{name});
                x_.subckts[name].push_back(scope);
                open.push_back(scope);
                trans.emplace_back(c.begin(), scope);
                define_all(file, c, 2, scope);
            } else if (kw == ".ends" && open.size() > 1) {
                open.pop_back();
                trans.emplace_back(c.end(), open.back());
            } else if (kw == ".param") {
                define_all(file, c, 1, open.back());
            } else if (kw == ".func") {
                function(c);
            } else if ((kw == ".include" || kw == ".inc" || kw == ".lib") && open.size() > 1 &&
                       x_.no_plan.empty()) {
                auto pos = c.file->position(c.begin());
                x_.no_plan = fmt::format("{} inside a .subckt at {}:{} brings in cards whose scope "
                                         "deckscale does not follow",
                                         c.field_text(0), c.file->path(), pos.line);
            }
        });
    }

    void define_all(std::size_t file, const Card& c, std::size_t first, int scope) {
        for (std::size_t i = first; i < c.fields.size(); ++i) {
            const Token* v = keyed_value(c, i);
            if (!v) continue;
            std::string name = to_lower(c.field_text(i));
            ParamSite site = site_of(file, c, c.fields[i].begin);
            int id = x_.param(scope, name, site, c.field_text(i));
            x_.definitions.push_back(ParamDefinition{id, site, *v, scope});
            i += 2;
        }
    }

    // .func name(a, b) {body} or .func name(a, b) = body
    void function(const Card& c) {
        const auto& f = c.fields;
        if (f.size() < 4 || f[1].kind != TokenKind::word || f[2].kind != TokenKind::lparen) return;
        UserFunction fn;
        std::size_t i = 3;
        for (; i < f.size() && f[i].kind != TokenKind::rparen; ++i)
            if (f[i].kind == TokenKind::word) fn.args.push_back(to_lower(c.field_text(i)));
        ++i;
        if (i < f.size() && f[i].kind == TokenKind::equals) ++i;
        if (i >= f.size()) return;
        std::string_view body = c.file->view(f[i].begin, f.back().end);
        if (i + 1 == f.size() && (f[i].kind == TokenKind::brace || f[i].kind == TokenKind::squote))
            body = body.substr(1, body.size() - 2);
        x_.functions[to_lower(c.field_text(1))].push_back(std::move(fn));
        x_.functions[to_lower(c.field_text(1))].back().body = std::string(body);
    }

    // Second pass: X-line overrides and every other value.
    void uses(std::size_t file) {
        deck_.visit_file(file, [&](const Card& c) {
            if (c.kind == CardKind::control) {
                control(file, c);
                return;
            }
            if (c.fields.empty() || (c.kind != CardKind::element && c.kind != CardKind::dot))
                return;
            int scope = x_.scope_at(file, c.begin());
            if (c.kind == CardKind::element) {
                if (ascii_lower(c.field_text(0)[0]) == 'x')
                    instance(file, c, scope);
                else
                    values(file, c, 1, scope);
                return;
            }
            std::string kw = card_keyword(c);
            if (names_only(kw) || kw == ".param" || kw == ".subckt") return;
            if (kw == ".if" || kw == ".elseif") {
                if (c.fields.size() > 1)
                    ref(file, c, ParamRef::Kind::condition, c.fields[1].begin, c.fields.back().end,
                        scope, "");
            } else if (kw == ".csparam") {
                for (std::size_t i = 1; i < c.fields.size(); ++i)
                    if (const Token* v = keyed_value(c, i))
                        ref(file, c, ParamRef::Kind::opaque, v->begin, v->end, scope,
                            "copied by .csparam for .control scripts");
            } else {
                values(file, c, kw == ".model" ? 3 : 1, scope);
            }
        });
    }

    // Values of an element or dot card: every {expr}, 'expr' and word naming a parameter.
    void values(std::size_t file, const Card& c, std::size_t first, int scope) {
        const auto& f = c.fields;
        for (std::size_t i = first; i < f.size(); ++i) {
            bool key = i + 1 < f.size() && f[i + 1].kind == TokenKind::equals;
            bool expr = f[i].kind == TokenKind::brace || f[i].kind == TokenKind::squote;
            bool name = f[i].kind == TokenKind::word && !key && names_.count(to_lower(c.field_text(i)));
            if (expr || name)
                ref(file, c, ParamRef::Kind::value, f[i].begin, f[i].end, scope, "");
        }
    }

    // X name nodes... subckt [params:] key=value...: overrides define the subcircuit's
    // parameters; their expressions are read where the X line is.
    void instance(std::size_t file, const Card& c, int scope) {
        const auto& f = c.fields;
        std::string subckt;
        std::size_t i = 1;
        for (; i < f.size() && !keyed_value(c, i); ++i)
            if (f[i].kind == TokenKind::word && !iequals(c.field_text(i), "params:"))
                subckt = to_lower(c.field_text(i));
        auto defs = x_.subckts.find(subckt);
        for (; i < f.size(); ++i) {
            const Token* v = keyed_value(c, i);
            if (!v) {
                if (f[i].kind == TokenKind::brace || f[i].kind == TokenKind::squote)
                    ref(file, c, ParamRef::Kind::value, f[i].begin, f[i].end, scope, "");
                continue;
            }
            std::string key = to_lower(c.field_text(i));
            ParamSite site = site_of(file, c, f[i].begin);
            bool defined = false;
            if (defs != x_.subckts.end())
                for (int s : defs->second)
                    if (x_.has_param(s, key)) {
                        int id = x_.param(s, key, site, c.field_text(i));
                        x_.definitions.push_back(ParamDefinition{id, site, *v, scope});
                        defined = true;
                    }
            if (defined)
                ;
            else if (defs == x_.subckts.end())
                ref(file, c, ParamRef::Kind::opaque, v->begin, v->end, scope,
                    fmt::format("given to '{}', a subcircuit this deck does not define", subckt));
            else
                ref(file, c, ParamRef::Kind::value, v->begin, v->end, scope, "");
            i += 2;
        }
    }

    // Words of a .control block that name a parameter (alterparam, let, echo $&...).
    void control(std::size_t file, const Card& c) {
        std::string_view s = c.file->view(c.begin(), c.end());
        std::size_t i = 0;
        while (i < s.size()) {
            if (!std::isalpha(static_cast<unsigned char>(s[i])) && s[i] != '_') {
                ++i;
                continue;
            }
            std::size_t j = i;
            while (j < s.size() && (std::isalnum(static_cast<unsigned char>(s[j])) || s[j] == '_'))
                ++j;
            bool word_start = i == 0 || !(std::isalnum(static_cast<unsigned char>(s[i - 1])) ||
                                          s[i - 1] == '.');
            std::string name = to_lower(s.substr(i, j - i));
            if (word_start && names_.count(name))
                x_.control_words.emplace_back(
                    name, ParamSite{file, static_cast<std::uint32_t>(c.begin() + i), ".control"});
            i = j;
        }
    }

    void ref(std::size_t file, const Card& c, ParamRef::Kind kind, std::uint32_t begin,
             std::uint32_t end, int scope, std::string why) {
        x_.refs.push_back(ParamRef{kind, site_of(file, c, begin), begin, end, scope, std::move(why)});
    }

    const Deck& deck_;
    ParamIndex& x_;
    std::set<std::string> names_;
};

}  // namespace

ParamIndex index_params(const Deck& deck) {
    ParamIndex index;
    Indexer(deck, index).run();
    return index;
}

}  // namespace deckscale
