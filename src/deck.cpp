#include "deck.hpp"

#include <algorithm>
#include <array>
#include <map>
#include <set>

#include <fmt/format.h>

#include "spice_number.hpp"
#include "text_util.hpp"

namespace deckscale {

std::string card_keyword(const Card& card) {
    if (card.fields.empty()) return {};
    return to_lower(card.field_text(0));
}

void Deck::visit_file(std::size_t file, const CardVisitor& visit) const {
    read_cards(*files[file].source, files[file].role, visit);
}

const IncludeRef* Deck::include_at(std::size_t file, std::uint32_t offset) const {
    for (const auto& inc : includes)
        if (inc.from_file == file && inc.path_token.begin == offset) return &inc;
    return nullptr;
}

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
        ".elseif", ".else", ".endif", ".data", ".enddata"};
    return s;
}

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

std::string unquote(std::string_view s) {
    if (s.size() >= 2 && (s.front() == '"' || s.front() == '\'') && s.back() == s.front())
        return std::string(s.substr(1, s.size() - 2));
    return std::string(s);
}

class Loader {
public:
    Loader(const FileSystem& fs, const DeckObserver& observer) : fs_(fs), observer_(observer) {}

    Deck take() { return std::move(deck_); }

    std::size_t load(const std::string& path, FileRole role, const SourceFile* from,
                     const Token* from_token) {
        std::string id = fs_.identity(path);
        auto on_stack = std::find(stack_ids_.begin(), stack_ids_.end(), id);
        if (on_stack != stack_ids_.end()) {
            std::string chain;
            for (auto it = on_stack; it != stack_ids_.end(); ++it)
                chain += stack_paths_[it - stack_ids_.begin()] + " -> ";
            chain += path;
            throw DeckError(from->diagnose(Severity::error, from_token->begin, from_token->size(),
                                           fmt::format("include cycle: {}", chain)));
        }
        if (auto it = loaded_.find(id); it != loaded_.end()) return it->second;

        auto text = fs_.read(path);
        if (!text) {
            if (!from) throw DeckError(Diagnostic{Severity::error, path, 0, 0, 0, "",
                                                  "cannot read the deck file", {}});
            throw DeckError(from->diagnose(
                Severity::error, from_token->begin, from_token->size(),
                fmt::format("cannot read included file '{}'", path)));
        }
        auto source = std::make_unique<SourceFile>(path, std::move(*text));
        const SourceFile& file = *source;
        if (role == FileRole::deck && file.text().empty())
            throw DeckError(Diagnostic{Severity::error, path, 0, 0, 0, "",
                                       "empty file: a deck needs a title line and cards", {}});
        if (auto nul = file.text().find('\0'); nul != std::string::npos)
            throw DeckError(file.diagnose(Severity::error, static_cast<std::uint32_t>(nul), 1,
                                          "binary data (a NUL byte): this is not a SPICE deck"));

        std::size_t index = deck_.files.size();
        deck_.files.push_back(DeckFile{std::move(source), role});
        loaded_[id] = index;
        stack_ids_.push_back(id);
        stack_paths_.push_back(path);
        try {
            check_file(index);
        } catch (DeckError& e) {
            if (from) {
                Diagnostic d = e.diagnostic();
                d.notes.push_back(from->diagnose(Severity::note, from_token->begin,
                                                 from_token->size(), "included from here"));
                throw DeckError(std::move(d));
            }
            throw;
        }
        stack_ids_.pop_back();
        stack_paths_.pop_back();
        return index;
    }

private:
    void check_file(std::size_t index) {
        const SourceFile& file = *deck_.files[index].source;
        struct Open {
            std::uint32_t offset, length;
            std::string name;
        };
        std::vector<Open> subckts;
        read_cards(file, deck_.files[index].role, [&](const Card& c) {
            gather_symbols(c);
            if (c.kind == CardKind::element) check_element(c);
            std::string kw = c.kind == CardKind::dot ? card_keyword(c) : std::string();
            if (c.kind == CardKind::dot) check_dot_shape(c, kw);
            if (observer_) observer_(deck_, index, c);
            if (c.kind != CardKind::dot) return;
            if (kw == ".subckt") {
                subckts.push_back({c.fields[0].begin, c.fields[0].size(),
                                   c.fields.size() > 1 ? std::string(c.field_text(1)) : ""});
            } else if (kw == ".ends") {
                if (subckts.empty())
                    throw DeckError(file.diagnose(Severity::error, c.fields[0].begin,
                                                  c.fields[0].size(), "'.ends' without a '.subckt'"));
                subckts.pop_back();
            } else if (kw == ".include" || kw == ".inc" ||
                       (kw == ".lib" && value_fields(c) >= 2)) {
                follow_include(index, c, kw == ".lib");
            } else if (kw == ".lib" && value_fields(c) == 1 && names_a_file(c)) {
                // ".lib file" without a section: a section header inside a library, but in a
                // deck that names an existing file it is the LTspice/PSpice include form.
                deck_.warnings.push_back(file.diagnose(
                    Severity::warning, c.fields[1].begin, c.fields[1].size(),
                    ".lib with a file name and no section is read as .include (ngspice 39 reads "
                    "it so only with 'set ngbehavior=lt' or 'ps')"));
                follow_include(index, c, false);
            } else if (!known_dots().count(kw)) {
                deck_.warnings.push_back(file.diagnose(
                    Severity::warning, c.fields[0].begin, c.fields[0].size(),
                    fmt::format("unknown dot card '{}' passes through unchanged", c.field_text(0))));
            }
        });
        if (!subckts.empty()) {
            const auto& o = subckts.back();
            throw DeckError(file.diagnose(
                Severity::error, o.offset, o.length,
                fmt::format("unterminated .subckt '{}': no .ends before the end of the file", o.name)));
        }
    }

    // Keys of key=value pairs from field `first` on, lower-case.
    static void add_keys(const Card& c, std::size_t first, std::set<std::string>& to) {
        for (std::size_t i = first; i + 1 < c.fields.size(); ++i)
            if (c.fields[i].kind == TokenKind::word && c.fields[i + 1].kind == TokenKind::equals)
                to.insert(to_lower(c.field_text(i)));
    }

    void gather_symbols(const Card& c) {
        if (c.fields.empty()) return;
        DeckSymbols& s = deck_.symbols;
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
                    if (auto n = parse_spice_number(c.field_text(i + 2)); n.number) s.gmin = n.number->value;
        }
    }

    void check_element(const Card& c) {
        char letter = ascii_lower(c.field_text(0)[0]);
        for (const auto& s : kShapes) {
            if (s.letter != letter) continue;
            int have = value_fields(c);
            if (have < s.min_fields)
                throw DeckError(c.file->diagnose(
                    Severity::error, c.fields[0].begin, c.fields[0].size(),
                    fmt::format("too few fields for '{}': expected {}, found {} after the name",
                                c.field_text(0), s.form, have)));
            return;
        }
        if (other_letters().count(std::string(1, letter))) return;
        deck_.warnings.push_back(c.file->diagnose(
            Severity::warning, c.fields[0].begin, c.fields[0].size(),
            fmt::format("unknown element type '{}' passes through unchanged", c.field_text(0))));
    }

    void check_dot_shape(const Card& c, const std::string& kw) {
        for (const auto& s : kDotShapes) {
            if (kw != s.name) continue;
            int have = value_fields(c);
            if (have < s.min_fields)
                throw DeckError(c.file->diagnose(
                    Severity::error, c.fields[0].begin, c.fields[0].size(),
                    fmt::format("too few fields for '{}': expected {}", c.field_text(0), s.form)));
        }
    }

    // True when field 1 names a readable file relative to the card's file.
    bool names_a_file(const Card& c) const {
        if (c.fields.size() < 2) return false;
        std::string name = unquote(c.text(c.fields[1]));
        return fs_.read(join_path(directory_of(c.file->path()), name)).has_value();
    }

    void follow_include(std::size_t index, const Card& c, bool is_lib) {
        const Token& path_token = c.fields[1];
        std::string name = unquote(c.text(path_token));
        std::string path = join_path(directory_of(c.file->path()), name);
        IncludeRef ref;
        ref.from_file = index;
        ref.path_token = path_token;
        if (is_lib) {
            for (std::size_t i = 2; i < c.fields.size(); ++i)
                if (c.fields[i].kind == TokenKind::word) {
                    ref.section = std::string(c.field_text(i));
                    break;
                }
        }
        ref.target_file = load(path, FileRole::include, c.file, &path_token);
        deck_.includes.push_back(ref);
    }

    const FileSystem& fs_;
    const DeckObserver& observer_;
    Deck deck_;
    std::vector<std::string> stack_ids_, stack_paths_;
    std::map<std::string, std::size_t> loaded_;
};

}  // namespace

Deck load_deck(const std::string& path, const FileSystem& fs, const DeckObserver& observer) {
    Loader loader(fs, observer);
    loader.load(path, FileRole::deck, nullptr, nullptr);
    return loader.take();
}

}  // namespace deckscale
