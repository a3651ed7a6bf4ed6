#include "deck/pieces.hpp"

#include <algorithm>

#include "deck/checks.hpp"

namespace deckscale {
namespace {

bool is_letter(char c) { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z'); }

}  // namespace

std::vector<std::uint32_t> piece_starts(std::string_view text, unsigned pieces) {
    std::vector<std::uint32_t> starts;
    constexpr std::size_t kSearch = 1 << 16;  // give up on a split after this many bytes
    for (unsigned k = 1; k < pieces; ++k) {
        std::size_t at = text.size() / pieces * k;
        std::size_t limit = std::min(text.size(), at + kSearch);
        std::size_t found = 0;
        while (at < limit) {
            std::size_t nl = text.find('\n', at);
            if (nl == std::string_view::npos || nl + 1 >= text.size()) break;
            at = nl + 1;
            std::size_t first = at;  // cards may be indented
            while (first < limit && (text[first] == ' ' || text[first] == '\t')) ++first;
            if (first < text.size() && is_letter(text[first])) {
                found = at;
                break;
            }
        }
        if (found > 0 && (starts.empty() || found > starts.back()))
            starts.push_back(static_cast<std::uint32_t>(found));
    }
    return starts;
}

void read_piece(Piece& p, const SourceFile& file, std::size_t index, FileRole role,
                const std::atomic<bool>& cancel) {
    try {
        p.stopped = read_cards(
            file, role,
            [&](const Card& c) {
                if (cancel.load(std::memory_order_relaxed)) throw StopReading{};
                std::string kw = c.kind == CardKind::dot ? card_keyword(c) : std::string();
                // These depend on what comes before the piece: left to the main thread.
                if (kw == ".include" || kw == ".inc" || kw == ".lib" || kw == ".endl")
                    throw StopReading{};
                if (kw == ".ends" && p.opened.empty()) throw StopReading{};
                gather_symbols(c, p.local.symbols);
                check_card(c, kw, p.local.warnings);
                p.observer->observe(p.local, index, c);
                if (kw == ".subckt")
                    p.opened.push_back(open_subckt(c));
                else if (kw == ".ends")
                    p.opened.pop_back();
            },
            ReadSpan{p.from, p.stop_at});
        p.usable = true;
    } catch (...) {
        p.usable = false;  // read again on the main thread, which reports the error in order
    }
}

void add_symbols(DeckSymbols& to, DeckSymbols&& later) {
    to.params.merge(later.params);
    for (auto& [name, type] : later.models) to.models[name] = std::move(type);  // later wins
    to.inductors.merge(later.inductors);
    to.coupled_inductors.merge(later.coupled_inductors);
    if (later.gmin_set) {
        to.gmin = later.gmin;
        to.gmin_set = true;
    }
    if (later.reltol_set) {
        to.reltol = later.reltol;
        to.reltol_set = true;
    }
}

}  // namespace deckscale
