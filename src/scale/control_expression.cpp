#include "scale/control_expression.hpp"

#include <fmt/format.h>

#include <array>
#include <cctype>
#include <cmath>
#include <initializer_list>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/control.hpp"
#include "scale/expression_lexer.hpp"

namespace deckscale {
namespace {

using Term = UnitTerm;

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

class Reader {
public:
    Reader(std::string_view text, std::uint32_t base, UnitSlots& slots,
           const std::map<std::string, int>& variables,
           std::vector<std::pair<Token, int>>& numbers)
        : lex_(text, base), slots_(slots), vars_(variables), numbers_(numbers) {}

    // The whole text as one expression; false when it is not one this reader knows.
    bool read(Term& out) {
        out = settle(disjunction());
        return ok_ && cur().kind == Lexeme::end;
    }

private:
    void next() { lex_.next(); }
    const Lexeme& cur() const { return lex_.current(); }
    bool at_op(std::initializer_list<std::string_view> ops) const { return lex_.at_op(ops); }

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
        if (a.kind == Term::fixed && b.kind == Term::fixed && !same_exponents(a.e, b.e)) {
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
    void pure(const Term& t) { bind_term(t, kPureNumber); }

    // A number times or over a quantity that nothing else tells the unit of: a coefficient,
    // taken as a pure number (noted unless it is a multiple of pi).
    Term settle(const Term& t) {
        if (t.kind != Term::scaled) return t;
        slots_.bind(t.s, kPureNumber);
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
                slots_.bind(c->s, kPureNumber);
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
            t = fixed(kPureNumber);
        }
        return t;
    }
    Term conjunction() {
        Term t = negation();
        while (ok_ && at_op({"and", "&", "&&"})) {
            next();
            negation();
            t = fixed(kPureNumber);
        }
        return t;
    }
    Term negation() {
        Nest nest(*this);
        if (!ok_) return opaque("?");
        if (at_op({"not", "~", "!"})) {
            next();
            negation();
            return fixed(kPureNumber);
        }
        return comparison();
    }
    Term comparison() {
        Term t = sum();
        while (ok_ && at_op({"<", ">", "<=", ">=", "=", "==", "<>", "!=", "gt", "lt", "ge",
                             "le", "eq", "ne"})) {
            next();
            same_unit(t, sum());
            t = fixed(kPureNumber);
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
            int sign = cur().text == "/" ? -1 : 1;
            bool modulo = cur().text == "%";
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
        std::string_view exponent = cur().kind == Lexeme::number ? cur().text : "";
        Term e = unary();
        pure(e);
        auto number = parse_spice_number(exponent).number;
        double x = number ? number->value : 0.5;
        if (base.kind == Term::fixed && std::fabs(x) <= 8 && x == std::floor(x)) {
            int n = static_cast<int>(x);
            return fixed({base.e.km * n, base.e.kf * n}, base.constant && e.constant);
        }
        if (base.kind == Term::fixed && same_exponents(base.e, kPureNumber)) return base;
        if (base.kind == Term::slot && base.constant && e.constant) {
            slots_.mark_product(base.s);
            return base;
        }
        return opaque(std::string(exponent.empty() ? "a power" : "a power of a variable"));
    }
    Term postfix() {
        Term t = primary();
        while (ok_ && cur().kind == Lexeme::lbrack) {
            next();
            for (;;) {
                pure(disjunction());
                if (!ok_) return t;
                if (cur().kind == Lexeme::comma || at_op({":"})) {
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
        Lexeme l = cur();
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
        if (cur().kind == Lexeme::open) return call(name);
        return named(name);
    }
    Term named(const std::string& name) {
        if (name == "pi") {
            Term t = fixed(kPureNumber, true);
            t.pi = true;
            return t;
        }
        if (name == "e") return fixed(kPureNumber, true);
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
            while (cur().kind != Lexeme::close && cur().kind != Lexeme::end) next();
            expect(Lexeme::close);
            auto u = output_function_unit(name);
            // idb: 20 log10 |i| moves by -20 log10 Km, a shift, not a factor.
            if (!u || name == "idb") return opaque(name + "(...)");
            return fixed(exponents(*u));
        }
        std::vector<Term> args;
        if (cur().kind != Lexeme::close) {
            args.push_back(disjunction());
            while (ok_ && cur().kind == Lexeme::comma) {
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
            return fixed(kPureNumber);
        for (auto k : of_pure)
            if (name == k) {
                if (a.kind == Term::fixed && !same_exponents(a.e, kPureNumber)) return opaque(name + "(...)");
                if (a.kind == Term::opaque) return opaque(name + "(...)");
                pure(a);
                return fixed(kPureNumber);
            }
        if (name == "sqrt") a = settle(a);
        if (name == "sqrt" && a.kind == Term::fixed && a.e.km % 2 == 0 && a.e.kf % 2 == 0)
            return fixed({a.e.km / 2, a.e.kf / 2});
        if (a.kind == Term::slot || a.kind == Term::scaled)
            slots_.fail(a.s, fmt::format("it is the argument of '{}'", name));
        return opaque(name + "(...)");
    }
    void expect(Lexeme::Kind k) {
        if (cur().kind != k)
            ok_ = false;
        else
            next();
    }

    ExpressionLexer lex_;
    bool ok_ = true;
    int depth_ = 0;
    UnitSlots& slots_;
    const std::map<std::string, int>& vars_;
    std::vector<std::pair<Token, int>>& numbers_;

public:
    // Slots bound as coefficients, and whether the note applies (not beside pi alone).
    std::vector<std::pair<int, bool>> coefficient_slots_;
    // Variables read as quantities of the unit bound to them when they were read.
    std::vector<std::pair<int, UnitExponents>> assumed_;
};

}  // namespace

ExpressionRead read_expression(std::string_view text, std::uint32_t base, UnitSlots& slots,
                               const std::map<std::string, int>& variables) {
    ExpressionRead r;
    Reader reader(text, base, slots, variables, r.numbers);
    r.readable = reader.read(r.value);
    r.coefficients = std::move(reader.coefficient_slots_);
    r.assumed = std::move(reader.assumed_);
    return r;
}

}  // namespace deckscale
