#include "deck/spice_number.hpp"

#include <array>
#include <charconv>
#include <cmath>
#include <algorithm>
#include <cctype>
#include <cstring>

#include <fmt/format.h>
#include <tao/pegtl.hpp>

#include "base/text_util.hpp"
#include "deck/decimal.hpp"
#include "grammar/number_grammar.hpp"

namespace deckscale {
namespace {

namespace pg = tao::pegtl;
namespace ng = grammar::number;

struct Parts {
    const char* base;
    std::string_view value, suffix, tail;
    bool has_exponent = false;
    char exponent_letter = 'e';
    std::size_t exponent_at = 0;  // offset of the exponent letter
};

template <typename Rule>
struct action : pg::nothing<Rule> {};
template <>
struct action<ng::value> {
    template <typename In>
    static void apply(const In& in, Parts& p) { p.value = std::string_view(in.begin(), in.size()); }
};
template <>
struct action<ng::exponent> {
    template <typename In>
    static void apply(const In& in, Parts& p) {
        p.has_exponent = true;
        p.exponent_letter = *in.begin();
        p.exponent_at = static_cast<std::size_t>(in.begin() - p.base);
    }
};
template <>
struct action<ng::suffix> {
    template <typename In>
    static void apply(const In& in, Parts& p) { p.suffix = std::string_view(in.begin(), in.size()); }
};
template <>
struct action<ng::unit_tail> {
    template <typename In>
    static void apply(const In& in, Parts& p) { p.tail = std::string_view(in.begin(), in.size()); }
};

constexpr double kExactPow10[] = {1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,
                                  1e8,  1e9,  1e10, 1e11, 1e12, 1e13, 1e14, 1e15,
                                  1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22};

// Clinger's fast path (W. D. Clinger, "How to read floating point numbers accurately",
// PLDI 1990): with at most 15 significant digits and a power of ten up to 22, both the
// digits and the power are exact doubles, and one IEEE multiplication or division rounds
// correctly, giving the same double as std::from_chars. Returns false for anything else.
bool parse_value_fast(std::string_view v, double& out) {
    std::size_t i = 0, n = v.size();
    bool negative = false;
    if (i < n && (v[i] == '+' || v[i] == '-')) negative = v[i++] == '-';
    std::uint64_t m = 0;
    int significant = 0, power = 0;
    auto digit = [&](char c) {
        if (m == 0 && c == '0') return;  // leading zeros are not significant
        m = m * 10 + static_cast<std::uint64_t>(c - '0');
        ++significant;
    };
    for (; i < n && v[i] >= '0' && v[i] <= '9'; ++i) digit(v[i]);
    if (i < n && v[i] == '.')
        for (++i; i < n && v[i] >= '0' && v[i] <= '9'; ++i) {
            digit(v[i]);
            --power;
        }
    if (significant > 15) return false;
    if (i < n) {  // the exponent: [eEdD] [sign] digits
        ++i;
        bool minus = false;
        if (i < n && (v[i] == '+' || v[i] == '-')) minus = v[i++] == '-';
        int x = 0;
        for (; i < n && v[i] >= '0' && v[i] <= '9'; ++i) {
            if (x > 1000) return false;
            x = x * 10 + (v[i] - '0');
        }
        power += minus ? -x : x;
    }
    if (i != n) return false;
    double d = static_cast<double>(m);
    if (m != 0) {
        if (power < -22 || power > 22) return false;
        d = power < 0 ? d / kExactPow10[-power] : d * kExactPow10[power];
    }
    out = negative ? -d : d;
    return true;
}

// Reads the mantissa-and-exponent part; false when it lies outside a double's range
// (from_chars reports overflow and underflow alike as result_out_of_range).
bool parse_value(std::string_view v, double& x) {
    if (parse_value_fast(v, x)) return true;
    // Any length: a long mantissa must not lose its exponent (no allocation when short).
    std::array<char, 64> small{};
    std::string large;
    char* buf = small.data();
    if (v.size() > small.size()) {
        large.resize(v.size());
        buf = large.data();
    }
    std::size_t n = 0;
    std::size_t start = (!v.empty() && v[0] == '+') ? 1 : 0;  // from_chars takes no '+'
    for (std::size_t i = start; i < v.size(); ++i) {
        char c = v[i];
        buf[n++] = (c == 'd' || c == 'D') ? 'e' : c;
    }
    x = 0;
    auto r = std::from_chars(buf, buf + n, x);
    return r.ec != std::errc::result_out_of_range;
}

// Length of the longest prefix that ngspice reads as a number, suffix and letters.
std::size_t good_prefix(std::string_view text) {
    std::size_t i = 0;
    auto at = [&](std::size_t k) { return k < text.size() ? text[k] : '\0'; };
    if (at(i) == '+' || at(i) == '-') ++i;
    while (std::isdigit(static_cast<unsigned char>(at(i)))) ++i;
    if (at(i) == '.') ++i;
    while (std::isdigit(static_cast<unsigned char>(at(i)))) ++i;
    if (std::strchr("eEdD", at(i)) && at(i) != '\0') {
        std::size_t j = i + 1;
        if (at(j) == '+' || at(j) == '-') ++j;
        if (std::isdigit(static_cast<unsigned char>(at(j)))) {
            while (std::isdigit(static_cast<unsigned char>(at(j)))) ++j;
            i = j;
        }
    }
    while (std::isalpha(static_cast<unsigned char>(at(i)))) ++i;
    return i;
}

// True if `prefix` (a good prefix followed by a digit) ends in digits and then one scale
// suffix or 'R', as in the RKM spellings "4k7", "4R7", "2MEG2"; "0x10" is no such value.
bool is_rkm_letters(std::string_view prefix) {
    std::size_t i = prefix.size();
    while (i > 0 && std::isalpha(static_cast<unsigned char>(prefix[i - 1]))) --i;
    if (i == 0 || i == prefix.size() || !std::isdigit(static_cast<unsigned char>(prefix[i - 1])))
        return false;
    std::string_view letters = prefix.substr(i);
    for (const char* s : {"t", "g", "meg", "k", "m", "u", "n", "p", "f", "r"})
        if (iequals(letters, s)) return true;
    return false;
}

struct SuffixInfo {
    const char* lower;
    double multiplier;
};
constexpr std::array<SuffixInfo, 10> kSuffixes{{{"t", 1e12}, {"g", 1e9}, {"meg", 1e6}, {"k", 1e3},
                                                 {"mil", 25.4e-6}, {"m", 1e-3}, {"u", 1e-6},
                                                 {"n", 1e-9}, {"p", 1e-12}, {"f", 1e-15}}};

}  // namespace

double suffix_multiplier(std::string_view suffix) {
    if (suffix.empty()) return 1;
    if (suffix.size() == 1) {
        switch (ascii_lower(suffix[0])) {
            case 't': return 1e12;
            case 'g': return 1e9;
            case 'k': return 1e3;
            case 'm': return 1e-3;
            case 'u': return 1e-6;
            case 'n': return 1e-9;
            case 'p': return 1e-12;
            case 'f': return 1e-15;
        }
    }
    for (const auto& s : kSuffixes)
        if (iequals(suffix, s.lower)) return s.multiplier;
    return 1;
}

NumberParse parse_spice_number(std::string_view text) {
    NumberParse r;
    // number_start: [sign] (digit | '.' digit), checked by hand on this hot path.
    {
        std::size_t i = (!text.empty() && (text[0] == '+' || text[0] == '-')) ? 1 : 0;
        auto digit = [&](std::size_t k) {
            return k < text.size() && text[k] >= '0' && text[k] <= '9';
        };
        if (!(digit(i) || (i < text.size() && text[i] == '.' && digit(i + 1)))) {
            r.problem = NumberProblem::not_a_number;
            return r;
        }
    }
    Parts p{text.data(), {}, {}, {}};
    pg::memory_input<pg::tracking_mode::lazy> in(text.data(), text.size(), "");
    if (!pg::parse<ng::spice_number, action>(in, p)) {
        std::size_t k = good_prefix(text);
        r.problem_offset = k;
        unsigned char c = k < text.size() ? static_cast<unsigned char>(text[k]) : 0;
        if (c >= 0x80)
            r.problem = NumberProblem::non_ascii;
        else if (std::isdigit(c) && is_rkm_letters(text.substr(0, k)))
            r.problem = NumberProblem::rkm_style;
        else
            r.problem = NumberProblem::trailing_junk;
        return r;
    }
    // "1d-14", "2D+1": ngspice 39 reads the D exponent only unsigned ("1d3" is 1000). Signed,
    // it stops at the sign, each reader its own way (tried with libngspice 39: a model's
    // "is=1d-14" reads 1, "R1 a 0 1d-7" is -7 Ohm, "C1 b 0 1.5d-7" a model name, a source's
    // "dc 2d-3" and ".tran 1d-6 1d-5" are refused); SPICE2-era decks still carry them.
    if (p.has_exponent && (p.exponent_letter == 'd' || p.exponent_letter == 'D') &&
        p.exponent_at + 1 < text.size() &&
        (text[p.exponent_at + 1] == '-' || text[p.exponent_at + 1] == '+')) {
        r.problem = NumberProblem::signed_d_exponent;
        r.problem_offset = p.exponent_at;
        return r;
    }
    SpiceNumber n;
    n.mantissa = p.value;
    n.suffix = p.suffix;
    n.tail = p.tail;
    n.has_exponent = p.has_exponent;
    n.exponent_letter = p.exponent_letter;
    double mantissa = 0;
    bool in_range = parse_value(p.value, mantissa);
    n.value = mantissa * suffix_multiplier(p.suffix);
    if (!in_range || !std::isfinite(n.value) || (mantissa != 0 && n.value == 0)) {
        r.problem = NumberProblem::out_of_range;
        return r;
    }
    r.number = n;
    return r;
}

std::string describe(NumberProblem problem, std::string_view text) {
    switch (problem) {
        case NumberProblem::none: return {};
        case NumberProblem::not_a_number:
            return fmt::format("'{}' is not a number", text);
        case NumberProblem::trailing_junk:
            return fmt::format("malformed number '{}': ngspice 39 would silently read only '{}'",
                               text, text.substr(0, good_prefix(text)));
        case NumberProblem::rkm_style:
            return fmt::format(
                "RKM-style value '{}' is ambiguous: ngspice 39 reads '{}' in its default mode "
                "but the digits after the letter in its compatibility mode (ngbehavior=lt); write it "
                "with a decimal point",
                text, text.substr(0, good_prefix(text)));
        case NumberProblem::out_of_range:
            return fmt::format(
                "number '{}' is outside the range of a double (about 2.2e-308 to 1.8e308): "
                "ngspice 39 would read infinity or 0",
                text);
        case NumberProblem::signed_d_exponent: {
            std::size_t d = std::min(text.find_first_of("dD"), text.size());
            return fmt::format(
                "Fortran-style exponent with a sign in '{}': ngspice 39 reads a D exponent only "
                "without one ('1d3' is 1000) and stops at the sign here, so it does not read "
                "the value meant; write '{}{}{}'",
                text, text.substr(0, d), d < text.size() && text[d] == 'd' ? "e" : "E",
                text.substr(std::min(d + 1, text.size())));
        }
        case NumberProblem::non_ascii:
            return fmt::format(
                "number '{}' has a non-ASCII character after '{}': it is no SPICE scale suffix "
                "(write 'u' for micro) and ngspice 39 would ignore it",
                text, text.substr(0, good_prefix(text)));
    }
    return {};
}

std::string format_plain(double value, int digits) {
    return general_text(to_decimal(value, digits), digits);
}

namespace {

// Appends a suffix (given in lower case) in the letter case of the original suffix: "Meg"
// style is first upper, rest lower; a lone upper-case 'M' original becomes "MEG"; milli is
// always a lower-case 'm' (an upper-case M reads as mega to people).
void append_cased(std::string& out, std::string_view lower_suffix, std::string_view original) {
    if (original.empty() || lower_suffix == "m") {
        out += lower_suffix;
        return;
    }
    bool first_upper = std::isupper(static_cast<unsigned char>(original[0]));
    bool rest_upper = original.size() > 1 ? std::isupper(static_cast<unsigned char>(original[1]))
                                          : first_upper;
    if (lower_suffix.size() == 3 && original.size() == 1 && first_upper) {
        out += "MEG";
        return;
    }
    for (std::size_t i = 0; i < lower_suffix.size(); ++i) {
        char c = lower_suffix[i];
        out += (i == 0 ? first_upper : rest_upper) ? static_cast<char>(std::toupper(static_cast<unsigned char>(c))) : c;
    }
}

}  // namespace

std::string respell(const SpiceNumber& original, double value, int digits) {
    return respell(original, to_decimal(value, digits), digits);  // rounded once
}

std::string respell(const SpiceNumber& original, const Decimal& d, int digits) {
    std::string out;
    if (!original.suffix.empty()) {
        // Suffixes by decade / 3, from femto (-15) to tera (12).
        static constexpr std::string_view eng[] = {"f", "p", "n", "u", "m", "", "k", "meg", "g", "t"};
        int e = d.digits == "0" ? 0 : d.exponent;
        if (e < -15 || e >= 15) {
            // Beyond femto and tera: plain scientific notation. Exponent and suffix together
            // read differently in the control language ("1e3k" is 1e3 there; ngspice-39.3
            // src/frontend/parser/numparse.c), and "0.00318f" hides the magnitude.
            out = scientific_text(d, 'e');
            // A tail after an exponent must not start like a suffix ("3e-18F" is femto).
            std::string_view tail = original.tail;
            if (tail.empty() || !std::strchr("tTgGkKmMuUnNpPfFeEdD", tail[0])) out += tail;
            return out;
        }
        digits = std::max(digits, 3);  // a mantissa in [1, 1000) never takes an exponent
        int exp3 = std::clamp((e >= 0 ? e / 3 : -((-e + 2) / 3)) * 3, -15, 12);
        std::string_view suffix = eng[(exp3 + 15) / 3];
        if (suffix == "m" && original.tail.size() >= 2 &&
            (istarts_with(original.tail, "il") || istarts_with(original.tail, "eg"))) {
            // "m" before a tail "il..." or "eg..." would read as MIL or MEG: micro instead
            // ("2020nil" x 1e3 is "2020uil", not "2.02mil").
            exp3 -= 3;
            suffix = "u";
        }
        auto mantissa = [&](int shift) { append_general_text(out, d, digits, shift); };
        if (suffix.empty()) {
            // 1..999 without a suffix would lose the style; keep a suffix-free mantissa only
            // when the tail cannot be misread as a suffix.
            std::string_view tail = original.tail;
            if (!tail.empty() && std::strchr("tTgGkKmMuUnNpPfFeEdD", tail[0])) {
                // e.g. original "1kF" -> 5 F would read back as femto: use milli-free form
                mantissa(3);
                append_cased(out, "k", original.suffix);
            } else {
                mantissa(0);
            }
        } else {
            mantissa(exp3);
            append_cased(out, suffix, original.suffix);
        }
    } else if (original.has_exponent) {
        char letter = std::isupper(static_cast<unsigned char>(original.exponent_letter)) ? 'E' : 'e';
        out = scientific_text(d, letter);
    } else {
        append_general_text(out, d, digits);
    }
    out += original.tail;
    return out;
}

}  // namespace deckscale
