#include "deck/decimal.hpp"

#include <bit>
#include <charconv>
#include <cstdint>
#include <cmath>
#include <cstdlib>

namespace deckscale {
namespace {

constexpr double kPow10[] = {1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,  1e8,  1e9,  1e10, 1e11,
                             1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22};

double scale_by_pow10(double a, int s) {
    if (s >= 0) return s <= 22 ? a * kPow10[s] : a * std::pow(10.0, s);
    return -s <= 22 ? a / kPow10[-s] : a / std::pow(10.0, -s);
}

// Exact but slower path through the standard library.
Decimal via_to_chars(double value, int precision) {
    char buf[64];
    auto r = std::to_chars(buf, buf + sizeof buf, std::fabs(value), std::chars_format::scientific,
                           precision - 1);
    std::string_view t(buf, static_cast<std::size_t>(r.ptr - buf));
    auto epos = t.find('e');
    Decimal d;
    d.negative = std::signbit(value);
    d.digits.clear();
    for (char c : t.substr(0, epos))
        if (c != '.') d.digits += c;
    std::string_view ex = t.substr(epos + 1);
    if (!ex.empty() && ex.front() == '+') ex.remove_prefix(1);
    std::from_chars(ex.data(), ex.data() + ex.size(), d.exponent);
    while (d.digits.size() > 1 && d.digits.back() == '0') d.digits.pop_back();
    return d;
}

}  // namespace

Decimal to_decimal(double value, int precision) {
    Decimal d;
    if (value == 0) return d;
    double a = std::fabs(value);
    if (precision > 12 || !std::isfinite(a) || a < 1e-280 || a > 1e280) return via_to_chars(value, precision);
    d.negative = value < 0;
    // floor(log10(a)) or one less, from the binary exponent (a is normal here, a in
    // [2^k, 2^(k+1))): k * 78913 / 2^18 is k * log10(2) to within 1e-6 per unit of k.
    int k = static_cast<int>((std::bit_cast<std::uint64_t>(a) >> 52) & 0x7ff) - 1023;
    int e = (k * 78913) >> 18;  // an arithmetic shift: rounds towards minus infinity
    long long low = static_cast<long long>(kPow10[precision - 1]);
    long long high = static_cast<long long>(kPow10[precision]);
    // Rounded half away from zero, as llround does: a scaled value here is below 2^53, so
    // x - trunc(x) is exact.
    auto digits_at = [&](int exponent) {
        double x = scale_by_pow10(a, precision - 1 - exponent);
        auto r = static_cast<long long>(x);
        return x - static_cast<double>(r) >= 0.5 ? r + 1 : r;
    };
    long long n = digits_at(e);
    // The estimate may be a decade low (or two, in principle), and 9.99.. may round up to
    // the next decade: step until n has exactly `precision` digits.
    while (n >= high) n = digits_at(++e);
    while (n < low) n = digits_at(--e);
    // No trailing zeros (u >= low > 0 here): scaled values are mostly short, such as 5e4.
    auto u = static_cast<unsigned long long>(n);
    while (u % 10000 == 0) u /= 10000;
    while (u % 10 == 0) u /= 10;
    char buf[24];
    char* p = buf + sizeof buf;
    for (; u > 0; u /= 10) *--p = static_cast<char>('0' + u % 10);
    d.digits.assign(p, buf + sizeof buf);
    d.exponent = e;
    return d;
}

std::string general_text(const Decimal& d, int precision) {
    std::string out;
    append_general_text(out, d, precision);
    return out;
}

void append_general_text(std::string& out, const Decimal& d, int precision, int shift) {
    if (d.negative) out += '-';
    int x = d.digits == "0" ? 0 : d.exponent - shift;
    if (x < -4 || x >= precision) {
        out += d.digits[0];
        if (d.digits.size() > 1) {
            out += '.';
            out.append(d.digits, 1, std::string::npos);
        }
        out += x < 0 ? "e-" : "e+";
        int ax = std::abs(x);
        if (ax < 10) out += '0';
        out += std::to_string(ax);
        return;
    }
    int n = static_cast<int>(d.digits.size());
    if (x < 0) {
        out += "0.";
        out.append(static_cast<std::size_t>(-x - 1), '0');
        out += d.digits;
    } else if (n <= x + 1) {
        out += d.digits;
        out.append(static_cast<std::size_t>(x + 1 - n), '0');
    } else {
        out.append(d.digits, 0, static_cast<std::size_t>(x + 1));
        out += '.';
        out.append(d.digits, static_cast<std::size_t>(x + 1), std::string::npos);
    }
}

std::string scientific_text(const Decimal& d, char letter) {
    std::string out;
    if (d.negative) out += '-';
    out += d.digits[0];
    if (d.digits.size() > 1) {
        out += '.';
        out.append(d.digits, 1, std::string::npos);
    }
    out += letter;
    out += std::to_string(d.digits == "0" ? 0 : d.exponent);
    return out;
}

}  // namespace deckscale
