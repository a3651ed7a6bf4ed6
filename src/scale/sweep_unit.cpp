// The unit of the quantity a DC analysis sweeps, for measurements on that sweep (ngspice 39
// manual 15.3.2, 15.4; shared notes "control-and-sweeps.md" A.2 meas rows).
#include "scale/sweep_unit.hpp"

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/control_script.hpp"
#include "deck/sweep_steps.hpp"
#include "scale/pass.hpp"

namespace deckscale {

std::optional<Unit> swept_unit(std::string_view source) {
    std::string s = to_lower(source);
    if (s == "temp") return Unit::none;
    switch (s.empty() ? '\0' : s[0]) {
        case 'v':
            return Unit::volt;
        case 'i':
            return Unit::ampere;
        case 'r':
            return Unit::ohm;
        default:
            return std::nullopt;
    }
}

DcSweeps dc_sweeps(const Deck& deck) {
    DcSweeps out;
    bool same = true;
    auto take = [&](std::string_view source) {
        auto u = swept_unit(source);
        if (!u || (out.found > 0 && out.unit != u)) same = false;
        if (out.found++ == 0) out.unit = u;
    };
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind == CardKind::dot && c.fields.size() > 1 && card_keyword(c) == ".dc")
                take(c.field_text(1));
            const Token* block = c.kind == CardKind::control ? control_token(c) : nullptr;
            if (!block) return;
            for (const auto& cmd : control_commands(*c.file, *block))
                if (cmd.fields.size() > 1 && iequals(c.text(cmd.fields[0]), "dc"))
                    take(c.text(cmd.fields[1]));
        });
    if (!same) out.unit.reset();
    return out;
}

DcSweeps card_plot_scales(const Deck& deck) {
    DcSweeps out;
    bool same = true;
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::dot) return;
            std::string kw = card_keyword(c);
            std::optional<Unit> u;
            if (kw == ".tran")
                u = Unit::second;
            else if (kw == ".ac" || kw == ".noise" || kw == ".sp" || kw == ".disto")
                u = Unit::hertz;
            else if (kw == ".dc")
                u = c.fields.size() > 1 ? swept_unit(c.field_text(1)) : std::nullopt;
            else
                return;
            if (!u || (out.found > 0 && out.unit != u)) same = false;
            if (out.found++ == 0) out.unit = u;
        });
    if (!same) out.unit.reset();
    return out;
}

std::optional<Unit> ScalePass::card_plot_scale() {
    if (observing_) {
        // Analysis cards may follow: decide once the whole deck is read.
        rescan_ = true;
        return std::nullopt;
    }
    if (!deck_plot_read_) {
        deck_plot_unit_ = card_plot_scales(*deck_).unit;
        deck_plot_read_ = true;
    }
    return deck_plot_unit_;
}

std::optional<Unit> ScalePass::dc_swept_unit(const Token& at, std::string_view key) {
    if (block_dc_seen) {
        if (!block_dc_unit)
            unscalable(at, fmt::format("{}= of a DC measurement: the sweep before it in this "
                                       ".control block is not of a V, I or R source or TEMP",
                                       key));
        return block_dc_unit;
    }
    if (observing_) {
        // A .dc card may follow: decide once the whole deck is read.
        rescan_ = true;
        return std::nullopt;
    }
    if (!deck_dc_read_) {
        DcSweeps s = dc_sweeps(*deck_);
        deck_dc_read_ = true;
        deck_dc_found_ = s.found;
        deck_dc_unit_ = s.unit;
    }
    if (deck_dc_unit_) return deck_dc_unit_;
    unscalable(at, deck_dc_found_ == 0
                       ? fmt::format("{}= of a DC measurement in a deck with no DC sweep", key)
                       : fmt::format("{}= of a DC measurement: the deck's DC sweeps are not all of "
                                     "V, I or R sources or TEMP, or differ in unit",
                                     key));
    return std::nullopt;
}

std::optional<std::pair<double, double>> ScalePass::sweep_bounds(std::string_view analysis) {
    if (observing_) {
        rescan_ = true;  // the analysis card may follow
        return std::nullopt;
    }
    if (!analyses_) analyses_ = std::make_shared<const DeckAnalyses>(find_analyses(*deck_));
    const DeckAnalyses& a = *analyses_;
    if (analysis == "tran" && a.tran) return std::pair{a.tran->tstart, a.tran->tstop};
    if (analysis == "ac" && a.ac) return std::pair{a.ac->fstart, a.ac->fstop};
    if (analysis == "dc" && a.dc) {
        const DcLevel& l = a.dc->levels.front();
        return std::pair{ngspice_read(l.start), ngspice_read(l.stop)};
    }
    return std::nullopt;
}

}  // namespace deckscale
