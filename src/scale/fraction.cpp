#include "scale/fraction.hpp"

#include <numeric>

namespace deckscale {

namespace {

std::int64_t mul(std::int64_t a, std::int64_t b) {
    std::int64_t r = 0;
    if (__builtin_mul_overflow(a, b, &r)) throw ExponentOverflow();
    return r;
}
std::int64_t add(std::int64_t a, std::int64_t b) {
    std::int64_t r = 0;
    if (__builtin_add_overflow(a, b, &r)) throw ExponentOverflow();
    return r;
}

}  // namespace

Fraction Fraction::of(std::int64_t n, std::int64_t d) {
    if (d == 0 || n == INT64_MIN || d == INT64_MIN) throw ExponentOverflow();
    if (d < 0) n = -n, d = -d;
    std::int64_t g = std::gcd(n, d);
    return g > 1 ? Fraction{n / g, d / g} : Fraction{n, d};
}
Fraction operator+(Fraction a, Fraction b) {
    return Fraction::of(add(mul(a.num, b.den), mul(b.num, a.den)), mul(a.den, b.den));
}
Fraction operator-(Fraction a) { return Fraction::of(-a.num, a.den); }
Fraction operator-(Fraction a, Fraction b) { return a + (-b); }
Fraction operator*(Fraction a, Fraction b) {
    return Fraction::of(mul(a.num, b.num), mul(a.den, b.den));
}
Fraction operator/(Fraction a, Fraction b) {
    return Fraction::of(mul(a.num, b.den), mul(a.den, b.num));
}

void add_scaled(LinearForm& to, const LinearForm& from, Fraction k) {
    for (const auto& [id, c] : from) {
        Fraction sum = to[id] + c * k;
        if (sum.zero())
            to.erase(id);
        else
            to[id] = sum;
    }
}

}  // namespace deckscale
