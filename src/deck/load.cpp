#include "deck/load.hpp"

#include <algorithm>
#include <atomic>
#include <map>
#include <system_error>
#include <thread>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/checks.hpp"
#include "deck/include_cycles.hpp"
#include "deck/pieces.hpp"

namespace deckscale {

std::string card_keyword(const Card& card) {
    if (card.fields.empty()) return {};
    std::string kw = to_lower(card.field_text(0));
    // ngspice 39 reads .macro as .subckt and .eom as .ends (tried: an X line calling a
    // '.macro rcm a b' ... '.eom' definition runs; a lone '.eom' is an "extra .ends").
    if (kw == ".macro") return ".subckt";
    if (kw == ".eom") return ".ends";
    return kw;
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

std::string unquote(std::string_view s) {
    if (s.size() >= 2 && (s.front() == '"' || s.front() == '\'') && s.back() == s.front())
        return std::string(s.substr(1, s.size() - 2));
    return std::string(s);
}

class Loader {
public:
    Loader(const FileSystem& fs, const DeckObserver& observer, const PieceReading& pieces)
        : fs_(fs), observer_(observer), pieces_(pieces) {}

    Deck take() { return std::move(deck_); }

    std::size_t load(const std::string& path, FileRole role, const SourceFile* from,
                     const Token* from_token) {
        // Includes are followed by recursion: a chain deeper than this is refused rather than
        // allowed to overflow the stack (the same limit as GCC's #include depth).
        constexpr std::size_t kMaxIncludeDepth = 200;
        if (from && include_depth_ > kMaxIncludeDepth)
            throw DeckError(from->diagnose(
                Severity::error, from_token->begin, from_token->size(),
                fmt::format("includes nested more than {} deep: deckscale does not follow them",
                            kMaxIncludeDepth)));
        std::string id = fs_.identity(path);
        // A file is read once; cycles are looked for in the (file, section) graph at the end.
        if (auto it = loaded_.find(id); it != loaded_.end()) return it->second;

        std::string problem;
        auto text = fs_.read(path, &problem);
        if (!text) {
            if (!from)
                throw DeckError(Diagnostic{Severity::error, path, 0, 0, 0, "",
                                           fmt::format("cannot read the deck file: {}", problem),
                                           {}});
            throw DeckError(from->diagnose(
                Severity::error, from_token->begin, from_token->size(),
                fmt::format("cannot read included file '{}': {}", path, problem)));
        }
        auto source = std::make_unique<SourceFile>(path, std::move(*text));
        const SourceFile& file = *source;
        if (role == FileRole::deck && file.text().empty())  // located at 1:1 like any other
            throw DeckError(file.diagnose(Severity::error, 0, 0,
                                          "empty file: a deck needs a title line and cards"));
        if (auto nul = file.text().find('\0'); nul != std::string::npos)
            throw DeckError(file.diagnose(Severity::error, static_cast<std::uint32_t>(nul), 1,
                                          "binary data (a NUL byte): this is not a SPICE deck"));

        std::size_t index = deck_.files.size();
        deck_.files.push_back(DeckFile{std::move(source), role});
        loaded_[id] = index;
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
        return index;
    }

private:
    std::size_t include_depth_ = 0;  // includes being followed right now
    void check_file(std::size_t index) {
        const SourceFile& file = *deck_.files[index].source;
        FileRole role = deck_.files[index].role;
        std::vector<OpenSubckt> subckts;
        std::string section;  // the .lib section the card sits in
        CardVisitor visit = [&](const Card& c) {
            gather_symbols(c, deck_.symbols);
            std::string kw = c.kind == CardKind::dot ? card_keyword(c) : std::string();
            check_card(c, kw, deck_.warnings, !section.empty());
            if (observer_) observer_(deck_, index, c);
            if (c.kind != CardKind::dot) return;
            if (kw == ".subckt") {
                subckts.push_back(open_subckt(c));
            } else if (kw == ".ends") {
                if (subckts.empty())
                    throw DeckError(file.diagnose(Severity::error, c.fields[0].begin,
                                                  c.fields[0].size(), "'.ends' without a '.subckt'"));
                subckts.pop_back();
            } else if (kw == ".include" || kw == ".inc" ||
                       (kw == ".lib" && value_fields(c) >= 2)) {
                follow_include(index, c, kw == ".lib", section);
            } else if (kw == ".endl") {
                section.clear();
            } else if (kw == ".lib" && value_fields(c) == 1 && !names_a_file(c)) {
                section = to_lower(c.field_text(1));
            } else if (kw == ".lib" && value_fields(c) == 1) {
                // ".lib file" without a section: a section header inside a library, but in a
                // deck that names an existing file it is the include form some other simulators use.
                deck_.warnings.push_back(file.diagnose(
                    Severity::warning, c.fields[1].begin, c.fields[1].size(),
                    ".lib with a file name and no section is read as .include (ngspice 39 reads "
                    "it so only with 'set ngbehavior=lt' or 'ps')"));
                follow_include(index, c, false, section);
            }
        };
        std::vector<std::uint32_t> starts;
        if (pieces_.start && pieces_.join)
            starts = piece_starts(file.text(), piece_count(file.text().size()));
        if (starts.empty())
            read_cards(file, role, visit);
        else
            read_in_pieces(index, starts, visit, subckts);
        if (!subckts.empty()) {
            const auto& o = subckts.back();
            throw DeckError(file.diagnose(
                Severity::error, o.offset, o.length,
                fmt::format("unterminated .subckt '{}': no .ends before the end of the file", o.name)));
        }
    }

    unsigned piece_count(std::size_t bytes) const {
        unsigned threads = pieces_.threads ? pieces_.threads : std::thread::hardware_concurrency();
        std::size_t by_size = bytes / std::max<std::size_t>(pieces_.min_piece_bytes, 1);
        return static_cast<unsigned>(std::min<std::size_t>(threads, by_size));
    }

    // Pieces after the first go to helper threads while this thread reads the first; then,
    // in file order, each piece is taken over if it starts where reading stopped and its
    // observer agrees (see PieceReading), and whatever is left is read here.
    void read_in_pieces(std::size_t index, const std::vector<std::uint32_t>& starts,
                        const CardVisitor& visit, std::vector<OpenSubckt>& subckts) {
        const SourceFile& file = *deck_.files[index].source;
        FileRole role = deck_.files[index].role;
        auto size = static_cast<std::uint32_t>(file.text().size());
        std::vector<Piece> pieces(starts.size());
        for (std::size_t k = 0; k < starts.size(); ++k) {
            pieces[k].from = starts[k];
            pieces[k].stop_at = k + 1 < starts.size() ? starts[k + 1] : UINT32_MAX;
            pieces[k].observer = pieces_.start(std::min(pieces[k].stop_at, size) - starts[k]);
        }
        std::atomic<bool> cancel{false};
        std::vector<std::jthread> threads;  // joined on every way out, errors included
        struct CancelOnExit {
            std::atomic<bool>& flag;
            ~CancelOnExit() { flag = true; }
        } cancel_on_exit{cancel};
        try {
            for (auto& p : pieces)
                threads.emplace_back([&file, &p, index, role, &cancel] {
                    read_piece(p, file, index, role, cancel);
                });
        } catch (const std::system_error&) {
            // No more threads to be had: the pieces left are read here, in order.
        }
        std::uint32_t pos = read_cards(file, role, visit, ReadSpan{0, starts[0]});
        for (std::size_t k = 0; k < pieces.size(); ++k) {
            if (k < threads.size()) threads[k].join();
            Piece& p = pieces[k];
            if (pos == p.from && p.usable && pieces_.join(*p.observer, deck_.symbols)) {
                add_symbols(deck_.symbols, std::move(p.local.symbols));
                for (auto& w : p.local.warnings) deck_.warnings.push_back(std::move(w));
                for (auto& o : p.opened) subckts.push_back(std::move(o));
                pos = p.stopped;
                ++deck_.pieces_taken;
            }
            if (pos < size && pos < p.stop_at)
                pos = read_cards(file, role, visit, ReadSpan{pos, p.stop_at});
        }
    }

    // True when field 1 names a readable file relative to the card's file.
    bool names_a_file(const Card& c) const {
        if (c.fields.size() < 2) return false;
        std::string name = unquote(c.text(c.fields[1]));
        return fs_.read(join_path(directory_of(c.file->path()), name)).has_value();
    }

    void follow_include(std::size_t index, const Card& c, bool is_lib, const std::string& section) {
        const Token& path_token = c.fields[1];
        std::string name = unquote(c.text(path_token));
        // ngspice 39 strips end-of-line comments from an include line before it takes the file
        // name, quoted or not (shared notes "deck-syntax.md" §1; tried: '.include "a;b.lib"'
        // and '.include "sub//c.lib"' both stop it with ".include filename missing").
        for (std::string_view mark : {";", "//"})
            if (name.find(mark) != std::string::npos)
                throw DeckError(c.file->diagnose(
                    Severity::error, path_token.begin, path_token.size(),
                    fmt::format("ngspice 39 strips comments from this line before it reads the "
                                "file name, so the '{}' in the path cuts it there (it stops with "
                                "\".include filename missing\"); rename the file or folder",
                                mark)));
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
        ++include_depth_;
        ref.target_file = load(path, FileRole::include, c.file, &path_token);
        --include_depth_;
        edges_.push_back(IncludeEdge{index, section, ref.target_file, to_lower(ref.section)});
        edge_paths_.push_back(path);
        deck_.includes.push_back(ref);
    }

public:
    // Throws for the first include cycle: the same (file, section) twice on one chain.
    void check_cycles(const std::string& top_path) const {
        auto chain = first_include_cycle(edges_);
        if (chain.empty()) return;
        auto label = [&](std::size_t edge) {
            const std::string& path = edge == SIZE_MAX ? top_path : edge_paths_[edge];
            const std::string& sec = edge == SIZE_MAX ? std::string() : edges_[edge].to_section;
            return sec.empty() ? path : fmt::format("{} ({})", path, sec);
        };
        const IncludeEdge& last = edges_[chain.back()];
        // The chain starts where the closing edge's target was first entered.
        std::size_t start = 0;
        std::size_t entered = SIZE_MAX;  // the edge that entered the node (SIZE_MAX: the top)
        if (!(last.to_file == 0 && last.to_section.empty()))
            for (std::size_t k = 0; k < chain.size(); ++k)
                if (edges_[chain[k]].to_file == last.to_file &&
                    edges_[chain[k]].to_section == last.to_section) {
                    start = k + 1;
                    entered = chain[k];
                    break;
                }
        std::string text = label(entered);
        for (std::size_t k = start; k < chain.size(); ++k) text += " -> " + label(chain[k]);
        auto at = [&](std::size_t edge, Severity sev, std::string message) {
            const IncludeRef& ref = deck_.includes[edge];
            return deck_.files[ref.from_file].source->diagnose(sev, ref.path_token.begin,
                                                               ref.path_token.size(), message);
        };
        Diagnostic d = at(chain.back(), Severity::error, fmt::format("include cycle: {}", text));
        for (std::size_t k = chain.size() - 1; k-- > 0;)
            d.notes.push_back(at(chain[k], Severity::note, "included from here"));
        throw DeckError(std::move(d));
    }

private:
    const FileSystem& fs_;
    const DeckObserver& observer_;
    const PieceReading& pieces_;
    Deck deck_;
    std::vector<IncludeEdge> edges_;  // one per entry of deck_.includes, in the same order
    std::vector<std::string> edge_paths_;
    std::map<std::string, std::size_t> loaded_;
};

}  // namespace

Deck load_deck(const std::string& path, const FileSystem& fs, const DeckObserver& observer) {
    return load_deck(path, fs, observer, PieceReading{});
}

Deck load_deck(const std::string& path, const FileSystem& fs, const DeckObserver& observer,
               const PieceReading& pieces) {
    Loader loader(fs, observer, pieces);
    loader.load(path, FileRole::deck, nullptr, nullptr);
    loader.check_cycles(path);
    return loader.take();
}

}  // namespace deckscale
