#include "deck/param_eval.hpp"

#include <cctype>
#include <charconv>
#include <cmath>
#include <vector>

#include "base/text_util.hpp"

namespace deckscale {
namespace {

bool is_alpha(char c) { return std::isalpha(static_cast<unsigned char>(c)) || c == '_'; }
bool is_digit(char c) { return c >= '0' && c <= '9'; }

// Recursive descent over the text; any error leaves ok_ false.
class Parser {
public:
    Parser(std::string_view s, const ParamLookup& lookup) : s_(s), lookup_(lookup) {}

    std::optional<double> run() {
        double v = sum();
        skip();
        if (!ok_ || i_ != s_.size() || !std::isfinite(v)) return std::nullopt;
        return v;
    }

private:
    void skip() {
        while (i_ < s_.size() && (s_[i_] == ' ' || s_[i_] == '\t')) ++i_;
    }
    bool eat(char c) {
        skip();
        if (i_ < s_.size() && s_[i_] == c) {
            ++i_;
            return true;
        }
        return false;
    }
    double fail() {
        ok_ = false;
        return 0;
    }

    double sum() {
        double v = product();
        while (ok_) {
            if (eat('+'))
                v += product();
            else if (eat('-'))
                v -= product();
            else
                break;
        }
        return v;
    }
    double product() {
        double v = unary();
        while (ok_) {
            skip();
            if (s_.substr(i_, 2) == "**") break;  // power, handled below
            if (eat('*'))
                v *= unary();
            else if (eat('/'))
                v /= unary();
            else
                break;
        }
        return v;
    }
    double unary() {
        if (eat('-')) return -unary();
        if (eat('+')) return unary();
        return power();
    }
    // Left-associative, as ngspice 39 reads it (tried: {2**3**2} = 64), and binding tighter
    // than a leading minus ({-2**2} = -4).
    double power() {
        double base = atom();
        while (ok_) {
            skip();
            if (s_.substr(i_, 2) == "**")
                i_ += 2;
            else if (!eat('^'))
                break;
            base = std::pow(base, signed_atom());
        }
        return base;
    }
    double signed_atom() {
        if (eat('-')) return -signed_atom();
        if (eat('+')) return signed_atom();
        return atom();
    }
    double atom() {
        skip();
        if (i_ >= s_.size()) return fail();
        if (eat('(')) {
            double v = sum();
            if (!eat(')')) return fail();
            return v;
        }
        if (is_digit(s_[i_]) || s_[i_] == '.') return number();
        if (!is_alpha(s_[i_])) return fail();
        std::size_t j = i_;
        while (j < s_.size() && (is_alpha(s_[j]) || is_digit(s_[j]))) ++j;
        std::string name = to_lower(s_.substr(i_, j - i_));
        i_ = j;
        if (eat('(')) return call(name);
        auto v = lookup_(name);
        return v ? *v : fail();
    }
    double call(const std::string& name) {
        std::vector<double> args;
        if (!eat(')')) {
            do args.push_back(sum());
            while (ok_ && eat(','));
            if (!eat(')')) return fail();
        }
        if (!ok_) return 0;
        if (args.size() == 1) {
            double x = args[0];
            if (name == "sqrt") return std::sqrt(x);
            if (name == "exp") return std::exp(x);
            if (name == "ln") return std::log(x);
            if (name == "log") return std::log(x);  // natural logarithm in ngspice 39 (§2.9.5)
            if (name == "log10") return std::log10(x);
            if (name == "abs") return std::fabs(x);
            if (name == "sin") return std::sin(x);
            if (name == "cos") return std::cos(x);
            if (name == "tan") return std::tan(x);
            if (name == "atan") return std::atan(x);
            if (name == "floor") return std::floor(x);
            if (name == "ceil") return std::ceil(x);
            if (name == "int") return std::trunc(x);
            if (name == "nint") return std::nearbyint(x);
            if (name == "sgn") return x > 0 ? 1 : x < 0 ? -1 : 0;
        }
        if (args.size() == 2) {
            if (name == "pow" || name == "pwr") return std::pow(args[0], args[1]);
            if (name == "min") return std::min(args[0], args[1]);
            if (name == "max") return std::max(args[0], args[1]);
        }
        return fail();
    }
    // Mantissa with optional exponent, then one suffix letter or MEG; further letters ignored.
    double number() {
        std::size_t j = i_;
        while (j < s_.size() && (is_digit(s_[j]) || s_[j] == '.')) ++j;
        if (j < s_.size() && (s_[j] == 'e' || s_[j] == 'E')) {
            std::size_t k = j + 1;
            if (k < s_.size() && (s_[k] == '+' || s_[k] == '-')) ++k;
            if (k < s_.size() && is_digit(s_[k])) {
                j = k;
                while (j < s_.size() && is_digit(s_[j])) ++j;
            }
        }
        double v = 0;
        auto [end, ec] = std::from_chars(s_.data() + i_, s_.data() + j, v);
        if (ec != std::errc() || end != s_.data() + j) return fail();
        i_ = j;
        if (i_ < s_.size() && is_alpha(s_[i_])) {
            if (istarts_with(s_.substr(i_), "meg")) {
                v *= 1e6;
            } else {
                switch (ascii_lower(s_[i_])) {
                    case 't':
                        v *= 1e12;
                        break;
                    case 'g':
                        v *= 1e9;
                        break;
                    case 'k':
                        v *= 1e3;
                        break;
                    case 'm':
                        v *= 1e-3;
                        break;
                    case 'u':
                        v *= 1e-6;
                        break;
                    case 'n':
                        v *= 1e-9;
                        break;
                    case 'p':
                        v *= 1e-12;
                        break;
                    case 'f':
                        v *= 1e-15;
                        break;
                    default:
                        return fail();  // `1d3`, `1k5`-like forms stop ngspice too
                }
            }
            while (i_ < s_.size() && is_alpha(s_[i_])) ++i_;
            if (i_ < s_.size() && is_digit(s_[i_])) return fail();  // `1k5`
        }
        return v;
    }

    std::string_view s_;
    const ParamLookup& lookup_;
    std::size_t i_ = 0;
    bool ok_ = true;
};

}  // namespace

std::optional<double> evaluate_param_expression(std::string_view expr, const ParamLookup& lookup) {
    return Parser(expr, lookup).run();
}

void ParamTable::define(std::string name, std::string expression) {
    definitions_[to_lower(name)] = std::move(expression);
    values_.clear();
}

std::optional<double> ParamTable::value(const std::string& name) const {
    if (auto it = values_.find(name); it != values_.end()) return it->second;
    auto def = definitions_.find(name);
    if (def == definitions_.end() || evaluating_.count(name)) return std::nullopt;
    evaluating_.insert(name);
    auto v = evaluate(def->second);
    evaluating_.erase(name);
    values_[name] = v;
    return v;
}

std::optional<double> ParamTable::evaluate(std::string_view expr) const {
    std::string_view e = expr;
    if (e.size() >= 2 &&
        ((e.front() == '{' && e.back() == '}') || (e.front() == '\'' && e.back() == '\'')))
        e = e.substr(1, e.size() - 2);
    return evaluate_param_expression(e, [this](const std::string& n) { return value(n); });
}

}  // namespace deckscale
