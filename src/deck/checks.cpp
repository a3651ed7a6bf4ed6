#include "deck/checks.hpp"

#include <array>
#include <set>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"

namespace deckscale {
namespace {

struct ElementShape {
    char letter;
    int min_fields;  // fields after the name, not counting '=', '(', ')' and ','
    const char* form;
};

// Minimal field counts per element letter (ngspice 39 manual chapters 3-12; shared notes
// "deck-syntax.md" §4). ngspice accepts some shorter cards with a silently wrong circuit
// (an R without value becomes 1 mOhm), so they are refused here.
constexpr std::array<ElementShape, 21> kShapes{{
    {'r', 3, "R<name> n+ n- value"},
    {'c', 3, "C<name> n+ n- value"},
    {'l', 3, "L<name> n+ n- value"},
    {'k', 3, "K<name> L<name1> L<name2> coupling"},
    {'v', 2, "V<name> n+ n- [[DC] value] [AC mag [phase]] [waveform]"},
    {'i', 2, "I<name> n+ n- [[DC] value] [AC mag [phase]] [waveform]"},
    {'e', 3, "E<name> n+ n- nc+ nc- gain"},
    {'g', 3, "G<name> n+ n- nc+ nc- transconductance"},
    {'f', 3, "F<name> n+ n- V<name> gain"},
    {'h', 3, "H<name> n+ n- V<name> transresistance"},
    {'b', 3, "B<name> n+ n- V=expr | I=expr"},
    {'t', 5, "T<name> n1 n2 n3 n4 Z0=value TD=value"},
    {'o', 5, "O<name> n1 n2 n3 n4 model"},
    {'u', 4, "U<name> n1 n2 n3 model l=length"},
    {'s', 5, "S<name> n+ n- nc+ nc- model"},
    {'w', 4, "W<name> n+ n- V<name> model"},
    {'d', 3, "D<name> n+ n- model"},
    {'q', 4, "Q<name> nc nb ne model"},
    {'j', 4, "J<name> nd ng ns model"},
    {'z', 4, "Z<name> nd ng ns model"},
    {'m', 4, "M<name> nd ng ns [nb] model"},
}};

const std::set<std::string>& other_letters() {
    static const std::set<std::string> s{"x", "a", "y", "p", "n"};
    return s;
}

struct DotShape {
    const char* name;
    int min_fields;
    const char* form;
};
constexpr std::array<DotShape, 10> kDotShapes{{
    {".model", 2, ".model name type (param=value ...)"},
    {".subckt", 1, ".subckt name nodes ..."},
    {".include", 1, ".include file"},
    {".inc", 1, ".include file"},
    {".lib", 1, ".lib file section"},
    {".ac", 4, ".ac dec|oct|lin points fstart fstop"},
    {".tran", 2, ".tran tstep tstop [tstart [tmax]]"},
    {".dc", 4, ".dc source start stop step"},
    {".four", 2, ".four freq output ..."},
    {".temp", 1, ".temp t ..."},
}};

const std::set<std::string>& known_dots() {
    static const std::set<std::string> s{
        ".ac", ".dc", ".tran", ".op", ".noise", ".disto", ".pz", ".sens", ".tf", ".sp", ".pss",
        ".four", ".meas", ".measure", ".param", ".func", ".csparam", ".subckt", ".ends", ".model",
        ".include", ".inc", ".lib", ".endl", ".global", ".ic", ".nodeset", ".temp", ".options",
        ".option", ".opt", ".save", ".print", ".plot", ".probe", ".width", ".title", ".end", ".if",
        ".elseif", ".else", ".endif", ".data", ".enddata", ".optran", ".prot", ".unprot"};
    return s;
}

}  // namespace

int value_fields(const Card& c) {
    int n = 0;
    for (std::size_t i = 1; i < c.fields.size(); ++i) {
        auto k = c.fields[i].kind;
        if (k != TokenKind::equals && k != TokenKind::lparen && k != TokenKind::rparen &&
            k != TokenKind::comma)
            ++n;
    }
    return n;
}

namespace {

// Keys of key=value pairs from field `first` on, lower-case.
void add_keys(const Card& c, std::size_t first, std::set<std::string>& to) {
    for (std::size_t i = first; i + 1 < c.fields.size(); ++i)
        if (c.fields[i].kind == TokenKind::word && c.fields[i + 1].kind == TokenKind::equals)
            to.insert(to_lower(c.field_text(i)));
}

// kShapes by letter ('a'..'z'), for the per-card lookup.
const ElementShape* shape_of(char letter) {
    static const auto table = [] {
        std::array<const ElementShape*, 26> t{};
        for (const auto& s : kShapes) t[static_cast<std::size_t>(s.letter - 'a')] = &s;
        return t;
    }();
    return letter >= 'a' && letter <= 'z' ? table[static_cast<std::size_t>(letter - 'a')] : nullptr;
}

void check_element(const Card& c, std::vector<Diagnostic>& warnings, bool in_section) {
    char letter = ascii_lower(c.field_text(0)[0]);
    if (const ElementShape* shape = shape_of(letter)) {
        const auto& s = *shape;
        int have = value_fields(c);
        if (have < s.min_fields)
            throw DeckError(c.file->diagnose(
                Severity::error, c.fields[0].begin, c.fields[0].size(),
                fmt::format("too few fields for '{}': expected {}, found {} after the name",
                            c.field_text(0), s.form, have)));
        return;
    }
    if (other_letters().count(std::string(1, letter))) return;
    // Every letter names an element type in ngspice 39; a card starting with anything else
    // ('#', a digit, ...) stops its load with "unknown device type - error" (tried with
    // '#pragma x' and '# a comment'; comments start with '*', and '//', '$', ';' it reads as
    // comments too: shared notes "deck-syntax.md" §1).
    if ((letter < 'a' || letter > 'z') && !in_section)
        throw DeckError(c.file->diagnose(
            Severity::error, c.fields[0].begin, c.fields[0].size(),
            fmt::format("ngspice 39 reads no card starting with '{}' (it stops with \"unknown "
                        "device type\"); for a comment, start the line with '*'",
                        c.field_text(0).substr(0, 1))));
    if (letter < 'a' || letter > 'z') {
        warnings.push_back(c.file->diagnose(
            Severity::warning, c.fields[0].begin, c.fields[0].size(),
            fmt::format("ngspice 39 stops on a card starting with '{}' (\"unknown device "
                        "type\") in a .lib section a deck selects; passes through unchanged",
                        c.field_text(0).substr(0, 1))));
        return;
    }
    warnings.push_back(c.file->diagnose(
        Severity::warning, c.fields[0].begin, c.fields[0].size(),
        fmt::format("unknown element type '{}' passes through unchanged", c.field_text(0))));
}

void check_dot(const Card& c, const std::string& kw, std::vector<Diagnostic>& warnings,
               bool in_section) {
    for (const auto& s : kDotShapes) {
        if (kw != s.name) continue;
        int have = value_fields(c);
        if (have < s.min_fields)
            throw DeckError(c.file->diagnose(
                Severity::error, c.fields[0].begin, c.fields[0].size(),
                fmt::format("too few fields for '{}': expected {}", c.field_text(0), s.form)));
    }
    // A step of 0 (another simulator's ".tran 0 5m 0 1u", step chosen by the simulator):
    // ngspice 39 stops with "TSTEP is invalid, must be greater than zero" (tried).
    if (kw == ".tran" && c.fields.size() > 1 && c.fields[1].kind == TokenKind::word)
        if (auto n = parse_spice_number(c.field_text(1)); n.number && n.number->value <= 0)
            throw DeckError(c.file->diagnose(
                Severity::error, c.fields[1].begin, c.fields[1].size(),
                "a .tran step of 0: ngspice 39 stops with \"TSTEP is invalid, must be greater "
                "than zero\"; give the printing step (such as the stop time / 1000)"));
    if (known_dots().count(kw)) return;
    // ngspice 39 stops on every dot card it does not know with "unimplemented control card -
    // error" (tried: .step, .backanno, .wave, .net, .hdl, .alter, .spinit, .mc_source,
    // .protect): another simulator's card, whose values (a .step list of resistances) nothing
    // here would scale. In a .lib section, read only when a deck selects it, a warning.
    if (!in_section)
        throw DeckError(c.file->diagnose(
            Severity::error, c.fields[0].begin, c.fields[0].size(),
            fmt::format("ngspice 39 does not know the dot card '{}' (it stops with "
                        "\"unimplemented control card\"); another simulator's card cannot be "
                        "scaled here: remove it or turn it into ngspice's own form",
                        c.field_text(0))));
    warnings.push_back(c.file->diagnose(
        Severity::warning, c.fields[0].begin, c.fields[0].size(),
        fmt::format("ngspice 39 stops on the unknown dot card '{}' (\"unimplemented control "
                    "card\") in a .lib section a deck selects; passes through unchanged",
                    c.field_text(0))));
}

}  // namespace

void check_card(const Card& c, const std::string& kw, std::vector<Diagnostic>& warnings,
                bool in_section) {
    if (c.kind == CardKind::element) check_element(c, warnings, in_section);
    if (c.kind == CardKind::dot) check_dot(c, kw, warnings, in_section);
}

void gather_symbols(const Card& c, DeckSymbols& s) {
    if (c.fields.empty()) return;
    char first = ascii_lower(c.field_text(0)[0]);
    if (c.kind == CardKind::element) {
        if (first == 'l') s.inductors.insert(card_keyword(c));
        if (first == 'k')
            for (std::size_t j = 1; j < c.fields.size() && j < 3; ++j)
                s.coupled_inductors.insert(to_lower(c.field_text(j)));
        if (first == 'x') add_keys(c, 1, s.params);  // X-line overrides name parameters
        return;
    }
    if (c.kind != CardKind::dot || first != '.') return;
    std::string kw = card_keyword(c);
    if (kw == ".param" || kw == ".subckt" || kw == ".csparam") {
        add_keys(c, 1, s.params);
    } else if (kw == ".func" && c.fields.size() > 1) {
        s.params.insert(to_lower(c.field_text(1)));
    } else if (kw == ".model" && c.fields.size() > 2) {
        s.models[to_lower(c.field_text(1))] = to_lower(c.field_text(2));
    } else if (kw == ".options" || kw == ".option" || kw == ".opt") {
        for (std::size_t i = 1; i + 2 < c.fields.size(); ++i)
            if (c.fields[i + 1].kind == TokenKind::equals && iequals(c.field_text(i), "gmin"))
                if (auto n = parse_spice_number(c.field_text(i + 2)); n.number) {
                    s.gmin = n.number->value;
                    s.gmin_set = true;
                }
        for (std::size_t i = 1; i + 2 < c.fields.size(); ++i)
            if (c.fields[i + 1].kind == TokenKind::equals && iequals(c.field_text(i), "reltol"))
                if (auto n = parse_spice_number(c.field_text(i + 2)); n.number) {
                    s.reltol = n.number->value;
                    s.reltol_set = true;
                }
    }
}

}  // namespace deckscale
