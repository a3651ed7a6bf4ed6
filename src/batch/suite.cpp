#include "batch/suite.hpp"

#include <fmt/format.h>
#include <glob.h>
#include <toml++/toml.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <optional>
#include <set>
#include <sstream>

#include "base/text_util.hpp"
#include "deck/analyses.hpp"
#include "deck/diagnostic.hpp"
#include "scale/factor.hpp"
#include "scale/hold_items.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

// The keys a [[case]] may hold; [defaults] holds the same but name, deck and scaled.
const std::set<std::string> kCaseKeys = {"name",   "deck",    "scaled", "km",    "kf",
                                         "hold",   "tolerance", "sweep", "drive", "expect",
                                         "timeout", "memory"};
const std::set<std::string> kDefaultKeys = {"km",    "kf",     "tolerance", "sweep",
                                            "drive", "expect", "timeout",   "memory"};
const std::set<std::string> kToleranceKeys = {"ac", "tran", "db", "deg"};

std::string joined(const std::set<std::string>& keys) {
    std::string s;
    for (const auto& k : keys) s += (s.empty() ? "" : ", ") + k;
    return s;
}

// Errors at a place in the suite file, rendered like every other diagnostic.
class SuiteReader {
  public:
    SuiteReader(std::string path, std::string text)
        : path_(std::move(path)), text_(std::move(text)) {}

    [[noreturn]] void fail(const toml::source_region& at, const std::string& message) const {
        Diagnostic d;
        d.file = path_;
        d.line = at.begin.line;
        d.column = at.begin.column;
        d.message = message;
        d.source_line = line_text(at.begin.line);
        throw DeckError(std::move(d));
    }

    const std::string& path() const { return path_; }
    std::string folder() const { return directory_of(path_); }

  private:
    std::string line_text(std::uint32_t line) const {
        std::istringstream in(text_);
        std::string s;
        for (std::uint32_t n = 1; std::getline(in, s); ++n)
            if (n == line) {
                if (!s.empty() && s.back() == '\r') s.pop_back();
                return s;
            }
        return "";
    }
    std::string path_, text_;
};

// The settings a case can take from [defaults] and override itself.
struct CaseSettings {
    std::optional<FactorTarget> factors;
    bool km_given = false, kf_given = false;
    const toml::node* km_node = nullptr;
    Tolerances tolerances;
    std::vector<std::string> sweep;
    std::string drive;
    Expect expect = Expect::pass;
    std::chrono::milliseconds timeout{60000};
    std::uint64_t memory_mb = 8192;
};

std::string node_type(const toml::node& n) {
    switch (n.type()) {
        case toml::node_type::string:
            return "a string";
        case toml::node_type::integer:
            return "an integer";
        case toml::node_type::floating_point:
            return "a number";
        case toml::node_type::boolean:
            return "a boolean";
        case toml::node_type::array:
            return "an array";
        case toml::node_type::table:
            return "a table";
        default:
            return "a date or time";
    }
}

double number_of(const SuiteReader& r, const toml::node& n, const std::string& key) {
    if (auto i = n.value_exact<std::int64_t>()) return static_cast<double>(*i);
    if (auto d = n.value_exact<double>()) return *d;
    r.fail(n.source(), fmt::format("'{}' must be a number, not {}", key, node_type(n)));
}

double positive_number(const SuiteReader& r, const toml::node& n, const std::string& key) {
    double v = number_of(r, n, key);
    if (!(v > 0) || !std::isfinite(v))
        r.fail(n.source(), fmt::format("'{}' must be positive", key));
    return v;
}

std::string string_of(const SuiteReader& r, const toml::node& n, const std::string& key) {
    if (auto s = n.value_exact<std::string>()) return *s;
    r.fail(n.source(), fmt::format("'{}' must be a string, not {}", key, node_type(n)));
}

// A factor: a number, or a string holding a SPICE number or a product ("2*pi*1k").
void read_factor(const SuiteReader& r, const toml::node& n, const std::string& key, double& value,
                 std::string& text) {
    if (n.is_string()) {
        text = *n.value_exact<std::string>();
        auto v = parse_factor(text);
        if (!v)
            r.fail(n.source(),
                   fmt::format("'{}': '{}' is not a number (write e.g. 1k, 2.2MEG, 2*pi*1k)", key,
                               text));
        value = *v;
    } else {
        value = number_of(r, n, key);
        text = fmt::format("{}", value);
    }
    if (!(value > 0) || !std::isfinite(value))
        r.fail(n.source(), fmt::format("'{}': the factor must be positive", key));
}

void read_tolerance(const SuiteReader& r, const toml::node& n, Tolerances& t) {
    if (!n.is_table()) {
        t.relative = positive_number(r, n, "tolerance");
        return;
    }
    for (auto&& [k, v] : *n.as_table()) {
        std::string key(k.str());
        if (!kToleranceKeys.count(key))
            r.fail(k.source(), fmt::format("unknown key '{}' in tolerance (known: {})", key,
                                           joined(kToleranceKeys)));
        double x = positive_number(r, v, "tolerance." + key);
        if (key == "ac") t.relative = x;
        if (key == "tran") t.transient = x;
        if (key == "db") t.db = x;
        if (key == "deg") t.degrees = x;
    }
}

// Reads one key into `s`; name, deck and scaled are read by the caller.
void read_setting(const SuiteReader& r, const std::string& key, const toml::node& v,
                  CaseSettings& s) {
    if (key == "km" || key == "kf") {
        if (!s.factors) s.factors = FactorTarget{};
        if (key == "km") {
            read_factor(r, v, key, s.factors->km, s.factors->km_text);
            s.km_given = true;
            s.km_node = &v;
        } else {
            read_factor(r, v, key, s.factors->kf, s.factors->kf_text);
            s.kf_given = true;
        }
    } else if (key == "tolerance") {
        read_tolerance(r, v, s.tolerances);
    } else if (key == "sweep") {
        std::istringstream words(string_of(r, v, key));
        std::vector<std::string> w;
        for (std::string x; words >> x;) w.push_back(x);
        std::string e;
        if (!parse_sweep(w, e))
            r.fail(v.source(), "'sweep': " + e + " (write e.g. \"dec 20 10 100k\")");
        s.sweep = std::move(w);
    } else if (key == "drive") {
        s.drive = string_of(r, v, key);
    } else if (key == "expect") {
        std::string e = string_of(r, v, key);
        if (e == "pass")
            s.expect = Expect::pass;
        else if (e == "fail")
            s.expect = Expect::fail;
        else
            r.fail(v.source(), fmt::format("'expect' must be \"pass\" or \"fail\", not \"{}\"", e));
    } else if (key == "timeout") {
        s.timeout = std::chrono::milliseconds(static_cast<long>(positive_number(r, v, key) * 1000));
    } else if (key == "memory") {
        double mb = number_of(r, v, key);
        if (mb < 0) r.fail(v.source(), "'memory' must be 0 (no limit) or a number of megabytes");
        s.memory_mb = static_cast<std::uint64_t>(mb);
    }
}

void check_keys(const SuiteReader& r, const toml::table& t, const std::set<std::string>& known,
                const std::string& where) {
    for (auto&& [k, v] : t)
        if (!known.count(std::string(k.str())))
            r.fail(k.source(), fmt::format("unknown key '{}' in {} (known: {})", k.str(), where,
                                           joined(known)));
}

bool is_glob(const std::string& s) { return s.find_first_of("*?[") != std::string::npos; }

// Matches of a pattern relative to `folder`, in name order (the same on every machine).
std::vector<std::string> expand(const std::string& folder, const std::string& pattern) {
    glob_t g{};
    std::vector<std::string> out;
    if (::glob(join_path(folder, pattern).c_str(), GLOB_NOSORT, nullptr, &g) == 0)
        for (std::size_t i = 0; i < g.gl_pathc; ++i)
            if (fs::is_regular_file(g.gl_pathv[i])) out.emplace_back(g.gl_pathv[i]);
    ::globfree(&g);
    std::sort(out.begin(), out.end());
    return out;
}

std::string stem_of(const std::string& path) { return fs::path(path).stem().string(); }

// "{stem}" in a scaled path stands for the deck's file name without its extension.
std::string with_stem(std::string text, const std::string& stem) {
    for (std::size_t at; (at = text.find("{stem}")) != std::string::npos;)
        text.replace(at, 6, stem);
    return text;
}

void read_case(const SuiteReader& r, const toml::table& t, const CaseSettings& defaults,
               Suite& suite, std::set<std::string>& names) {
    check_keys(r, t, kCaseKeys, "[[case]]");
    CaseSettings s = defaults;
    for (auto&& [k, v] : t) read_setting(r, std::string(k.str()), v, s);
    const toml::node* deck = t.get("deck");
    if (!deck) r.fail(t.source(), "this [[case]] has no 'deck'");
    std::string pattern = string_of(r, *deck, "deck");
    const toml::node* scaled = t.get("scaled");
    if (!defaults.factors && s.km_given != s.kf_given)
        r.fail(t.source(), fmt::format("this case has '{}' but not '{}': give both",
                                       s.km_given ? "km" : "kf", s.km_given ? "kf" : "km"));
    if (!scaled && !s.factors)
        r.fail(t.source(), "this case needs 'scaled' (a rescaled deck) or 'km' and 'kf'");
    std::string scaled_text = scaled ? string_of(r, *scaled, "scaled") : "";
    std::vector<std::string> hold;
    if (const toml::node* h = t.get("hold")) {
        if (scaled)
            r.fail(h->source(), "'hold' goes with 'km' and 'kf' (the case scales the deck); a "
                                "kept scaled deck names its held parts itself");
        if (const auto* list = h->as_array())
            for (const auto& item : *list) hold.push_back(string_of(r, item, "hold"));
        else
            hold.push_back(string_of(r, *h, "hold"));
        std::string bad;
        if (!read_hold_items(hold, bad)) r.fail(h->source(), bad);
    }
    const toml::node* name = t.get("name");
    std::string name_text = name ? string_of(r, *name, "name") : "";

    std::vector<std::string> decks;
    if (is_glob(pattern)) {
        decks = expand(r.folder(), pattern);
        if (decks.empty()) r.fail(deck->source(), fmt::format("'{}' matches no deck", pattern));
    } else {
        std::string path = join_path(r.folder(), pattern);
        std::error_code ec;
        if (!fs::is_regular_file(path, ec))
            r.fail(deck->source(), fmt::format("deck '{}' does not exist", path));
        decks.push_back(path);
    }
    for (const auto& d : decks) {
        SuiteCase c;
        c.index = suite.cases.size();
        c.deck = d;
        std::string stem = stem_of(d);
        if (is_glob(pattern))
            c.name = name_text.empty()
                         ? fs::relative(d, r.folder().empty() ? "." : r.folder()).string()
                         : name_text + "/" + stem;
        else
            c.name = name_text.empty() ? pattern : name_text;
        if (scaled) {
            std::string path = join_path(r.folder(), with_stem(scaled_text, stem));
            std::error_code ec;
            if (!fs::is_regular_file(path, ec))
                r.fail(scaled->source(), fmt::format("scaled deck '{}' does not exist", path));
            c.target = ScaledTarget{path, s.factors};
        } else {
            c.target = *s.factors;
            std::get<FactorTarget>(c.target).hold = hold;
        }
        if (!names.insert(c.name).second)
            r.fail(
                (name ? name : deck)->source(),
                fmt::format("a second case named '{}' (names choose shards: give 'name')", c.name));
        c.expect = s.expect;
        c.tolerances = s.tolerances;
        c.sweep = s.sweep;
        c.drive = s.drive;
        c.timeout = s.timeout;
        c.memory_mb = s.memory_mb;
        suite.cases.push_back(std::move(c));
    }
}

}  // namespace

const char* to_string(Expect e) {
    switch (e) {
        case Expect::pass:
            return "pass";
        case Expect::fail:
            return "fail";
        case Expect::none:
            return "none";
    }
    return "none";
}

Suite load_suite(const std::string& path, const FileSystem& files) {
    std::string problem;
    auto text = files.read(path, &problem);
    if (!text) {
        Diagnostic d;
        d.file = path;
        d.message = "cannot read the suite file: " + problem;
        throw DeckError(std::move(d));
    }
    SuiteReader r(path, std::string(text->bytes));
    toml::table top;
    try {
        top = toml::parse(text->bytes, path);
    } catch (const toml::parse_error& e) {
        r.fail(e.source(), std::string(e.description()));
    }
    Suite suite;
    suite.path = path;
    suite.name = stem_of(path);
    for (auto&& [k, v] : top)
        if (k.str() != "defaults" && k.str() != "case")
            r.fail(k.source(),
                   fmt::format("unknown key '{}' (a suite holds [defaults] and [[case]] tables)",
                               k.str()));
    CaseSettings defaults;
    if (const toml::node* d = top.get("defaults")) {
        if (!d->is_table()) r.fail(d->source(), "'defaults' must be a table: [defaults]");
        check_keys(r, *d->as_table(), kDefaultKeys, "[defaults]");
        for (auto&& [k, v] : *d->as_table()) read_setting(r, std::string(k.str()), v, defaults);
        defaults.km_given = defaults.kf_given = false;  // a case may still name its own 'scaled'
        if (defaults.factors && (!d->as_table()->get("km") || !d->as_table()->get("kf")))
            r.fail(d->source(), "[defaults] has only one of 'km' and 'kf': give both");
    }
    const toml::node* cases = top.get("case");
    if (!cases) r.fail(toml::source_region{{1, 1}, {1, 1}, nullptr}, "the suite has no [[case]]");
    if (!cases->is_array_of_tables())
        r.fail(cases->source(), "'case' must be an array of tables: [[case]]");
    std::set<std::string> names;
    for (const toml::node& c : *cases->as_array())
        read_case(r, *c.as_table(), defaults, suite, names);
    return suite;
}

Suite survey_suite(const std::string& folder, const FactorTarget& factors) {
    Diagnostic d;
    d.file = folder;
    std::error_code ec;
    if (!fs::is_directory(folder, ec)) {
        d.message = "not a folder of decks";
        throw DeckError(d);
    }
    Suite suite;
    suite.path = folder;
    suite.name = fs::path(folder).filename().empty()
                     ? fs::path(folder).parent_path().filename().string()
                     : fs::path(folder).filename().string();
    suite.survey = true;
    std::vector<std::string> decks;
    const std::set<std::string> kinds = {".cir", ".sp", ".spi", ".spice", ".net", ".ckt"};
    for (auto it = fs::recursive_directory_iterator(folder, ec);
         !ec && it != fs::recursive_directory_iterator(); it.increment(ec)) {
        if (it->path().filename().string().rfind('.', 0) == 0) {
            if (it->is_directory()) it.disable_recursion_pending();
            continue;
        }
        if (it->is_regular_file() && kinds.count(to_lower(it->path().extension().string())))
            decks.push_back(it->path().string());
    }
    std::sort(decks.begin(), decks.end());
    if (decks.empty()) {
        d.message = "no deck (*.cir, *.sp, *.spi, *.spice, *.net, *.ckt) in this folder";
        throw DeckError(d);
    }
    for (const auto& p : decks) {
        SuiteCase c;
        c.index = suite.cases.size();
        c.name = fs::relative(p, folder).string();
        c.deck = p;
        c.target = factors;
        c.expect = Expect::none;
        suite.cases.push_back(std::move(c));
    }
    return suite;
}

}  // namespace deckscale
