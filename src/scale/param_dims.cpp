#include "scale/param_dims.hpp"

#include <cctype>
#include <cmath>
#include <numeric>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/param_eval.hpp"

namespace deckscale {

namespace {

struct Unreadable {
    std::string why;
};

// One value of the expression tree, as far as scaling goes.
struct Node {
    LinearForm form;
    std::vector<ScalableNumber> numbers;  // reachable through * and / only
    bool params = false;                  // names a parameter somewhere below
    std::optional<double> constant;       // a plain (signed) number
};

bool ident_start(char c) { return std::isalpha(static_cast<unsigned char>(c)) || c == '_'; }
bool ident_char(char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; }

bool one_of(const std::string& name, std::initializer_list<const char*> names) {
    for (const char* n : names)
        if (name == n) return true;
    return false;
}

constexpr int kMaxDepth = 200;        // nested parentheses and operators
constexpr int kMaxCallDepth = 16;     // .func calls inside .func bodies
constexpr int kMaxExpansions = 1000;  // .func bodies read for one expression

class Analyzer {
public:
    Analyzer(const DimContext& context, DimAnalysis& out) : context_(context), out_(out) {}

    Node run(std::string_view text) {
        std::string_view saved_s = s_;
        std::size_t saved_i = i_;
        s_ = text;
        i_ = 0;
        Node n = ternary();
        skip();
        if (i_ != s_.size()) throw Unreadable{fmt::format("cannot read '{}'", s_.substr(i_))};
        s_ = saved_s;
        i_ = saved_i;
        return n;
    }

private:
    struct Deeper {
        explicit Deeper(Analyzer& a) : a_(a) {
            if (++a_.depth_ > kMaxDepth) throw Unreadable{"nested too deeply"};
        }
        ~Deeper() { --a_.depth_; }
        Analyzer& a_;
    };

    void skip() {
        while (i_ < s_.size() &&
               (s_[i_] == ' ' || s_[i_] == '\t' || s_[i_] == '\n' || s_[i_] == '\r'))
            ++i_;
    }
    bool eat(std::string_view op) {
        skip();
        if (s_.substr(i_, op.size()) != op) return false;
        i_ += op.size();
        return true;
    }
    bool peek(std::string_view op) {
        skip();
        return s_.substr(i_, op.size()) == op;
    }

    // The two must scale alike (a sum, a comparison, min/max, the branches of a choice).
    void equal(const Node& a, const Node& b) {
        LinearForm d = a.form;
        add_scaled(d, b.form, Fraction::of(-1));
        if (!d.empty()) out_.zero.push_back(std::move(d));
    }
    // The value must not scale at all (the argument of exp, log, sin, floor ...).
    void unscaled(const Node& a) {
        if (!a.form.empty()) out_.zero.push_back(a.form);
    }
    static Node plain(const Node& a, const Node& b) {
        Node n;
        n.params = a.params || b.params;
        return n;
    }

    Node ternary() {
        Deeper d(*this);
        Node c = logical_or();
        if (!eat("?")) return c;
        unscaled(c);
        Node a = ternary();
        if (!eat(":")) throw Unreadable{"'?' without ':'"};
        Node b = ternary();
        equal(a, b);
        Node n = plain(a, b);
        n.form = a.form;
        n.params = n.params || c.params;
        return n;
    }
    Node logical_or() {
        Node a = logical_and();
        while (eat("||")) {
            Node b = logical_and();
            unscaled(a);
            unscaled(b);
            a = plain(a, b);
        }
        return a;
    }
    Node logical_and() {
        Node a = comparison();
        while (eat("&&")) {
            Node b = comparison();
            unscaled(a);
            unscaled(b);
            a = plain(a, b);
        }
        return a;
    }
    Node comparison() {
        Node a = sum();
        for (;;) {
            if (!(eat("==") || eat("!=") || eat("<>") || eat("<=") || eat(">=") || eat("<") ||
                  eat(">")))
                return a;
            Node b = sum();
            equal(a, b);
            a = plain(a, b);
        }
    }
    Node sum() {
        Node a = product();
        for (;;) {
            skip();
            if (!(eat("+") || eat("-"))) return a;
            Node b = product();
            equal(a, b);
            Node n = plain(a, b);
            n.form = a.form;
            a = std::move(n);
        }
    }
    Node product() {
        Node a = unary();
        for (;;) {
            if (peek("**")) return a;
            int sign = 0;
            if (eat("*"))
                sign = 1;
            else if (eat("/"))
                sign = -1;
            else if (eat("%") || eat("\\")) {
                Node b = unary();
                unscaled(a);
                unscaled(b);
                a = plain(a, b);
                continue;
            } else {
                return a;
            }
            Node b = unary();
            Node n = plain(a, b);
            n.form = a.form;
            add_scaled(n.form, b.form, Fraction::of(sign));
            n.numbers = std::move(a.numbers);
            for (auto num : b.numbers) {
                num.power *= sign;
                n.numbers.push_back(num);
            }
            a = std::move(n);
        }
    }
    Node unary() {
        Deeper d(*this);
        if (eat("-") || eat("+")) {
            Node n = unary();
            if (n.constant) n.constant = -*n.constant;
            return n;
        }
        if (peek("!") && !peek("!=")) {
            eat("!");
            Node n = unary();
            unscaled(n);
            Node r;
            r.params = n.params;
            return r;
        }
        return power();
    }
    Node power() {
        Node base = atom();
        for (;;) {
            if (!eat("**") && !eat("^")) return base;
            Node e = signed_atom();
            base = raise(base, e);
        }
    }
    Node signed_atom() {
        Deeper d(*this);
        if (eat("-") || eat("+")) {
            Node n = signed_atom();
            if (n.constant) n.constant = -*n.constant;
            return n;
        }
        return atom();
    }
    // base ** e: a whole-number exponent multiplies the dimension; any other exponent needs
    // both sides unscaled.
    Node raise(const Node& base, const Node& e) {
        Node n = plain(base, e);
        if (e.constant && *e.constant == std::floor(*e.constant) && std::fabs(*e.constant) <= 64) {
            add_scaled(n.form, base.form, Fraction::of(static_cast<std::int64_t>(*e.constant)));
            if (*e.constant == 1) n.numbers = base.numbers;
            return n;
        }
        unscaled(base);
        unscaled(e);
        return n;
    }

    Node atom() {
        skip();
        if (i_ >= s_.size()) throw Unreadable{"an operand is missing"};
        if (eat("(")) {
            Node n = ternary();
            if (!eat(")")) throw Unreadable{"a '(' is not closed"};
            return n;
        }
        char c = s_[i_];
        if (std::isdigit(static_cast<unsigned char>(c)) || c == '.') return number();
        if (!ident_start(c)) throw Unreadable{fmt::format("cannot read '{}'", s_.substr(i_))};
        std::size_t j = i_;
        while (j < s_.size() && ident_char(s_[j])) ++j;
        std::string name = to_lower(s_.substr(i_, j - i_));
        i_ = j;
        if (eat("(")) return call(name);
        // A function body sees its own arguments; any other name is looked up where the
        // function is called (ngspice 39 replaces the call by the body's text, manual 2.10).
        if (!env_.empty()) {
            if (auto a = env_.back().find(name); a != env_.back().end()) {
                Node n = a->second;
                n.numbers.clear();  // offsets of another text
                return n;
            }
        }
        auto id = context_.param ? context_.param(name) : std::nullopt;
        if (!id) throw Opaque{fmt::format("'{}' is not a parameter", name)};
        out_.params.insert(*id);
        Node n;
        n.form[*id] = Fraction::of(1);
        n.params = true;
        return n;
    }

    Node number() {
        std::size_t start = i_;
        std::size_t j = i_;
        while (j < s_.size() && (std::isdigit(static_cast<unsigned char>(s_[j])) || s_[j] == '.'))
            ++j;
        if (j < s_.size() && (s_[j] == 'e' || s_[j] == 'E')) {
            std::size_t k = j + 1;
            if (k < s_.size() && (s_[k] == '+' || s_[k] == '-')) ++k;
            if (k < s_.size() && std::isdigit(static_cast<unsigned char>(s_[k]))) {
                j = k;
                while (j < s_.size() && std::isdigit(static_cast<unsigned char>(s_[j]))) ++j;
            }
        }
        std::size_t mantissa_end = j;
        while (j < s_.size() && ident_char(s_[j])) ++j;
        i_ = j;
        std::string_view text = s_.substr(start, j - start);
        auto value = evaluate_param_expression(
            text, [](const std::string&) { return std::optional<double>(); });
        if (!value) throw Unreadable{fmt::format("cannot read the number '{}'", text)};
        Node n;
        n.constant = *value;
        // A suffix or an exponent: a quantity with a unit of its own, not known here.
        bool exponent = text.find_first_of("eE") < mantissa_end - start;
        if (j > mantissa_end || exponent) n.form[--ghosts_] = Fraction::of(1);
        if (env_.empty())
            n.numbers.push_back(ScalableNumber{start, j - start, 1, j > mantissa_end});
        return n;
    }

    std::vector<Node> arguments() {
        std::vector<Node> args;
        if (eat(")")) return args;
        do args.push_back(ternary());
        while (eat(","));
        if (!eat(")")) throw Unreadable{"a function call is not closed"};
        return args;
    }

    Node call(const std::string& name) {
        std::vector<Node> args = arguments();
        Node n;
        for (const auto& a : args) n.params = n.params || a.params;
        auto count = [&](std::size_t k) {
            if (args.size() != k)
                throw Unreadable{fmt::format("{}() takes {} argument(s)", name, k)};
        };
        if (name == "abs") {
            count(1);
            n.form = args[0].form;
        } else if (name == "sqrt") {
            count(1);
            add_scaled(n.form, args[0].form, Fraction::of(1, 2));
        } else if (name == "min" || name == "max") {
            count(2);
            equal(args[0], args[1]);
            n.form = args[0].form;
        } else if (name == "pow" || name == "pwr") {
            count(2);
            Node r = raise(args[0], args[1]);
            r.numbers.clear();
            return r;
        } else if (name == "ternary_fcn") {
            count(3);
            unscaled(args[0]);
            equal(args[1], args[2]);
            n.form = args[1].form;
        } else if (one_of(name, {"exp",   "ln",    "log",   "log10", "sin",  "cos",  "tan",
                                 "asin",  "acos",  "atan",  "sinh",  "cosh", "tanh", "asinh",
                                 "acosh", "atanh", "floor", "ceil",  "int",  "nint", "sgn"})) {
            for (const auto& a : args) unscaled(a);
        } else if (one_of(name, {"gauss", "agauss", "unif", "aunif", "limit"})) {
            throw Opaque{fmt::format("the random function {}()", name)};
        } else if (const UserFunction* f = context_.function ? context_.function(name) : nullptr) {
            return expand(name, *f, std::move(args));
        } else {
            throw Opaque{fmt::format("'{}()', whose scaling is not known", name)};
        }
        return n;
    }

    Node expand(const std::string& name, const UserFunction& f, std::vector<Node> args) {
        if (args.size() != f.args.size())
            throw Unreadable{fmt::format("{}() takes {} argument(s)", name, f.args.size())};
        if (++calls_ > kMaxCallDepth) throw Opaque{fmt::format("{}() calls itself", name)};
        if (++expansions_ > kMaxExpansions)
            throw Opaque{
                fmt::format("{}() among more nested function calls than deckscale follows", name)};
        std::map<std::string, Node> bound;
        for (std::size_t k = 0; k < args.size(); ++k) bound[f.args[k]] = std::move(args[k]);
        env_.push_back(std::move(bound));
        Node n = run(f.body);
        env_.pop_back();
        --calls_;
        n.numbers.clear();
        n.constant.reset();
        return n;
    }

public:
    struct Opaque {
        std::string why;
    };

private:
    const DimContext& context_;
    DimAnalysis& out_;
    std::string_view s_;
    std::size_t i_ = 0;
    int depth_ = 0;
    int calls_ = 0;
    int expansions_ = 0;
    int ghosts_ = 0;  // numbers with a unit of their own: -1, -2, ...
    std::vector<std::map<std::string, Node>> env_;
};

// Every parameter the text names (also inside .func bodies it calls), for an opaque result.
void collect_params(std::string_view s, const DimContext& context, std::set<int>& out,
                    const std::set<std::string>& locals, std::set<std::string>& seen) {
    std::size_t i = 0;
    while (i < s.size()) {
        if (!ident_start(s[i])) {
            if (std::isdigit(static_cast<unsigned char>(s[i])) || s[i] == '.')
                while (i < s.size() && (ident_char(s[i]) || s[i] == '.')) ++i;
            else
                ++i;
            continue;
        }
        std::size_t j = i;
        while (j < s.size() && ident_char(s[j])) ++j;
        std::string name = to_lower(s.substr(i, j - i));
        i = j;
        if (locals.count(name)) continue;
        if (auto id = context.param ? context.param(name) : std::nullopt) out.insert(*id);
        const UserFunction* f = context.function ? context.function(name) : nullptr;
        if (f && seen.insert(name).second) {  // each body once
            std::set<std::string> args(f->args.begin(), f->args.end());
            collect_params(f->body, context, out, args, seen);
        }
    }
}

// The number to rescale in a product of numbers: the one with a suffix if exactly one has.
std::optional<ScalableNumber> choose_number(const std::vector<ScalableNumber>& numbers) {
    if (numbers.empty()) return std::nullopt;
    const ScalableNumber* with_suffix = nullptr;
    int suffixed = 0;
    for (const auto& n : numbers)
        if (n.suffix) {
            ++suffixed;
            with_suffix = &n;
        }
    return suffixed == 1 ? *with_suffix : numbers.back();
}

}  // namespace

DimAnalysis analyze_dims(std::string_view expr, const DimContext& context) {
    DimAnalysis out;
    auto make_opaque = [&](std::string why) {
        out = DimAnalysis{};
        out.opaque = true;
        out.why = std::move(why);
        std::set<std::string> seen;
        collect_params(expr, context, out.params, {}, seen);
    };
    try {
        Analyzer a(context, out);
        Node n = a.run(expr);
        out.value = std::move(n.form);
        if (!n.params) out.number = choose_number(n.numbers);
    } catch (const Analyzer::Opaque& o) {
        make_opaque(o.why);
    } catch (const Unreadable& u) {
        make_opaque("an expression deckscale cannot read (" + u.why + ")");
    } catch (const ExponentOverflow&) {
        make_opaque("powers too large to follow");
    }
    return out;
}

}  // namespace deckscale
