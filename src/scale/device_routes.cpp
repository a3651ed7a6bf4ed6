// The pass's decisions about semiconductor devices that depend on the whole deck: the MOS and
// BJT models it declares, whether its BJTs go by area and its diodes by their model cards
// (scale/semiconductors.cpp, scale/diode_model.hpp).
#include <memory>

#include "deck/analyses.hpp"
#include "scale/diode_model.hpp"
#include "scale/pass.hpp"
#include "scale/semiconductors.hpp"

namespace deckscale {

const MosModels& ScalePass::mos_models() {
    if (!mos_models_) mos_models_ = collect_mos_models(*deck_);
    return *mos_models_;
}

bool ScalePass::bjt_by_area() {
    if (bjt_by_area_) return *bjt_by_area_;
    const MosModels& models = mos_models();
    // A deck that sets its own gmin has it divided by Km (options), which the GMIN across a
    // BJT scaled by m would get twice: by area the BJT's junction GMIN is the deck's alone.
    bool apart = deck_->symbols.gmin_set;
    for (std::size_t f = 0; f < deck_->files.size() && !apart; ++f)
        deck_->visit_file(f, [&](const Card& c) { apart = apart || gmin_apart_device(c, models); });
    if (apart) {
        if (!analyses_) analyses_ = std::make_shared<const DeckAnalyses>(find_analyses(*deck_));
        apart = !analyses_->asks_disto;
    }
    bjt_by_area_ = apart;
    return apart;
}

bool ScalePass::diode_by_model() {
    if (observing_ || settings_.factors.km == 1) return false;
    if (diode_by_model_) return *diode_by_model_;
    if (!analyses_) analyses_ = std::make_shared<const DeckAnalyses>(find_analyses(*deck_));
    diode_by_model_ = analyses_->asks_disto && diodes_follow_by_model(*deck_);
    return *diode_by_model_;
}

}  // namespace deckscale
