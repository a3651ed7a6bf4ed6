// The scaling pass with held parts (scale/hold_plan.hpp): every card is rendered as the plan
// says. Held parts, and .subckt bodies only held parts use, are rendered as written (what the
// pass would have refused there is kept as what they could not have followed). A .subckt
// used by held and scaled parts is rendered as written in place and scaled into a copy
// inserted after its .ends; a shared global .model the same way after its card. Scaled X
// lines and instances point at the copies.
#include <fmt/format.h>

#include "base/text_util.hpp"
#include "scale/codemodels.hpp"
#include "scale/hold_items.hpp"
#include "scale/hold_plan.hpp"
#include "scale/hold_scan.hpp"
#include "scale/pass.hpp"
#include "scale/terminals.hpp"

namespace deckscale {
namespace {

// Where a card's last line end starts and its text ("\n" and the card's end without one).
std::pair<std::uint32_t, std::string> line_end(const Card& c) {
    if (!c.tokens.empty() && c.tokens.back().kind == TokenKind::line_end)
        return {c.tokens.back().begin, std::string(c.text(c.tokens.back()))};
    return {c.end(), "\n"};
}

}  // namespace

void ScalePass::with_render(Render how, EditSet* into, std::size_t part,
                            const std::function<void()>& f) {
    // A card rendered as written, or only probed, leaves nothing in what the deck needs as
    // a whole (transient tolerances, GMIN): those follow the scaled parts.
    ToleranceScan saved = tolerances_;
    Render was = render_;
    EditSet* was_into = render_edits_;
    std::size_t was_part = render_part_;
    render_ = how;
    render_edits_ = into;
    render_part_ = part;
    f();
    if (how == Render::held || how == Render::probe) tolerances_ = saved;
    render_ = was;
    render_edits_ = was_into;
    render_part_ = was_part;
}

void ScalePass::note_held_refusal(const Token& at, std::string why) {
    hold_->parts[render_part_].could_not_follow.push_back(
        card_->file->diagnose(Severity::note, at.begin, at.size(), std::move(why)));
}

void ScalePass::probe_shared_models(const Deck& deck) {
    region_copies_.assign(hold_->regions.size(), EditSet{});
    if (hold_->shared_models.empty()) return;
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind != CardKind::dot || c.fields.size() < 3 || card_keyword(c) != ".model")
                return;
            std::string name = to_lower(c.field_text(1));
            auto shared = hold_->shared_models.find(name);
            if (shared == hold_->shared_models.end() || hold_->region_at(f, c.begin())) return;
            file_ = f;
            EditSet scratch;
            with_render(Render::probe, &scratch, 0, [&] { visit(c); });
            if (!scratch.empty()) hold_->model_copies[name] = shared->second.first;
        });
}

void ScalePass::visit_holding(const Card& c) {
    const HoldRegion* r = hold_->region_at(file_, c.begin());
    if (!r || !r->held) {
        visit_scoped(c, r);
        return;
    }
    if (refuse_include_in_held(c, *r)) return;
    if (r->copy.empty() || file_ != r->file) {
        // A file included inside a .subckt with a copy is refused at its include card.
        with_render(Render::held, nullptr, r->part, [&] { visit(c); });
        return;
    }
    // As written in place; scaled into the copy, which takes the copy's name.
    EditSet& copy = region_copies_[static_cast<std::size_t>(r - hold_->regions.data())];
    copy_name_ = r->copy;
    with_render(Render::copy, &copy, 0, [&] {
        visit_scoped(c, r);
        std::string kw = card_keyword(c);
        if (c.kind == CardKind::dot && c.fields.size() > 1 &&
            ((kw == ".subckt" && c.begin() == r->begin) || (kw == ".ends" && c.end() == r->end)))
            rename(c.fields[1], r->copy, "name of the scaled copy");
    });
    if (c.end() != r->end) return;
    std::string_view text = c.file->text();
    target().add(text, r->copy_at, 0, r->eol + apply_edits(text, copy, r->begin, r->copy_at));
}

bool ScalePass::refuse_include_in_held(const Card& c, const HoldRegion& r) {
    if (c.kind != CardKind::dot || c.fields.size() < 2) return false;
    const IncludeRef* inc = deck_->include_at(file_, c.fields[1].begin);
    if (!inc) return false;
    std::string why;
    const std::string& name = hold_->parts[r.part].name;
    if (!r.copy.empty())
        why = fmt::format(".subckt {} is used by held and by scaled parts, and its scaled copy "
                          "cannot include the file this card reads, which stays as written "
                          "for the held ones: hold every instance of {} or none",
                          name, name);
    else if (hold_->file_region[inc->target_file] == shared_include)
        why = fmt::format("the file this card reads inside held .subckt {} is included "
                          "elsewhere too, where it is scaled: one file cannot be both; hold "
                          "every use of it or none",
                          name);
    if (why.empty()) return false;
    card_ = &c;
    card_marked_ = false;
    unscalable(c.fields[1], why);
    return true;
}

void ScalePass::visit_scoped(const Card& c, const HoldRegion* r) {
    if (c.kind == CardKind::element && !c.fields.empty()) {
        visit_element_scoped(c, r);
        return;
    }
    if (c.kind != CardKind::dot || c.fields.size() < 3 || card_keyword(c) != ".model") {
        visit(c);
        return;
    }
    std::string name = to_lower(c.field_text(1));
    if (auto held = hold_->held_models.find(name); held != hold_->held_models.end()) {
        with_render(Render::held, nullptr, held->second, [&] { visit(c); });
        return;
    }
    auto shared = hold_->shared_models.find(name);
    if (r || shared == hold_->shared_models.end()) {
        visit(c);
        return;
    }
    if (is_code_model_card(c)) {
        card_ = &c;
        card_marked_ = false;
        unscalable(c.fields[1],
                   fmt::format("code model '{}' is used by held and by scaled A devices, and "
                               "its instances' port types decide its copies: hold the model "
                               "itself (model:{}) or none of its instances",
                               c.field_text(1), c.field_text(1)));
        return;
    }
    if (!hold_->model_copies.count(name)) {
        visit(c);  // scaling leaves it as it is, or refuses it for the scaled instances
        return;
    }
    with_render(Render::held, nullptr, shared->second.second, [&] { visit(c); });
    copy_model(c, name);
}

void ScalePass::visit_element_scoped(const Card& c, const HoldRegion* r) {
    ElementLinks links =
        element_links(c, [&](const std::string& n) { return symbols_->models.count(n) > 0; });
    std::string model = links.model ? to_lower(c.field_text(*links.model)) : "";
    std::string subckt = links.subckt ? to_lower(c.field_text(*links.subckt)) : "";
    if (!subckt.empty() && hold_->held_subckts.count(subckt)) return;  // nothing to scale
    std::optional<std::size_t> part;
    if (!r) {
        auto it = hold_->held_elements.find({file_, c.fields[0].begin});
        if (it != hold_->held_elements.end()) part = it->second;
    }
    if (auto it = hold_->held_models.find(model); !part && it != hold_->held_models.end())
        part = it->second;
    if (part) {
        with_render(Render::held, nullptr, *part, [&] { visit(c); });
        return;
    }
    visit(c);
    card_ = &c;
    if (!model.empty() && !(r && r->local_models.count(model)))
        if (auto copy = hold_->model_copies.find(model); copy != hold_->model_copies.end())
            rename(c.fields[*links.model], copy->second, "model (scaled copy)");
    if (!subckt.empty() && !(r && r->local_subckts.count(subckt)))
        if (auto copy = hold_->subckt_copies.find(subckt); copy != hold_->subckt_copies.end())
            rename(c.fields[*links.subckt], copy->second, "subckt (scaled copy)");
}

void ScalePass::copy_model(const Card& c, const std::string& name) {
    EditSet copy;
    copy_name_ = hold_->model_copies.at(name);
    with_render(Render::copy, &copy, 0, [&] {
        visit(c);
        rename(c.fields[1], copy_name_, "name of the scaled copy");
    });
    auto [at, eol] = line_end(c);
    std::string_view text = c.file->text();
    result_.edits[file_].add(text, at, 0, eol + apply_edits(text, copy, c.begin(), at));
}

void ScalePass::finish_holding() {
    ScaleFactors f = settings_.factors;
    for (auto& [name, shared] : hold_->shared_models)
        if (auto copy = hold_->model_copies.find(name); copy != hold_->model_copies.end())
            hold_->parts[shared.second].copy = copy->second;
    // A shared model that scaling leaves as it is was not held: both kinds use its card.
    std::vector<bool> unchanged(hold_->parts.size(), false);
    for (auto& [name, shared] : hold_->shared_models)
        unchanged[shared.second] = !hold_->model_copies.count(name);
    for (std::size_t i = 0; i < hold_->parts.size(); ++i)
        if (!unchanged[i]) result_.held.push_back(hold_->parts[i]);
    for (const auto& d : hold_->boundaries) result_.notes.push_back(d);
    if (f.km == 1 && f.kf == 1) return;  // factors of 1 give the deck back byte for byte
    result_.edits[0].add(deck_->top().text(), hold_->held_line_at, 0,
                         hold_->held_line_eol + held_line(hold_->items, f));
}

}  // namespace deckscale
