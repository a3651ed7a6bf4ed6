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
                                       std::set<int>& ambiguous) const {
    if (auto it = by_key_.find({scope, name}); it != by_key_.end()) return it->second;
    if (scope == 0) return std::nullopt;  // the top level sees global parameters only
    auto it = by_name_.find(name);
    if (it == by_name_.end()) return std::nullopt;
    if (it->second.size() > 1) ambiguous.insert(it->second.begin(), it->second.end());
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
    static const std::set<std::string> k{
        ".include", ".inc",  ".lib",   ".endl",  ".title", ".end",   ".ends", ".global", ".save",
        ".print",   ".plot", ".probe", ".width", ".else",  ".endif", ".op",   ".func"};
    return k.count(kw) != 0;
}

class Indexer {
public:
    Indexer(const Deck& deck, ParamIndex& index) : deck_(deck), x_(index) {}

    // One reading of each file (a reading runs the grammar again); X lines wait until every
    // subcircuit is known, since they may come before their .subckt.
    void run() {
        x_.transitions.resize(deck_.files.size());
        for (std::size_t f = 0; f < deck_.files.size(); ++f) read(f);
        for (const auto& x : instances_) instance(x);
    }

private:
    struct Override {
        std::string key;  // lower case
        std::string written;
        ParamSite site;
        Token value{};
    };
    // What an X line says, kept beyond the card.
    struct Instance {
        std::size_t file = 0;
        int scope = 0;
        std::string subckt;
        std::vector<Override> overrides;
        std::vector<ParamRef> braces;  // {..} fields that are not overrides
    };

    void read(std::size_t file) {
        std::vector<int> open{0};
        auto& trans = x_.transitions[file];
        deck_.visit_file(file, [&](const Card& c) {
            if (c.kind == CardKind::control) return control(file, c);
            if (c.fields.empty() || (c.kind != CardKind::element && c.kind != CardKind::dot))
                return;
            int scope = open.back();
            if (c.kind == CardKind::element) {
                if (ascii_lower(c.field_text(0)[0]) == 'x')
                    instances_.push_back(instance_of(file, c, scope));
                else
                    values(file, c, 1, scope);
                return;
            }
            std::string kw = card_keyword(c);
            if (kw == ".subckt" && c.fields.size() > 1) {
                int inner = static_cast<int>(x_.scopes.size());
                std::string name = to_lower(c.field_text(1));
                x_.scopes.push_back(ParamScope{name});
                x_.subckts[name].push_back(inner);
                open.push_back(inner);
                trans.emplace_back(c.begin(), inner);
                define_all(file, c, 2, inner);
            } else if (kw == ".ends" && open.size() > 1) {
                open.pop_back();
                trans.emplace_back(c.end(), open.back());
            } else if (kw == ".param") {
                define_all(file, c, 1, scope);
            } else if (kw == ".func") {
                function(c);
            } else if ((kw == ".include" || kw == ".inc" || kw == ".lib") && open.size() > 1) {
                if (x_.no_plan.empty())
                    x_.no_plan = fmt::format(
                        "{} inside a .subckt at {}:{} brings in cards whose "
                        "scope deckscale does not follow",
                        c.field_text(0), c.file->path(), c.file->position(c.begin()).line);
            } else if (kw == ".if" || kw == ".elseif") {
                if (c.fields.size() > 1)
                    ref(file, c, ParamRef::Kind::condition, c.fields[1].begin, c.fields.back().end,
                        scope, "");
            } else if (kw == ".csparam") {
                for (std::size_t i = 1; i < c.fields.size(); ++i)
                    if (const Token* v = keyed_value(c, i))
                        ref(file, c, ParamRef::Kind::opaque, v->begin, v->end, scope,
                            "copied by .csparam for .control scripts");
            } else if (!names_only(kw) && kw != ".subckt") {
                values(file, c, kw == ".model" ? 3 : 1, scope);
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

    // Values of an element or dot card: every {expr}, 'expr' and word naming a parameter.
    void values(std::size_t file, const Card& c, std::size_t first, int scope) {
        const auto& f = c.fields;
        for (std::size_t i = first; i < f.size(); ++i) {
            bool key = i + 1 < f.size() && f[i + 1].kind == TokenKind::equals;
            bool expr = f[i].kind == TokenKind::brace || f[i].kind == TokenKind::squote;
            bool name = f[i].kind == TokenKind::word && !key && named(c.field_text(i));
            if (expr || name) ref(file, c, ParamRef::Kind::value, f[i].begin, f[i].end, scope, "");
        }
    }

    // X name nodes... subckt [params:] key=value...: overrides define the subcircuit's
    // parameters; their expressions are read where the X line is.
    Instance instance_of(std::size_t file, const Card& c, int scope) {
        const auto& f = c.fields;
        Instance x{file, scope, "", {}, {}};
        std::size_t i = 1;
        for (; i < f.size() && !keyed_value(c, i); ++i)
            if (f[i].kind == TokenKind::word && !iequals(c.field_text(i), "params:"))
                x.subckt = to_lower(c.field_text(i));
        for (; i < f.size(); ++i) {
            if (const Token* v = keyed_value(c, i)) {
                x.overrides.push_back(Override{to_lower(c.field_text(i)),
                                               std::string(c.field_text(i)),
                                               site_of(file, c, f[i].begin), *v});
                i += 2;
            } else if (f[i].kind == TokenKind::brace || f[i].kind == TokenKind::squote) {
                x.braces.push_back(ParamRef{ParamRef::Kind::value, site_of(file, c, f[i].begin),
                                            f[i].begin, f[i].end, scope, ""});
            }
        }
        return x;
    }

    void instance(const Instance& x) {
        for (const auto& r : x.braces) x_.refs.push_back(r);
        auto defs = x_.subckts.find(x.subckt);
        for (const auto& o : x.overrides) {
            bool defined = false;
            if (defs != x_.subckts.end())
                for (int s : defs->second)
                    if (x_.has_param(s, o.key)) {
                        int id = x_.param(s, o.key, o.site, o.written);
                        x_.definitions.push_back(ParamDefinition{id, o.site, o.value, x.scope});
                        defined = true;
                    }
            if (defined) continue;
            ParamRef r{ParamRef::Kind::value, o.site, o.value.begin, o.value.end, x.scope, ""};
            if (defs == x_.subckts.end()) {
                r.kind = ParamRef::Kind::opaque;
                r.why =
                    fmt::format("given to '{}', a subcircuit this deck does not define", x.subckt);
            }
            x_.refs.push_back(std::move(r));
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
            bool word_start =
                i == 0 || !(std::isalnum(static_cast<unsigned char>(s[i - 1])) || s[i - 1] == '.');
            std::string name = to_lower(s.substr(i, j - i));
            if (word_start && deck_.symbols.params.count(name))
                x_.control_words.emplace_back(
                    name, ParamSite{file, static_cast<std::uint32_t>(c.begin() + i), ".control"});
            i = j;
        }
    }

    void ref(std::size_t file, const Card& c, ParamRef::Kind kind, std::uint32_t begin,
             std::uint32_t end, int scope, std::string why) {
        x_.refs.push_back(
            ParamRef{kind, site_of(file, c, begin), begin, end, scope, std::move(why)});
    }

    // A word that is some parameter's name (numbers and most nodes are not).
    bool named(std::string_view w) {
        if (w.empty() || !(std::isalpha(static_cast<unsigned char>(w[0])) || w[0] == '_'))
            return false;
        lower_.assign(w);
        for (char& ch : lower_) ch = ascii_lower(ch);
        return deck_.symbols.params.count(lower_) != 0;
    }

    const Deck& deck_;
    ParamIndex& x_;
    std::string lower_;
    std::vector<Instance> instances_;
};

}  // namespace

ParamIndex index_params(const Deck& deck) {
    ParamIndex index;
    Indexer(deck, index).run();
    return index;
}

}  // namespace deckscale
