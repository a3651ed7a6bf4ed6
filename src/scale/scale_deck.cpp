// The entry points of scaling (scale/rescale.hpp): a pass over a loaded deck, or one pass
// while the deck is read (large files in pieces), each finished by the parameter plan.
#include "scale/rescale.hpp"

#include <memory>

#include "deck/pieces.hpp"
#include "scale/hold_plan.hpp"
#include "scale/param_plan.hpp"
#include "scale/pass.hpp"

namespace deckscale {

namespace {

// After a pass over the whole deck: plans its parameters from the uses the pass met and, when
// the plan rewrites a definition or leaves a use as written, scales the deck again with it.
// Finishes the result either way.
void plan_and_finish(const Deck& deck, const ScaleSettings& settings, ScalePass& pass,
                     ScaleResult& result) {
    bool unit_factors = settings.factors.km == 1 && settings.factors.kf == 1;
    // With parts held, a parameter shared by a held and a scaled part must keep its
    // definition: every use stays wrapped, as without a plan.
    ParamPlan plan = (unit_factors && !settings.record_changes) || !settings.hold.empty()
                         ? ParamPlan{}
                         : plan_params(deck, pass.param_uses(), settings.factors, settings.digits);
    if (plan.changes_output) {
        result = ScaleResult{};
        ScalePass again(settings, result);
        again.set_param_plan(&plan);
        again.run(deck);
        again.finish(deck);
    } else {
        pass.finish(deck);
    }
    result.params = std::move(plan.decisions);
}

}  // namespace

ScaleResult scale_deck(const Deck& deck, const ScaleSettings& settings) {
    ScaleResult result;
    ScalePass pass(settings, result);
    HoldPlan plan;
    if (!settings.hold.empty()) {
        plan = plan_holds(deck, settings.hold, settings.factors);
        pass.hold(plan);
    }
    pass.run(deck);
    plan_and_finish(deck, settings, pass, result);
    return result;
}

namespace {

// The scaling pass of one piece of a large file (see PieceReading).
struct PiecePass : PieceObserver {
    PiecePass(const ScaleSettings& settings, std::size_t bytes) : pass(settings, result) {
        pass.expect_bytes(bytes);
    }
    void observe(const Deck& piece, std::size_t file, const Card& card) override {
        pass.observe(piece, file, card);
    }
    ScaleResult result;
    ScalePass pass;
};

}  // namespace

ScaledDeck load_and_scale(const std::string& path, const FileSystem& fs,
                          const ScaleSettings& settings) {
    // One reading pass for both: the pass scales each card as soon as the reader checked it,
    // large files in pieces on several threads.
    ScaledDeck out;
    if (!settings.hold.empty()) {
        // What is held depends on the whole deck (a .subckt's uses, a model's instances).
        out.deck = load_deck(path, fs);
        out.result = scale_deck(out.deck, settings);
        return out;
    }
    ScalePass pass(settings, out.result);
    PieceReading pieces;
    pieces.threads = settings.threads;
    pieces.min_piece_bytes = settings.min_piece_bytes;
    pieces.start = [&](std::size_t bytes) { return std::make_unique<PiecePass>(settings, bytes); };
    pieces.join = [&](PieceObserver& piece, const DeckSymbols& before) {
        auto& p = static_cast<PiecePass&>(piece);
        return pass.take_piece(p.pass, p.result, before);
    };
    out.deck = load_deck(
        path, fs,
        [&](const Deck& so_far, std::size_t file, const Card& c) { pass.observe(so_far, file, c); },
        pieces);
    // A name used before it was declared: the answers given then may be wrong, so scale
    // the (now complete) deck again from scratch.
    if (pass.relied_on_missing(out.deck.symbols))
        out.result = scale_deck(out.deck, settings);
    else
        plan_and_finish(out.deck, settings, pass, out.result);
    out.result.edits.resize(out.deck.files.size());
    return out;
}

}  // namespace deckscale
