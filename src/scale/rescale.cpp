#include "scale/rescale.hpp"

#include <algorithm>
#include <cfloat>
#include <cmath>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/spice_number.hpp"
#include "scale/after_end.hpp"
#include "scale/codemodels.hpp"
#include "scale/expression.hpp"
#include "scale/hold_plan.hpp"
#include "scale/pass.hpp"
#include "scale/semiconductors.hpp"

namespace deckscale {

void atoms_of(const Card& card, std::size_t first, std::vector<Atom>& out) {
    out.clear();
    const auto& f = card.fields;
    for (std::size_t i = first; i < f.size(); ++i) {
        TokenKind k = f[i].kind;
        if (k == TokenKind::lparen || k == TokenKind::rparen || k == TokenKind::comma ||
            k == TokenKind::equals)
            continue;
        if (k == TokenKind::word && i + 1 < f.size() && f[i + 1].kind == TokenKind::equals) {
            Atom a{&f[i], nullptr, i};
            if (i + 2 < f.size() && f[i + 2].kind != TokenKind::equals &&
                f[i + 2].kind != TokenKind::comma && f[i + 2].kind != TokenKind::rparen &&
                f[i + 2].kind != TokenKind::lparen) {
                a.value = &f[i + 2];
                i += 2;
            } else {
                i += 1;
            }
            out.push_back(a);
            continue;
        }
        out.push_back(Atom{nullptr, &f[i], i});
    }
}

const std::vector<Atom>& ScalePass::atoms(std::size_t first) {
    atoms_of(*card_, first, atoms_);
    return atoms_;
}

ScalePass::ScalePass(const ScaleSettings& settings, ScaleResult& result)
    : settings_(settings), result_(result) {}

void ScalePass::run(const Deck& deck) {
    observing_ = false;
    symbols_ = &deck.symbols;
    deck_ = &deck;
    code_model_uses_ = collect_code_model_uses(deck, settings_.factors);
    mos_models_.reset();
    bjt_by_area_.reset();
    diode_by_model_.reset();
    several_blocks_.reset();
    result_.edits.resize(deck.files.size());
    if (hold_) probe_shared_models(deck);
    for (std::size_t f = 0; f < deck.files.size(); ++f)
        deck.visit_file(f, [&](const Card& c) {
            file_ = f;
            if (hold_)
                visit_holding(c);
            else
                visit(c);
        });
    if (hold_) finish_holding();
}

void ScalePass::observe(const Deck& so_far, std::size_t file, const Card& card) {
    observing_ = true;
    symbols_ = &so_far.symbols;
    deck_ = &so_far;
    if (result_.edits.size() <= file) {
        result_.edits.resize(file + 1);
        // At most about one edit per value of a dense deck: reserve that much up front, so
        // a million edits are not copied again and again as the buffers grow.
        std::size_t size = expected_bytes_ ? expected_bytes_ : card.file->text().size();
        result_.edits[file].reserve(size / 12, size / 3);
    }
    file_ = file;
    visit(card);
}

bool ScalePass::relied_on_missing(const DeckSymbols& s) const {
    if (rescan_ || lookups_varied_) return true;
    for (const auto& n : missed_params_)
        if (s.params.count(n)) return true;
    for (const auto& n : missed_models_)
        if (s.models.count(n)) return true;
    for (const auto& n : missed_inductors_)
        if (s.inductors.count(n)) return true;
    if (reltol_used_ && *reltol_used_ != s.reltol) return true;
    return gmin_used_ && *gmin_used_ != s.gmin;
}

bool ScalePass::take_piece(ScalePass& piece, ScaleResult& r, const DeckSymbols& before) {
    for (const auto& n : piece.missed_params_)
        if (before.params.count(n)) return false;
    for (const auto& n : piece.missed_models_)
        if (before.models.count(n)) return false;
    for (const auto& n : piece.missed_inductors_)
        if (before.inductors.count(n)) return false;
    if (piece.gmin_used_ && before.gmin_set) return false;  // it may have used the default
    if (piece.reltol_used_ && before.reltol_set) return false;
    if (gmin_used_ && piece.gmin_used_ && *gmin_used_ != *piece.gmin_used_) rescan_ = true;
    if (!gmin_used_) gmin_used_ = piece.gmin_used_;
    if (reltol_used_ && piece.reltol_used_ && *reltol_used_ != *piece.reltol_used_) rescan_ = true;
    if (!reltol_used_) reltol_used_ = piece.reltol_used_;
    rescan_ = rescan_ || piece.rescan_ || piece.lookups_varied_;
    tolerances_.merge(piece.tolerances_);
    missed_params_.merge(piece.missed_params_);
    missed_models_.merge(piece.missed_models_);
    missed_inductors_.merge(piece.missed_inductors_);
    for (auto& u : piece.param_uses_) param_uses_.push_back(std::move(u));
    if (result_.edits.size() < r.edits.size()) result_.edits.resize(r.edits.size());
    for (std::size_t f = 0; f < r.edits.size(); ++f) result_.edits[f].append(std::move(r.edits[f]));
    for (auto& c : r.changes) result_.changes.push_back(std::move(c));
    result_.change_count += r.change_count;
    for (auto& d : r.unscalable) result_.unscalable.push_back(std::move(d));
    for (auto& d : r.notes) result_.notes.push_back(std::move(d));
    return true;
}

bool ScalePass::is_param(const std::string& name) const {
    if (symbols_->params.count(name)) return true;
    missed_params_.insert(name);
    return false;
}

const std::string* ScalePass::model_type(const std::string& name) const {
    auto it = symbols_->models.find(name);
    if (it != symbols_->models.end()) return &it->second;
    missed_models_.insert(name);
    return nullptr;
}

bool ScalePass::is_inductor(const std::string& name) const {
    if (symbols_->inductors.count(name)) return true;
    missed_inductors_.insert(name);
    return false;
}


// Remembers the first value a lookup gave, and whether a later one gave another (a value
// set between two uses): either can differ from the final symbols.
void ScalePass::remember(std::optional<double>& used, double value) const {
    if (used && *used != value) lookups_varied_ = true;
    if (!used) used = value;
}

double ScalePass::gmin() const {
    remember(gmin_used_, symbols_->gmin);
    return symbols_->gmin;
}

double ScalePass::reltol() const {
    remember(reltol_used_, symbols_->reltol);
    return symbols_->reltol;
}

void ScalePass::visit(const Card& c) {
    card_ = &c;
    card_marked_ = false;
    in_control_ = c.kind == CardKind::control;
    if (plan_) {
        // The plan's rewritten definitions on this card (.param, .subckt params:, X lines).
        auto it = std::lower_bound(
            plan_->edits.begin(), plan_->edits.end(), std::make_pair(file_, c.begin()),
            [](const auto& e, const auto& at) { return std::make_pair(e.file, e.begin) < at; });
        for (; it != plan_->edits.end() && it->file == file_ && it->begin < c.end(); ++it)
            edit(it->begin, it->length, it->text, it->param, it->unit, it->factor);
    }
    if (c.kind == CardKind::control) {
        scale_control_block(*this);
        return;
    }
    if (c.kind == CardKind::after_end) {
        check_after_end(*this);
        return;
    }
    if (c.fields.empty()) return;
    if (c.kind == CardKind::dot) {
        std::string kw = card_keyword(c);
        // A code model's factors depend on A devices anywhere in the deck: while reading,
        // leave it to the pass over the complete deck.
        if (kw == ".model" && observing_ && is_code_model_card(c)) {
            rescan_ = true;
            return;
        }
        if (kw == ".model" && scale_code_model(*this)) return;
        if (kw == ".model")
            scale_model(*this);
        else
            scale_dot_card(*this, kw);
        return;
    }
    if (c.kind != CardKind::element) return;
    char letter = ascii_lower(c.field_text(0)[0]);
    switch (letter) {
        case 'r': case 'c': case 'l': case 'k': scale_passive(*this, letter); break;
        case 'v': case 'i': scale_source(*this, letter); break;
        case 'e': case 'f': case 'g': case 'h': case 'b': scale_controlled(*this, letter); break;
        case 't': case 'o': case 'u': case 's': case 'w': scale_line_or_switch(*this, letter); break;
        case 'x': tolerances_.subckt_calls = true; break;  // .subckt bodies are scaled in place
        case 'd': case 'j': case 'z': scale_semiconductor(*this, letter); break;
        case 'q':
            // Whether a BJT is scaled by m or by its area depends on the other devices of the
            // deck (ScalePass::bjt_by_area), wherever they are.
            if (observing_ && settings_.factors.km != 1)
                rescan_ = true;
            else
                scale_semiconductor(*this, letter);
            break;
        case 'm':
            // Whether a MOSFET follows Kf, and how its m acts on GMIN, depends on its model
            // card, wherever that is.
            if (observing_ && (settings_.factors.kf != 1 || settings_.factors.km != 1))
                rescan_ = true;
            else
                scale_semiconductor(*this, letter);
            break;
        case 'a':
            if (observing_) rescan_ = true;  // as a code-model .model card above
            else scale_code_model_instance(*this);
            break;
        case 'y': case 'p':
            unscalable(c.fields[0], "ngspice 39 KSPICE lines (TXL/CPL) do not stay equivalent "
                                    "under scaling; use an LTRA line (O element) instead");
            break;
        case 'n':
            unscalable(c.fields[0], "OSDI (Verilog-A) devices have model-specific units");
            break;
        default: break;  // the reader has already warned about unknown element types
    }
}

const NumberParse& ScalePass::number_of(const Token& t) const {
    // Handlers often ask about a token and then scale it: parse each token once.
    if (cached_begin_ != t.begin || cached_file_ != file_ || cached_card_ != card_) {
        cached_parse_ = parse_spice_number(card_->text(t));
        cached_begin_ = t.begin;
        cached_file_ = file_;
        cached_card_ = card_;
    }
    return cached_parse_;
}

bool ScalePass::is_number(const Token& t) const {
    return t.kind == TokenKind::word && number_of(t).number.has_value();
}

bool ScalePass::is_value_token(const Token& t) const {
    if (t.kind == TokenKind::brace || t.kind == TokenKind::squote) return true;
    if (t.kind != TokenKind::word) return false;
    const auto& p = number_of(t);
    if (p.problem != NumberProblem::not_a_number) return true;  // a number, good or bad
    return is_param(to_lower(card_->text(t)));
}

void ScalePass::scale_value(const Token& t, Unit unit, std::string_view field) {
    scale_by(t, factor_of(unit, settings_.factors), field, unit_name(unit), exponents(unit));
}

bool ScalePass::param_use(std::uint32_t begin, std::uint32_t end,
                          std::optional<UnitExponents> exponents, double factor,
                          std::string_view unit, std::string why) {
    if (in_control_)
        return false;  // .control blocks see parameters only through the plan's refusal
    if (plan_) return exponents && plan_->settled_at(file_, begin);  // planned already
    param_uses_.push_back(ParamUse{file_, begin, end, exponents, factor,
                                   std::string(card_->field_text(0)), std::string(unit),
                                   std::move(why)});
    return plan_ && exponents && plan_->settled_at(file_, begin);
}

namespace {

// `{}` or `''` (blanks and continuation breaks aside): ngspice 39 stops on it ("Expression
// err", tried with `ngspice -b`), and the two halves of its wrap would sit at one offset.
void refuse_empty(const ScalePass& p, std::uint32_t begin, std::uint32_t end,
                  std::string_view inner) {
    if (inner.find_first_not_of(" \t\r\n+") == std::string_view::npos)
        p.fail(Token{TokenKind::word, begin, end},
               "an empty expression: ngspice 39 stops with \"Expression err\"; write a value");
}

}  // namespace

void ScalePass::scale_by(const Token& t, double factor, std::string_view field,
                         std::string_view unit, std::optional<UnitExponents> exponents) {
    std::string_view s = card_->text(t);
    auto own_rule = [&] {
        return fmt::format("'{}', which is scaled by a rule of its own", field);
    };
    if (t.kind == TokenKind::brace || t.kind == TokenKind::squote) {
        refuse_empty(*this, t.begin, t.end, s.substr(1, s.size() - 2));
        bool settled =
            param_use(t.begin, t.end, exponents, factor, unit, exponents ? "" : own_rule());
        if (factor == 1 || settled) return;
        // {expr} -> {(expr)*k}: exact whatever the parameters are.
        insert(t.begin + 1, "(", field, factor);
        edit(t.end - 1, 0, ")" + times_factor(factor), field, unit, factor);
        return;
    }
    if (t.kind != TokenKind::word) fail(t, fmt::format("expected a value here, found '{}'", s));
    const NumberParse& p = number_of(t);
    if (p.number) {
        if (factor == 1) return;
        if (!std::isfinite(factor) || factor == 0)
            fail(t, fmt::format("the factor for a value in {} is outside the range of a double "
                                "with these Km and Kf: choose factors nearer to 1",
                                unit.empty() ? std::string_view("this unit") : unit));
        double scaled = p.number->value * factor;
        if (!std::isfinite(scaled) || (scaled != 0 && std::fabs(scaled) < DBL_MIN) ||
            (scaled == 0) != (p.number->value == 0))
            fail(t, fmt::format("'{}' times {:.9g} is {:.9g}, outside the range of a double "
                                "(about 2.2e-308 to 1.8e308): choose factors that keep every "
                                "value in range",
                                s, factor, scaled));
        edit(t.begin, t.size(), respell(*p.number, scaled, settings_.digits), field, unit, factor);
        return;
    }
    if (p.problem != NumberProblem::not_a_number)
        fail(t, describe(p.problem, s));
    // ngspice 39 substitutes parameter names in .meas, .ic and .nodeset values (tried: `when
    // v(a)=thr` with `.param thr=0.5` measured the same time as `=0.5`; `.ic v(b)=vinit` set
    // v(b); an unknown name there stops it with "Undefined parameter"). The analyses read a
    // name as 0 (`.tran 10u ts`: "TSTOP is invalid"); .four, .temp and .options do not take
    // it either ("bad fundamental freq", "Could not set temperature", "bad type").
    std::string keyword = card_keyword(*card_);
    if (card_->kind == CardKind::dot && keyword != ".meas" && keyword != ".measure" &&
        keyword != ".ic" && keyword != ".nodeset") {
        bool analysis = keyword == ".ac" || keyword == ".tran" || keyword == ".noise" ||
                        keyword == ".disto" || keyword == ".sp" || keyword == ".sens" ||
                        keyword == ".pss";
        // .four reads no {expr} either (tried: "bad fundamental freq {f0}").
        std::string fix = keyword == ".four" ? "the number" : fmt::format("{{{}}}", s);
        fail(t,
             fmt::format("bare name '{}' in a value of a dot card: ngspice 39 {}; write {}", s,
                         analysis ? "reads it as 0" : "does not read a parameter name there", fix));
    }
    if (!is_param(to_lower(s)) && observing_) {
        // While reading: the parameter may be declared further down; decide at the end.
        rescan_ = true;
        return;
    }
    if (!is_param(to_lower(s)))
        fail(t, fmt::format("'{}' is neither a number nor a parameter defined by .param", s));
    bool settled = param_use(t.begin, t.end, exponents, factor, unit, exponents ? "" : own_rule());
    if (factor == 1 || settled) {
        if (settings_.brace_bare_params) edit(t.begin, t.size(), fmt::format("{{{}}}", s), field, unit, 1);
        return;
    }
    edit(t.begin, t.size(), fmt::format("{{({}){}}}", s, times_factor(factor)), field, unit, factor);
}

void ScalePass::scale_expression(std::uint32_t begin, std::uint32_t end, double out_factor,
                                 std::string_view field, std::string_view unit,
                                 std::optional<UnitExponents> exponents) {
    std::string_view expr = card_->file->view(begin, end);
    bool delimited = !expr.empty() && (expr.front() == '{' || expr.front() == '\'');
    std::string_view inner = delimited ? expr.substr(1, expr.size() - 2) : expr;
    if (delimited) refuse_empty(*this, begin, end, inner);
    auto sub = substitute_variables(inner, settings_.factors);
    // A parse-time value of a unit can be left to the plan; anything evaluated while the
    // simulation runs (time, hertz, i(), ddt()) keeps its parameters wrapped.
    if (sub.changed || !sub.unsupported.empty()) exponents.reset();
    if (param_use(begin, end, exponents, out_factor, unit,
                  exponents ? "" : "part of a run-time expression"))
        return;
    if (!sub.unsupported.empty()) {
        Token at{TokenKind::word, begin, end};
        unscalable(at, fmt::format("expression uses {} whose scaling is unknown", sub.unsupported.front()));
        return;
    }
    if (!sub.changed && out_factor == 1) return;
    std::string body = out_factor == 1 ? sub.text : "(" + sub.text + ")" + times_factor(out_factor);
    std::string text = delimited ? expr.front() + body + expr.back() : "(" + body + ")";
    if (!delimited && out_factor == 1) text = sub.text;
    edit(begin, end - begin, std::move(text), field, unit, out_factor);
}

void ScalePass::replace(const Token& t, std::string text, std::string_view field, Unit unit) {
    edit(t.begin, t.size(), std::move(text), field, unit_name(unit),
         factor_of(unit, settings_.factors));
}

void ScalePass::insert(std::uint32_t offset, std::string text, std::string_view field, double factor) {
    edit(offset, 0, std::move(text), field, "", factor);
}

void ScalePass::insert_after(std::uint32_t offset, std::string text, std::string_view field,
                             double factor) {
    edit(offset, 0, std::move(text), field, "", factor, true);
}

void ScalePass::rename(const Token& t, const std::string& name, std::string_view field) {
    edit(t.begin, t.size(), name, field, "", 1);
}

void ScalePass::copy_data_file(const Token& value, double time_factor) {
    if (render_ == Render::held || render_ == Render::probe) return;
    std::string_view v = card_->file->view(value.begin, value.end);
    char quote = v.size() >= 2 && (v.front() == '"' || v.front() == '\'') ? v.front() : '\0';
    std::string path(quote ? v.substr(1, v.size() - 2) : v);
    std::string copy = scaled_copy_name(path);
    rename(value, quote ? quote + copy + quote : copy, "data file (times x 1/Kf)");
    result_.data_files.push_back({file_, value.begin, value.size(), path, copy, time_factor});
}

EditSet& ScalePass::target() {
    bool aside = render_ == Render::copy || render_ == Render::probe;
    return aside ? *render_edits_ : result_.edits[file_];
}

void ScalePass::edit(std::uint32_t offset, std::uint32_t length, std::string text,
                     std::string_view field, std::string_view unit, double factor, bool after) {
    const SourceFile& file = *card_->file;
    auto store = [&](EditSet& set) {
        if (after)
            set.add_after(file.text(), offset, text);
        else
            set.add(file.text(), offset, length, text);
    };
    if (file.view(offset, offset + length) == text) return;
    if (render_ == Render::held) return;
    if (render_ == Render::probe) {
        store(*render_edits_);
        return;
    }
    bool opening = length == 0 && text == "(";  // the opening half of a wrap is not listed
    if (!opening) ++result_.change_count;
    store(target());
    if (!settings_.record_changes || opening) return;
    std::string old_text(file.view(offset, offset + length));
    Change ch;
    ch.file = file_;
    ch.offset = offset;
    ch.element = std::string(card_->field_text(0));
    if (card_->kind == CardKind::dot && card_->fields.size() > 1 &&
        iequals(card_->field_text(0), ".model"))
        ch.element += " " + std::string(card_->field_text(1));
    if (render_ == Render::copy) ch.element += " (in " + copy_name_ + ")";
    ch.field = std::string(field);
    ch.unit = std::string(unit);
    ch.old_text = std::move(old_text);
    ch.new_text = std::move(text);
    ch.factor = factor;
    result_.changes.push_back(std::move(ch));
}

void ScalePass::unscalable(const Token& at, std::string why) {
    if (render_ == Render::probe) return;
    if (render_ == Render::held) {
        note_held_refusal(at, std::move(why));
        return;
    }
    Severity sev = settings_.mark_unscalable ? Severity::warning : Severity::error;
    result_.unscalable.push_back(card_->file->diagnose(sev, at.begin, at.size(), why));
    if (settings_.mark_unscalable && !card_marked_) {
        card_marked_ = true;
        // Mark the card with a comment line in the line-end style of the card itself.
        std::string eol = "\n";
        for (const auto& t : card_->tokens)
            if (t.kind == TokenKind::line_end) {
                eol = std::string(card_->text(t));
                break;
            }
        for (auto& ch : why)
            if (ch == '\n' || ch == '\r') ch = ' ';  // one comment line, whatever was quoted
        // After a byte-order mark, which must stay the first bytes of the file.
        std::uint32_t at_line = mark_at_ ? *mark_at_ : card_->begin();
        if (!card_->tokens.empty() && card_->tokens.front().kind == TokenKind::bom)
            at_line = card_->tokens.front().end;
        // After an insertion already there (a code model's copy for other port types ends
        // where this card begins).
        target().add_after(card_->file->text(), at_line, "* deckscale: left unscaled: " + why + eol);
    }
}

void ScalePass::note(const Token& at, std::string what) {
    if (render_ == Render::held || render_ == Render::probe) return;
    result_.notes.push_back(card_->file->diagnose(Severity::note, at.begin, at.size(), std::move(what)));
}

void ScalePass::fail(const Token& at, std::string why) const {
    throw DeckError(card_->file->diagnose(Severity::error, at.begin, at.size(), std::move(why)));
}

}  // namespace deckscale
