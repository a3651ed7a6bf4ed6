// Internal to the scaling pass: the state shared by its card handlers (scale/rescale.cpp,
// scale/elements.cpp, scale/sources.cpp, scale/dot_cards.cpp).
#pragma once

#include <functional>
#include <map>
#include <memory>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "deck/analyses.hpp"
#include "deck/spice_number.hpp"
#include "deck/sweep_rewrite.hpp"
#include "scale/param_plan.hpp"
#include "scale/rescale.hpp"

namespace deckscale {

struct CodeModelUses;
struct HoldPlan;
struct HoldRegion;
struct MosModel;
using MosModels = std::map<std::string, MosModel>;

// One value-bearing item of a card: positional (key == nullptr) or key=value.
struct Atom {
    const Token* key = nullptr;
    const Token* value = nullptr;  // nullptr for "key=" with nothing after it
    std::size_t field = 0;         // index of the first field of the atom in Card::fields
};

// Atoms from fields[first...]; '(', ')' and ',' separate like blanks, as in ngspice.
void atoms_of(const Card& card, std::size_t first, std::vector<Atom>& out);

// What the transient tolerances need to know of the whole deck (scale/tran_tolerances.cpp).
struct ToleranceScan {
    struct Place {
        std::size_t file = 0;
        std::uint32_t offset = 0;  // of the top file's .end card; else the end of the file
        std::string eol = "\n";
    };
    std::optional<Place> tran;            // the first transient analysis
    std::optional<Place> end;             // the top file's .end card
    bool abstol = false, chgtol = false;  // set by the deck
    // Junction devices, by how ngspice 39 applies their m to the GMIN across their junctions
    // (scale/semiconductors.cpp): multiplied by m (Q, BSIM) or not (D, J by area, Z, MOS 1-3).
    bool gmin_times_m = false, gmin_apart = false;
    // The first diode, where a note says that ngspice's .disto does not follow its m.
    std::optional<Place> diode;
    // A semiconductor device was scaled, and an X line met: a .subckt may be a part's model
    // (scale/part_models.hpp).
    bool semiconductors = false, subckt_calls = false;
    void merge(const ToleranceScan& later);
};

class ScalePass {
public:
    ScalePass(const ScaleSettings& settings, ScaleResult& result);
    // Scales every card of a fully read deck.
    void run(const Deck& deck);
    // Scales one card while the deck is still being read (see DeckObserver). Symbols the
    // deck declares later are not known yet: every lookup that found nothing is remembered.
    void observe(const Deck& so_far, std::size_t file, const Card& card);
    // True when a lookup made while observing would answer differently with the final
    // symbols (a name declared after its use, a later .options gmin): scale again then.
    bool relied_on_missing(const DeckSymbols& final_symbols) const;
    // For a pass that observed a piece of a file read on its own (see PieceReading): false if
    // one of its lookups would have found something among the symbols declared before the
    // piece. Otherwise takes the piece's results and remembered lookups over and returns true.
    bool take_piece(ScalePass& piece, ScaleResult& piece_result, const DeckSymbols& before);
    // Edits of one file are reserved for this many bytes of it (default: the whole file).
    void expect_bytes(std::size_t bytes) { expected_bytes_ = bytes; }
    // Parts to keep as written (scale/hold_plan.hpp); run() then renders each card as the
    // plan says (scale/hold_pass.cpp). The plan must outlive the pass.
    void hold(HoldPlan& plan) { hold_ = &plan; }
    // Scale with a parameter plan (scale/param_plan): its definitions rewritten, the uses it
    // settled left as written. Without one, every use of a parameter is wrapped.
    void set_param_plan(const ParamPlan* plan) { plan_ = plan; }
    // Every value naming a parameter this pass met, for making a plan.
    const std::vector<ParamUse>& param_uses() const { return param_uses_; }

    // ---- used by the card handlers ----
    const Card& card() const { return *card_; }
    // atoms_of(card(), first) in a buffer reused from card to card (valid until the next call).
    const std::vector<Atom>& atoms(std::size_t first);
    // What the deck declares (lower-case names).
    bool is_param(const std::string& name) const;
    const std::string* model_type(const std::string& name) const;  // nullptr if no such model
    bool is_inductor(const std::string& name) const;
    double gmin() const;
    double reltol() const;  // the one ngspice's sweeps use (.options reltol, default 1e-3)
    // The deck's A devices by model (null when it has no code-model models).
    const CodeModelUses* code_model_uses() const { return code_model_uses_.get(); }
    // The deck's MOS models, collected on first use (scale/semiconductors.cpp).
    const MosModels& mos_models();
    // Whether the deck's BJTs are scaled by their area rather than m: when it also has a
    // device whose GMIN does not follow m (gmin_apart_device) or sets gmin itself (divided
    // by Km then), and no .disto analysis, which ngspice 39 gets wrong with a BJT's area
    // (shared notes "scaling-rules.md" §6). Only on a complete deck (never while observing).
    bool bjt_by_area();
    // Whether the deck's diodes are scaled through their model cards rather than m: Km != 1,
    // a .disto analysis (ngspice 39's leaves a diode's m out) and diode models that can
    // (scale/diode_model.hpp). Only on a complete deck: false while observing, where a
    // .disto card asks for the pass over the complete deck (rescan_when_complete).
    bool diode_by_model();
    // While observing: leaves the decisions to a pass over the complete deck.
    void rescan_when_complete() {
        if (observing_) rescan_ = true;
    }
    ScaleFactors factors() const { return settings_.factors; }
    int digits() const { return settings_.digits; }
    bool follow_flicker() const { return settings_.follow_flicker; }
    std::size_t file() const { return file_; }  // index of the current card's file

    // Scales one value token by the unit's factor; validates numbers either way.
    void scale_value(const Token& t, Unit unit, std::string_view field);
    // Scales a value by an explicit factor, Km^a Kf^b with (a, b) = `exponents` when the
    // factor is one of a unit (a parameter plan can follow only those).
    void scale_by(const Token& t, double factor, std::string_view field, std::string_view unit,
                  std::optional<UnitExponents> exponents = std::nullopt);
    // A behavioural expression spanning [begin, end) of the card: substitute variables and
    // multiply by out_factor. `delimited` is true for {..} / '..' tokens (kept as such).
    // `exponents` only when the span is one {..} / '..' value token of a unit.
    void scale_expression(std::uint32_t begin, std::uint32_t end, double out_factor,
                          std::string_view field, std::string_view unit,
                          std::optional<UnitExponents> exponents = std::nullopt);
    // Replaces a value token by a text worked out elsewhere (the numbers of a sweep).
    void replace(const Token& t, std::string text, std::string_view field, Unit unit);
    ToleranceScan& tolerances() { return tolerances_; }
    std::size_t file_index() const { return file_; }
    // After the whole deck: writes the default transient tolerances scaled if it needs them.
    void finish(const Deck& deck);
    // The notes finish() adds where GMIN cannot follow exactly (scale/semiconductors.cpp).
    void note_gmin(const Deck& deck);
    // The note finish() adds for a diode in a deck with .disto (scale/semiconductors.cpp).
    void note_diode_distortion(const Deck& deck);
    // Inserts text at an offset of the current file.
    void insert(std::uint32_t offset, std::string text, std::string_view field, double factor);
    // The same, after any insertion already stored at that offset (the two become one): for
    // text that follows a card whose own insertions may end where the card ends.
    void insert_after(std::uint32_t offset, std::string text, std::string_view field,
                      double factor);
    // Replaces a name (of a model or .subckt) by the name of its scaled copy.
    // A data file the card names by `value` is rewritten (its times x `time_factor`) into a
    // copy beside the output, and `value` renamed to it (write/data_files.hpp).
    void copy_data_file(const Token& value, double time_factor);
    void rename(const Token& t, const std::string& name, std::string_view field);
    // Records an item that cannot be scaled exactly.
    void unscalable(const Token& at, std::string why);
    void note(const Token& at, std::string what);
    // Throws DeckError at a token.
    [[noreturn]] void fail(const Token& at, std::string why) const;

    // ---- .control blocks (scale/control.cpp) ----
    // Runs `handler` with one command of the current .control block as the current card; a
    // refusal marks the command's line (starting at `line_begin`) once however many it has.
    void with_command(const Card& command, std::uint32_t line_begin,
                      const std::function<void()>& handler);
    // The unit of the swept quantity for a from=/to=/at=/td= field of a DC measurement at
    // `at`: the block's last 'dc' command, else the deck's DC sweeps. nullopt when it is not
    // known (then refused, or decided once the whole deck is read).
    std::optional<Unit> dc_swept_unit(const Token& at, std::string_view key);
    // The x unit of the plots the deck's analysis cards make (see card_plot_scales); nullopt
    // when they do not agree (or decided once the whole deck is read).
    std::optional<Unit> card_plot_scale();
    // The first and last value the deck's `analysis` ("tran", "ac" or "dc": the inner level)
    // steps through, in the original's units; nullopt when the deck has no such analysis (or
    // decided once the whole deck is read).
    std::optional<std::pair<double, double>> sweep_bounds(std::string_view analysis);
    std::optional<Unit> block_dc_unit;  // set by a 'dc' command of the block being read
    bool block_dc_seen = false;
    // Whether the deck has more than one .control block (looked up once per run; nullopt
    // while observing: the complete deck decides, scale/control_units).
    std::optional<bool> several_control_blocks();

    // True when a token can carry a value (number, {expr}, 'expr', parameter name).
    bool is_value_token(const Token& t) const;
    bool is_number(const Token& t) const;
    const NumberParse& number_of(const Token& t) const;
    std::string text(const Token& t) const { return std::string(card_->text(t)); }

private:
    void visit(const Card& card);
    // How the current card is rendered when parts are held (scale/hold_pass.cpp).
    enum class Render {
        normal,  // scaled, into the file's edits
        copy,    // scaled, into the edits of a copy (a .subckt's or a .model's)
        held,    // as written: edits dropped, refusals kept as what it could not follow
        probe,   // scaled into a scratch set, only to see whether anything changes
    };
    void visit_holding(const Card& card);
    // An include card inside held region `r` whose file cannot stay as written: refused.
    bool refuse_include_in_held(const Card& c, const HoldRegion& r);
    void visit_scoped(const Card& card, const HoldRegion* region);
    void visit_element_scoped(const Card& card, const HoldRegion* region);
    // Runs `f` with the current card rendered `how` (into `into` for copy and probe; refusals
    // of a held rendering go to part `part`), then returns to the rendering before.
    void with_render(Render how, EditSet* into, std::size_t part, const std::function<void()>& f);
    void copy_model(const Card& card, const std::string& lower_name);
    void probe_shared_models(const Deck& deck);
    void finish_holding();
    void note_held_refusal(const Token& at, std::string why);
    EditSet& target();
    // Records a value that may name parameters; true when the plan leaves it as written.
    bool param_use(std::uint32_t begin, std::uint32_t end, std::optional<UnitExponents> exponents,
                   double factor, std::string_view unit, std::string why);
    // Stores an edit (and its change record); `after`: an insertion that follows any
    // insertion already stored at its offset.
    void edit(std::uint32_t offset, std::uint32_t length, std::string text, std::string_view field,
              std::string_view unit, double factor, bool after = false);

    ScaleSettings settings_;
    ScaleResult& result_;
    const DeckSymbols* symbols_ = nullptr;
    // Lookups that found nothing, and the gmin that was used (for relied_on_missing).
    mutable std::set<std::string> missed_params_, missed_models_, missed_inductors_;
    mutable std::optional<double> gmin_used_;
    mutable std::optional<double> reltol_used_;
    // A lookup of GMIN or RELTOL answered differently from an earlier one (an .options card
    // between two uses): the earlier use may differ from the final symbols, scale again.
    mutable bool lookups_varied_ = false;
    void remember(std::optional<double>& used, double value) const;
    bool observing_ = false;  // inside observe(): the deck is not complete yet
    bool rescan_ = false;     // a decision was left to a scan of the complete deck
    std::size_t file_ = 0;
    std::size_t expected_bytes_ = 0;
    const Card* card_ = nullptr;
    bool card_marked_ = false;
    const Deck* deck_ = nullptr;
    std::optional<std::uint32_t> mark_at_;  // where a refusal's mark goes (a control command)
    std::uint32_t marked_line_ = ~0u;       // the control line marked last, in marked_file_
    std::size_t marked_file_ = 0;
    // The deck's DC sweeps, looked up once per run (never while observing: dc_swept_unit).
    bool deck_dc_read_ = false;
    std::size_t deck_dc_found_ = 0;
    std::optional<Unit> deck_dc_unit_;
    std::shared_ptr<const DeckAnalyses> analyses_;  // the deck's, read once (sweep_bounds)
    bool deck_plot_read_ = false;
    std::optional<Unit> deck_plot_unit_;
    std::vector<Atom> atoms_;
    std::shared_ptr<const CodeModelUses> code_model_uses_;
    std::shared_ptr<const MosModels> mos_models_;
    std::optional<bool> bjt_by_area_;
    std::optional<bool> diode_by_model_;
    mutable NumberParse cached_parse_;
    mutable std::uint32_t cached_begin_ = ~0u;
    mutable std::size_t cached_file_ = ~std::size_t{0};
    mutable const Card* cached_card_ = nullptr;
    ToleranceScan tolerances_;
    HoldPlan* hold_ = nullptr;
    Render render_ = Render::normal;
    EditSet* render_edits_ = nullptr;  // Render::copy and Render::probe
    std::size_t render_part_ = 0;      // Render::held: the part its refusals go to
    std::string copy_name_;            // Render::copy: the copy's name, for the change list
    std::vector<EditSet> region_copies_;  // per HoldPlan::regions entry with a copy
    const ParamPlan* plan_ = nullptr;
    std::vector<ParamUse> param_uses_;
    bool in_control_ = false;  // visiting a .control block
    std::optional<bool> several_blocks_;  // several_control_blocks, once per run
};

// Card handlers, one per family.
void scale_passive(ScalePass& p, char letter);      // R C L K
void scale_source(ScalePass& p, char letter);       // V I
void scale_controlled(ScalePass& p, char letter);   // E F G H B
void scale_line_or_switch(ScalePass& p, char letter);  // T O U S W
void scale_dot_card(ScalePass& p, const std::string& keyword);
void scale_model(ScalePass& p);
void scale_control_block(ScalePass& p);
// The numbers of one sweep rewritten together so that ngspice steps exactly
// (scale/sweep_cards.cpp): atoms[at, at + count) are the fields deck/sweep_rewrite takes,
// `names` the change-list names of the scaled ones (fstart, fstop of a frequency sweep; all of
// a DC level or a transient). False when they are not all positional plain numbers: the
// caller scales them one by one then.
bool scale_sweep_exactly(ScalePass& p, SweepKind kind, const std::vector<Atom>& atoms,
                         std::size_t at, std::size_t count, Unit unit,
                         const std::vector<std::string>& names);
// Records what a card tells about the transient tolerances (scale/tran_tolerances.cpp).
void note_tolerances(ScalePass& p, const std::string& keyword);
void note_control_tolerances(ScalePass& p, std::string_view body);
void scale_code_model_instance(ScalePass& p);  // A
bool scale_code_model(ScalePass& p);           // .model of a code-model type (false: not one)

}  // namespace deckscale
