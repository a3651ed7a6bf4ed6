#include "scale/control_units.hpp"

#include <fmt/format.h>

#include <array>
#include <cctype>
#include <cmath>
#include <map>
#include <optional>
#include <string_view>
#include <unordered_set>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/control.hpp"

namespace deckscale {
namespace {

bool same(UnitExponents a, UnitExponents b) { return a.km == b.km && a.kf == b.kf; }
constexpr UnitExponents kPure{0, 0};

std::string unit_text(UnitExponents e) {
    if (same(e, kPure)) return "volts or pure numbers";
    for (Unit u : {Unit::ampere, Unit::ohm, Unit::second, Unit::hertz, Unit::farad, Unit::henry})
        if (same(exponents(u), e)) return std::string(unit_name(u));
    return fmt::format("Km^{} Kf^{}", e.km, e.kf);
}

// Units as slots that the expressions unite (union-find): every number and every variable
// has one; a slot ends bound to exponents, unbound, or bad (with a reason).
class Slots {
public:
    int make(bool variable = false) {
        parent_.push_back(static_cast<int>(parent_.size()));
        dim_.emplace_back();
        why_.emplace_back();
        product_.push_back(false);
        variable_.push_back(variable);
        return parent_.back();
    }
    int find(int s) {
        while (parent_[s] != s) s = parent_[s] = parent_[parent_[s]];
        return s;
    }
    void bind(int s, UnitExponents e) {
        s = find(s);
        if (dim_[s] && !same(*dim_[s], e))
            fail(s, fmt::format("it meets quantities of two units ({} and {})",
                                unit_text(*dim_[s]), unit_text(e)));
        else
            dim_[s] = e;
    }
    void unite(int a, int b) {
        a = find(a);
        b = find(b);
        if (a == b) return;
        parent_[b] = a;
        product_[a] = product_[a] || product_[b];
        variable_[a] = variable_[a] || variable_[b];
        if (why_[a].empty()) why_[a] = why_[b];
        if (dim_[b]) bind(a, *dim_[b]);
    }
    void fail(int s, std::string why) {
        s = find(s);
        if (why_[s].empty()) why_[s] = std::move(why);
    }
    void mark_product(int s) { product_[find(s)] = true; }
    // The unit bound to s so far, unless s is bad.
    std::optional<UnitExponents> bound(int s) {
        s = find(s);
        if (!why_[s].empty()) return std::nullopt;
        return dim_[s];
    }
    // The slot met a quantity through a product: unless something else binds it, its unit
    // is not known.
    void met(int s, std::string why) {
        met_.resize(parent_.size());
        if (met_[s].empty()) met_[s] = std::move(why);
    }
    void resolve_met() {
        met_.resize(parent_.size());
        for (std::size_t s = 0; s < met_.size(); ++s)
            if (!met_[s].empty() && !dim_[find(static_cast<int>(s))])
                fail(static_cast<int>(s), met_[s]);
    }

    // A slot with a variable and no unit: what its numbers are is told by nothing here.
    bool free_variable(int s) {
        s = find(s);
        return variable_[s] && !dim_[s] && why_[s].empty();
    }

    // The outcome for a number of slot s.
    void resolve(int s, ExpressionLiteral& l) {
        s = find(s);
        if (!why_[s].empty()) {
            l.why = why_[s];
            return;
        }
        UnitExponents e = dim_[s].value_or(kPure);  // unbound: never meets the circuit
        if (product_[s] && !same(e, kPure)) {
            l.why = "it is one factor of a product of numbers that has a unit: which factor "
                    "carries it is not known";
            return;
        }
        l.exponents = e;
    }

private:
    std::vector<int> parent_;
    std::vector<std::optional<UnitExponents>> dim_;
    std::vector<std::string> why_;
    std::vector<bool> product_;
    std::vector<bool> variable_;
    std::vector<std::string> met_;
};

// What a subexpression is: a quantity of known unit, a slot (numbers and variables whose
// unit is to be found), a number times or over a quantity of known unit (`scaled`: its unit
// is k * unit(slot) + e, k = +1 or -1, so what it meets tells the number's unit: the 1m in
// exp(-time/1m) is a time), or opaque (a unit not known here).
struct Term {
    enum Kind { fixed, slot, scaled, opaque } kind = opaque;
    int k = 1;  // scaled: the sign of the number's unit in the term's
    UnitExponents e{0, 0};
    int s = -1;
    bool constant = false;  // made of numbers and pi only
    bool pi = false;        // holds the constant pi
    std::string name;       // for opaque terms: what is not known
    int var = -1;  // a fixed term read from a variable, or a scaled term of one: its slot
};

Term fixed(UnitExponents e, bool constant = false) {
    Term t;
    t.kind = Term::fixed;
    t.e = e;
    t.constant = constant;
    return t;
}

Term opaque(std::string name) {
    Term t;
    t.kind = Term::opaque;
    t.name = std::move(name);
    return t;
}

struct Lexeme {
    enum Kind { number, name, op, open, close, lbrack, rbrack, comma, end, bad } kind = end;
    std::string_view text;
    std::uint32_t begin = 0;  // file offset
};

bool name_start(char c) {
    return std::isalpha(static_cast<unsigned char>(c)) || c == '_' || c == '$' || c == '@';
}

bool name_char(char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '#' || c == '.';
}

class Reader {
public:
    Reader(std::string_view text, std::uint32_t base, Slots& slots,
           const std::map<std::string, int>& variables,
           std::vector<std::pair<Token, int>>& numbers)
        : text_(text), base_(base), slots_(slots), vars_(variables), numbers_(numbers) {
        next();
    }

    // The whole text as one expression; false when it is not one this reader knows.
    bool read(Term& out) {
        out = settle(disjunction());
        return ok_ && cur_.kind == Lexeme::end;
    }

private:
    // ---- lexer ----
    void next() {
        while (pos_ < text_.size() && std::isspace(static_cast<unsigned char>(text_[pos_])))
            ++pos_;
        cur_ = Lexeme{};
        cur_.begin = base_ + static_cast<std::uint32_t>(pos_);
        if (pos_ >= text_.size()) return;
        std::size_t start = pos_;
        char c = text_[pos_];
        auto digit = [&](std::size_t i) {
            return i < text_.size() && std::isdigit(static_cast<unsigned char>(text_[i]));
        };
        if (digit(pos_) || (c == '.' && digit(pos_ + 1))) {
            // Digits, '.', letters (a suffix and unit tail) and an exponent's sign.
            while (pos_ < text_.size()) {
                char ch = ascii_lower(text_[pos_]);
                bool sign = (ch == '+' || ch == '-') && pos_ >= start + 2 &&
                            ascii_lower(text_[pos_ - 1]) == 'e' && digit(pos_ - 2);
                if (!(sign || ch == '.' || ch == '_' || std::isalnum(static_cast<unsigned char>(ch))))
                    break;
                ++pos_;
            }
            cur_.kind = Lexeme::number;
        } else if (name_start(c)) {
            ++pos_;
            if (c == '$' && pos_ < text_.size() && text_[pos_] == '&') ++pos_;  // $&vector
            while (pos_ < text_.size() && name_char(text_[pos_])) ++pos_;
            // @dev[param] and {$var} are one name.
            if (c == '@' && pos_ < text_.size() && text_[pos_] == '[') {
                std::size_t close = text_.find(']', pos_);
                pos_ = close == std::string_view::npos ? text_.size() : close + 1;
            }
            cur_.kind = Lexeme::name;
        } else {
            ++pos_;
            switch (c) {
                case '(': cur_.kind = Lexeme::open; break;
                case ')': cur_.kind = Lexeme::close; break;
                case '[': cur_.kind = Lexeme::lbrack; break;
                case ']': cur_.kind = Lexeme::rbrack; break;
                case ',': cur_.kind = Lexeme::comma; break;
                case '+': case '-': case '*': case '/': case '%': case '^': case '~': case ':':
                    cur_.kind = Lexeme::op;
                    break;
                case '<': case '>': case '=': case '!': case '&': case '|':
                    if (pos_ < text_.size() && (text_[pos_] == '=' || text_[pos_] == '>' ||
                                                text_[pos_] == '&' || text_[pos_] == '|'))
                        ++pos_;
                    cur_.kind = Lexeme::op;
                    break;
                default: cur_.kind = Lexeme::bad;
            }
        }
        cur_.text = text_.substr(start, pos_ - start);
    }

    bool at_op(std::initializer_list<std::string_view> ops) const {
        if (cur_.kind != Lexeme::op && cur_.kind != Lexeme::name) return false;
        for (auto o : ops)
            if (iequals(cur_.text, o)) return true;
        return false;
    }

    // ---- what operators do to units ----
    // a + b, a - b, a < b, ...: both have one unit.
    Term same_unit(Term a, Term b) {
        bool constant = a.constant && b.constant;
        if (a.kind == Term::scaled && b.kind == Term::fixed) {
            bind_term(a, b.e);
            a = b;
        } else if (b.kind == Term::scaled && a.kind == Term::fixed) {
            bind_term(b, a.e);
            b = a;
        }
        a = settle(a);
        b = settle(b);
        if (a.kind == Term::opaque || b.kind == Term::opaque) {
            const Term& o = a.kind == Term::opaque ? a : b;
            const Term& other = a.kind == Term::opaque ? b : a;
            if (other.kind == Term::slot)
                slots_.fail(other.s, fmt::format("it meets '{}', whose unit is not known here",
                                                 o.name));
            return o;
        }
        if (a.kind == Term::fixed && b.kind == Term::fixed && !same(a.e, b.e)) {
            // Two circuit quantities of different units are the deck's own affair; a
            // variable that meets two units is not known.
            for (int var : {a.var, b.var})
                if (var >= 0)
                    slots_.fail(var, fmt::format("it meets quantities of two units ({} and {})",
                                                    unit_text(a.e), unit_text(b.e)));
        } else if (a.kind == Term::fixed && b.kind == Term::slot)
            slots_.bind(b.s, a.e);
        else if (a.kind == Term::slot && b.kind == Term::fixed)
            slots_.bind(a.s, b.e), a = b;
        else if (a.kind == Term::slot && b.kind == Term::slot)
            slots_.unite(a.s, b.s);
        a.constant = constant;
        return a;
    }

    // A term that must have unit e: its numbers take what that leaves them.
    void bind_term(const Term& t, UnitExponents e) {
        if (t.kind == Term::slot) slots_.bind(t.s, e);
        if (t.kind == Term::scaled)
            slots_.bind(t.s, {t.k * (e.km - t.e.km), t.k * (e.kf - t.e.kf)});
    }

    // A term that must be a pure number (an index, an exponent, a function's argument).
    void pure(const Term& t) { bind_term(t, kPure); }

    // A number times or over a quantity that nothing else tells the unit of: a coefficient,
    // taken as a pure number (noted unless it is a multiple of pi).
    Term settle(const Term& t) {
        if (t.kind != Term::scaled) return t;
        slots_.bind(t.s, kPure);
        coefficient_slots_.push_back({t.s, !t.pi && t.var < 0});
        return fixed(t.e);
    }

    // a * b (sign +1) or a / b (sign -1).
    Term product(Term a, Term b, int sign) {
        a = settle(a);
        b = settle(b);
        if (a.kind == Term::fixed && b.kind == Term::fixed)
            return fixed({a.e.km + sign * b.e.km, a.e.kf + sign * b.e.kf},
                         a.constant && b.constant);
        if (a.constant && b.constant) {
            // Numbers (and pi) alone: one slot for the product, whose unit no factor carries
            // alone unless it is pure.
            if (a.kind == Term::fixed) std::swap(a, b);  // pi * 2 -> 2 * pi
            if (b.kind == Term::slot) {
                slots_.unite(a.s, b.s);
                slots_.mark_product(a.s);
            }
            a.pi = a.pi || b.pi;
            return a;
        }
        for (Term* c : {&a, &b}) {
            Term* other = c == &a ? &b : &a;
            if (!c->constant || other->constant) continue;
            if (c->kind == Term::slot && other->kind == Term::fixed) {
                // A number times or over a quantity: what the product meets tells its unit.
                Term t;
                t.kind = Term::scaled;
                t.s = c->s;
                t.pi = c->pi;
                t.k = c == &b && sign < 0 ? -1 : 1;
                int ko = c == &a && sign < 0 ? -1 : 1;
                t.e = {ko * other->e.km, ko * other->e.kf};
                t.var = other->var;  // the quantity is a variable's: no note when it settles
                return t;
            }
            // A coefficient of a variable: the product has the variable's unit, so anything
            // else it meets with another unit is caught there; no note. Of what is not known
            // here: not known either (the product may end where no number shows, as the
            // value an `alter` reads by name).
            if (c->kind == Term::slot && other->kind == Term::opaque)
                slots_.fail(c->s, fmt::format("it multiplies or divides '{}', whose unit is not "
                                              "known here",
                                              other->name));
            else if (c->kind == Term::slot)
                slots_.bind(c->s, kPure);
            Term r = *other;
            if (r.kind == Term::fixed && c == &b && sign < 0) return r;
            if (r.kind == Term::fixed && c == &a && sign < 0)
                return fixed({-r.e.km, -r.e.kf});
            if (r.kind == Term::slot && c == &a && sign < 0) return opaque("1/" + r.name);
            return r;
        }
        for (const Term* t : {&a, &b})
            if (t->kind == Term::slot)
                slots_.met(t->s, fmt::format("its variable '{}' is multiplied or divided by "
                                             "another quantity, and a variable's unit is not "
                                             "followed through a product",
                                             t->name));
        if (a.kind == Term::opaque) return a;
        if (b.kind == Term::opaque) return b;
        return opaque("a product of variables");
    }

    // ---- grammar ----
    // Nesting deeper than this (parentheses, signs, 'not's) is not read: no recursion can
    // run the stack out, whatever the deck holds.
    static constexpr int kMaxDepth = 200;
    struct Nest {
        Reader& r;
        explicit Nest(Reader& reader) : r(reader) {
            if (++r.depth_ > kMaxDepth) r.ok_ = false;
        }
        ~Nest() { --r.depth_; }
    };

    Term disjunction() {
        Nest nest(*this);
        if (!ok_) return opaque("?");
        Term t = conjunction();
        while (ok_ && at_op({"or", "|", "||"})) {
            next();
            conjunction();
            t = fixed(kPure);
        }
        return t;
    }
    Term conjunction() {
        Term t = negation();
        while (ok_ && at_op({"and", "&", "&&"})) {
            next();
            negation();
            t = fixed(kPure);
        }
        return t;
    }
    Term negation() {
        Nest nest(*this);
        if (!ok_) return opaque("?");
        if (at_op({"not", "~", "!"})) {
            next();
            negation();
            return fixed(kPure);
        }
        return comparison();
    }
    Term comparison() {
        Term t = sum();
        while (ok_ && at_op({"<", ">", "<=", ">=", "=", "==", "<>", "!=", "gt", "lt", "ge",
                             "le", "eq", "ne"})) {
            next();
            same_unit(t, sum());
            t = fixed(kPure);
        }
        return t;
    }
    Term sum() {
        Term t = term();
        while (ok_ && at_op({"+", "-"})) {
            next();
            t = same_unit(t, term());
        }
        return t;
    }
    Term term() {
        Term t = unary();
        while (ok_ && at_op({"*", "/", "%"})) {
            int sign = cur_.text == "/" ? -1 : 1;
            bool modulo = cur_.text == "%";
            next();
            Term r = unary();
            t = modulo ? same_unit(t, r) : product(t, r, sign);
        }
        return t;
    }
    Term unary() {
        Nest nest(*this);
        if (!ok_) return opaque("?");
        if (at_op({"-", "+"})) {
            next();
            return unary();
        }
        return power();
    }
    Term power() {
        Term base = postfix();
        if (ok_ && at_op({"^"})) base = settle(base);
        if (!ok_ || !at_op({"^"})) return base;
        next();
        std::string_view exponent = cur_.kind == Lexeme::number ? cur_.text : "";
        Term e = unary();
        pure(e);
        auto number = parse_spice_number(exponent).number;
        double x = number ? number->value : 0.5;
        if (base.kind == Term::fixed && std::fabs(x) <= 8 && x == std::floor(x)) {
            int n = static_cast<int>(x);
            return fixed({base.e.km * n, base.e.kf * n}, base.constant && e.constant);
        }
        if (base.kind == Term::fixed && same(base.e, kPure)) return base;
        if (base.kind == Term::slot && base.constant && e.constant) {
            slots_.mark_product(base.s);
            return base;
        }
        return opaque(std::string(exponent.empty() ? "a power" : "a power of a variable"));
    }
    Term postfix() {
        Term t = primary();
        while (ok_ && cur_.kind == Lexeme::lbrack) {
            next();
            for (;;) {
                pure(disjunction());
                if (!ok_) return t;
                if (cur_.kind == Lexeme::comma || at_op({":"})) {
                    next();
                    continue;
                }
                break;
            }
            expect(Lexeme::rbrack);
        }
        return t;
    }
    Term primary() {
        Lexeme l = cur_;
        if (l.kind == Lexeme::number) {
            next();
            if (!parse_spice_number(l.text).number) return opaque(std::string(l.text));
            int s = slots_.make();
            numbers_.push_back({Token{TokenKind::word, l.begin,
                                      l.begin + static_cast<std::uint32_t>(l.text.size())},
                                s});
            Term t;
            t.kind = Term::slot;
            t.s = s;
            t.constant = true;
            return t;
        }
        if (l.kind == Lexeme::open) {
            next();
            Term t = disjunction();
            expect(Lexeme::close);
            return t;
        }
        if (l.kind != Lexeme::name) {
            ok_ = false;
            return opaque("?");
        }
        next();
        std::string name = to_lower(l.text);
        if (cur_.kind == Lexeme::open) return call(name);
        return named(name);
    }
    Term named(const std::string& name) {
        if (name == "pi") {
            Term t = fixed(kPure, true);
            t.pi = true;
            return t;
        }
        if (name == "e") return fixed(kPure, true);
        if (name == "time") return fixed(exponents(Unit::second));
        if (name == "frequency") return fixed(exponents(Unit::hertz));
        if (name.ends_with("#branch")) return fixed(exponents(Unit::ampere));
        std::string var = name;
        while (!var.empty() && (var[0] == '$' || var[0] == '&')) var.erase(0, 1);
        if (auto it = vars_.find(var); it != vars_.end()) {
            // A variable whose unit is known by now is a quantity of that unit; the whole
            // block is checked against that at the end (assumed_).
            if (auto e = slots_.bound(it->second)) {
                assumed_.push_back({it->second, *e});
                Term t = fixed(*e);
                t.var = it->second;
                return t;
            }
            Term t;
            t.kind = Term::slot;
            t.s = it->second;
            t.name = var;
            return t;
        }
        return opaque(name);
    }
    Term call(const std::string& name) {
        next();  // '('
        if (is_output_function(name)) {
            // v(node[,node]), i(source): node names, not numbers.
            while (cur_.kind != Lexeme::close && cur_.kind != Lexeme::end) next();
            expect(Lexeme::close);
            auto u = output_function_unit(name);
            // idb: 20 log10 |i| moves by -20 log10 Km, a shift, not a factor.
            if (!u || name == "idb") return opaque(name + "(...)");
            return fixed(exponents(*u));
        }
        std::vector<Term> args;
        if (cur_.kind != Lexeme::close) {
            args.push_back(disjunction());
            while (ok_ && cur_.kind == Lexeme::comma) {
                next();
                args.push_back(disjunction());
            }
        }
        expect(Lexeme::close);
        if (args.size() != 1) {
            for (const auto& a : args)
                if (a.kind == Term::slot || a.kind == Term::scaled)
                    slots_.fail(a.s, fmt::format("it is an argument of '{}'", name));
            return opaque(name + "(...)");
        }
        Term a = args[0];
        static constexpr std::array<std::string_view, 14> keep = {
            "mag", "abs", "real", "re", "imag", "im", "mean", "vecmax", "vecmin", "maximum",
            "minimum", "floor", "ceil", "norm"};
        static constexpr std::array<std::string_view, 12> of_pure = {
            "db", "log", "ln", "log10", "exp", "sin", "cos", "tan", "atan", "sinh", "cosh",
            "tanh"};
        for (auto k : keep)
            if (name == k) return a;
        if (name == "ph" || name == "phase" || name == "cph" || name == "unwrap" ||
            name == "length")
            return fixed(kPure);
        for (auto k : of_pure)
            if (name == k) {
                if (a.kind == Term::fixed && !same(a.e, kPure)) return opaque(name + "(...)");
                if (a.kind == Term::opaque) return opaque(name + "(...)");
                pure(a);
                return fixed(kPure);
            }
        if (name == "sqrt") a = settle(a);
        if (name == "sqrt" && a.kind == Term::fixed && a.e.km % 2 == 0 && a.e.kf % 2 == 0)
            return fixed({a.e.km / 2, a.e.kf / 2});
        if (a.kind == Term::slot || a.kind == Term::scaled)
            slots_.fail(a.s, fmt::format("it is the argument of '{}'", name));
        return opaque(name + "(...)");
    }
    void expect(Lexeme::Kind k) {
        if (cur_.kind != k)
            ok_ = false;
        else
            next();
    }

    std::string_view text_;
    std::uint32_t base_;
    std::size_t pos_ = 0;
    Lexeme cur_;
    bool ok_ = true;
    int depth_ = 0;
    Slots& slots_;
    const std::map<std::string, int>& vars_;
    std::vector<std::pair<Token, int>>& numbers_;

public:
    // Slots bound as coefficients, and whether the note applies (not beside pi alone).
    std::vector<std::pair<int, bool>> coefficient_slots_;
    // Variables read as quantities of the unit bound to them when they were read.
    std::vector<std::pair<int, UnitExponents>> assumed_;
};

// The variable a let command assigns (lower case, without an index), or "".
std::string let_target(const Card& c, std::size_t& equals) {
    const auto& f = c.fields;
    equals = 0;
    for (std::size_t i = 1; i < f.size(); ++i)
        if (f[i].kind == TokenKind::equals) {
            equals = i;
            break;
        }
    if (equals != 2 || f[1].kind != TokenKind::word) return "";
    std::string name = to_lower(c.field_text(1));
    return name.substr(0, name.find('['));
}

bool special_let(const std::string& name) {
    return name == "lin-tstart" || name == "lin-tstop" || name == "lin-tstep" ||
           name == "cut-tstart" || name == "cut-tstop";
}

// The span of fields [from, end) as one text, or nothing when trivia other than blanks
// (a comment or a continuation mark) lies within or a field is not a plain word or sign.
std::optional<Token> expression_span(const Card& c, std::size_t from) {
    const auto& f = c.fields;
    if (from >= f.size()) return std::nullopt;
    Token span{TokenKind::word, f[from].begin, f.back().end};
    for (const auto& t : c.tokens) {
        if (t.begin < span.begin || t.end > span.end) continue;
        if (t.kind == TokenKind::comment || t.kind == TokenKind::continuation ||
            t.kind == TokenKind::brace || t.kind == TokenKind::squote ||
            t.kind == TokenKind::dquote || t.kind == TokenKind::line_end)
            return std::nullopt;
    }
    return span;
}

// Variables a command other than let/if/while/dowhile/echo/print reads through $name.
void taint_substituted(const Card& c, const std::string& cmd, Slots& slots,
                       const std::map<std::string, int>& vars) {
    if (cmd == "echo" || cmd == "print") return;
    for (const auto& t : c.fields) {
        std::string_view w = c.text(t);
        for (std::size_t at = w.find('$'); at != std::string_view::npos; at = w.find('$', at + 1)) {
            std::size_t b = at + 1;
            if (b < w.size() && (w[b] == '&' || w[b] == '{')) ++b;
            std::size_t e = b;
            while (e < w.size() && (std::isalnum(static_cast<unsigned char>(w[e])) || w[e] == '_'))
                ++e;
            auto it = vars.find(to_lower(w.substr(b, e - b)));
            if (it != vars.end())
                slots.fail(it->second,
                           fmt::format("its variable '{}' is read by '{}' through '$', whose "
                                       "reading of it is not followed",
                                       it->first, cmd));
        }
    }
}

// Commands that read a vector by its name only to show, write or transform it: a let
// variable named there is no use of its unit.
bool shows_only(const std::string& cmd) {
    static constexpr std::array<std::string_view, 20> names = {
        "print", "echo",    "plot",    "asciiplot", "gnuplot", "hardcopy", "wrdata",
        "write", "wrs2p",   "display", "destroy",   "unlet",   "setplot",  "linearize",
        "fft",   "psd",     "settype", "meas",      "measure", "save"};
    for (auto n : names)
        if (n == cmd) return true;
    return false;
}

// A let variable named by another command: `alter dev = var` gives it the unit of what it
// sets (an ngspice alter value may be a vector: manual 17.5.3; returned, so that a variable
// whose unit ends not known refuses the alter); any other command but those that only show a
// vector reads it in a way not followed here.
std::optional<std::pair<Token, int>> read_by_name(const Card& c, const std::string& cmd,
                                                  Slots& slots,
                                                  const std::map<std::string, int>& vars) {
    std::optional<std::pair<Token, int>> altered;
    if (shows_only(cmd)) return altered;
    std::optional<std::size_t> alter_value;
    std::optional<UnitExponents> alter_unit;
    if (cmd == "alter") {
        AlterTarget t = alter_target(c);
        if (t.form_known && t.unit) {
            alter_value = t.value;
            alter_unit = exponents(*t.unit);
        }
    }
    for (std::size_t i = 1; i < c.fields.size(); ++i) {
        if (c.fields[i].kind != TokenKind::word) continue;
        auto it = vars.find(to_lower(c.field_text(i)));
        if (it == vars.end()) continue;
        if (alter_value && i == *alter_value) {
            slots.bind(it->second, *alter_unit);
            altered = {c.fields[i], it->second};
        } else
            slots.fail(it->second, fmt::format("its variable '{}' is read by '{}', whose "
                                               "reading of it is not followed",
                                               it->first, cmd));
    }
    return altered;
}

}  // namespace

ControlUnits control_expression_units(const std::vector<Card>& commands, bool other_blocks) {
    Slots slots;
    std::map<std::string, int> vars;
    for (const auto& c : commands) {
        if (c.fields.empty() || !iequals(c.field_text(0), "let")) continue;
        std::size_t equals = 0;
        std::string name = let_target(c, equals);
        if (!name.empty() && !special_let(name) && !vars.count(name))
            vars[name] = slots.make(true);
    }
    struct Pending {
        std::size_t command;
        Token at;
        int slot;
        bool readable;
        bool name = false;  // a variable's name (an alter value): listed only when not known
    };
    std::vector<Pending> pending;
    std::vector<std::pair<int, bool>> coefficients;
    std::vector<std::pair<int, UnitExponents>> assumed;
    for (std::size_t k = 0; k < commands.size(); ++k) {
        const Card& c = commands[k];
        if (c.fields.empty()) continue;
        std::string cmd = to_lower(c.field_text(0));
        std::size_t from = 0;
        std::string target;
        if (cmd == "let") {
            std::size_t equals = 0;
            target = let_target(c, equals);
            if (special_let(target) || equals == 0) continue;
            from = equals + 1;
        } else if (cmd == "if" || cmd == "while" || cmd == "dowhile") {
            from = 1;
        } else {
            taint_substituted(c, cmd, slots, vars);
            if (auto a = read_by_name(c, cmd, slots, vars))
                pending.push_back({k, a->first, a->second, true, true});
            continue;
        }
        std::optional<Token> span = expression_span(c, from);
        if (!span) {
            // Numbers anywhere in the command stay not known.
            if (auto t = literal_in(c, from, c.fields.size()))
                pending.push_back({k, *t, -1, false});
            continue;
        }
        std::vector<std::pair<Token, int>> numbers;
        Reader reader(c.text(*span), span->begin, slots, vars, numbers);
        Term value;
        bool readable = reader.read(value);
        for (auto& n : reader.coefficient_slots_) coefficients.push_back(n);
        for (auto& a : reader.assumed_) assumed.push_back(a);
        if (readable && !target.empty()) {
            auto it = vars.find(target);
            int v = it == vars.end() ? -1 : it->second;
            if (v >= 0 && value.kind == Term::fixed) slots.bind(v, value.e);
            if (v >= 0 && value.kind == Term::slot) slots.unite(v, value.s);
            if (v >= 0 && value.kind == Term::opaque)
                slots.fail(v, fmt::format("its variable '{}' takes the value of '{}', whose "
                                          "unit is not known here",
                                          target, value.name));
        }
        if (readable && target.empty() && cmd == "let") readable = false;  // let x[..] forms
        for (const auto& [tok, s] : numbers) pending.push_back({k, tok, s, readable});
        if (!readable && numbers.empty())
            if (auto t = literal_in(c, from, c.fields.size()))
                pending.push_back({k, *t, -1, false});
    }
    slots.resolve_met();
    // A variable read as a quantity of one unit that ended with another (or with none known):
    // what was read from it may be wrong anywhere in the block.
    bool broken = false;
    for (const auto& [s, e] : assumed) {
        auto now = slots.bound(s);
        if (!now || !same(*now, e)) broken = true;
    }
    std::unordered_set<int> noted;  // roots of the slots kept as coefficients with a note
    for (const auto& [s, note] : coefficients)
        if (note) noted.insert(slots.find(s));
    ControlUnits units;
    auto& out = units.by_command;
    out.resize(commands.size());
    for (const auto& p : pending) {
        ExpressionLiteral l;
        l.at = p.at;
        if (!p.readable) {
            l.why = "the expression is not one whose units deckscale reads";
        } else if (slots.free_variable(p.slot)) {
            units.free_variables = true;
            if (other_blocks)
                l.why = "nothing in its .control block tells the unit of its variable, and "
                        "another .control block of the deck may read it (a variable's unit is "
                        "not followed across blocks)";
            else
                l.exponents = kPure;
        } else {
            slots.resolve(p.slot, l);
            if (l.exponents && broken) {
                l.exponents.reset();
                l.why = "a variable of the block meets quantities of two units";
            }
        }
        if (p.name && l.exponents) continue;
        if (l.exponents && same(*l.exponents, kPure) && p.slot >= 0)
            l.coefficient = noted.count(slots.find(p.slot)) > 0;
        out[p.command].push_back(std::move(l));
    }
    return units;
}

}  // namespace deckscale
