// The absolute tolerances of a transient, written scaled when the deck leaves them at their
// defaults. ngspice's step control compares currents with ABSTOL (default 1e-12 A) and charges
// with CHGTOL (default 1e-14 C) (ngspice 39 manual §15.1.1); unscaled defaults make a scaled
// transient step differently (off by about 7e-6 of the peak, ngspice 39.3 runs of the shared
// control checks). Both are then written as ABSTOL / Km and CHGTOL / (Km Kf).
#include <fmt/format.h>

#include <algorithm>
#include <cctype>

#include "base/text_util.hpp"
#include "scale/hold_plan.hpp"
#include "scale/part_models.hpp"
#include "scale/pass.hpp"
#include "scale/rules.hpp"

namespace deckscale {
namespace {

constexpr double kDefaultAbstol = 1e-12;  // A, ngspice 39 manual §15.1.1
constexpr double kDefaultChgtol = 1e-14;  // C, ngspice 39 manual §15.1.1

std::string line_end_of(const Card& c) {
    for (const auto& t : c.tokens)
        if (t.kind == TokenKind::line_end) return std::string(c.text(t));
    // The last line of a file without a line end: the file's own style.
    return c.file->text().find("\r\n") != std::string_view::npos ? "\r\n" : "\n";
}

bool is_word_at(std::string_view s, std::size_t at, std::size_t n) {
    auto word_char = [](char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_'; };
    return (at == 0 || !word_char(s[at - 1])) && (at + n >= s.size() || !word_char(s[at + n]));
}

// True when `word` appears in `text` as a whole word, in any case.
bool has_word(std::string_view text, std::string_view word) {
    std::string lower = to_lower(text);
    for (std::size_t at = lower.find(word); at != std::string::npos; at = lower.find(word, at + 1))
        if (is_word_at(lower, at, word.size())) return true;
    return false;
}

}  // namespace

void ToleranceScan::merge(const ToleranceScan& later) {
    if (!tran) tran = later.tran;
    if (!end) end = later.end;
    abstol = abstol || later.abstol;
    chgtol = chgtol || later.chgtol;
    gmin_times_m = gmin_times_m || later.gmin_times_m;
    gmin_apart = gmin_apart || later.gmin_apart;
    if (!diode) diode = later.diode;
    semiconductors = semiconductors || later.semiconductors;
    subckt_calls = subckt_calls || later.subckt_calls;
}

void note_tolerances(ScalePass& p, const std::string& kw) {
    const Card& c = p.card();
    ToleranceScan& s = p.tolerances();
    if (kw == ".tran" && !s.tran) {
        s.tran = ToleranceScan::Place{p.file_index(), c.begin(), line_end_of(c)};
    } else if (kw == ".end" && p.file_index() == 0 && !s.end) {
        s.end = ToleranceScan::Place{0, c.begin(), line_end_of(c)};
    } else if (kw == ".options" || kw == ".option" || kw == ".opt") {
        for (std::size_t i = 1; i + 1 < c.fields.size(); ++i) {
            if (c.fields[i + 1].kind != TokenKind::equals) continue;
            if (iequals(c.field_text(i), "abstol")) s.abstol = true;
            if (iequals(c.field_text(i), "chgtol")) s.chgtol = true;
        }
    }
}

void note_control_tolerances(ScalePass& p, std::string_view body) {
    // `tran` as a command, `option abstol=...` or `set abstol=...` anywhere in the script.
    ToleranceScan& s = p.tolerances();
    std::size_t line = 0;
    while (line < body.size()) {
        std::size_t stop = body.find('\n', line);
        std::string_view l =
            body.substr(line, stop == std::string_view::npos ? body.size() - line : stop - line);
        std::size_t i = l.find_first_not_of(" \t");
        if (!s.tran && i != std::string_view::npos && istarts_with(l.substr(i), "tran") &&
            is_word_at(l, i, 4))
            s.tran = ToleranceScan::Place{p.file_index(), p.card().begin(), "\n"};
        if (stop == std::string_view::npos) break;
        line = stop + 1;
    }
    if (has_word(body, "abstol")) s.abstol = true;
    if (has_word(body, "chgtol")) s.chgtol = true;
}

void ScalePass::finish(const Deck& deck) {
    const ToleranceScan& s = tolerances_;
    ScaleFactors f = settings_.factors;
    // GMIN is a conductance ngspice puts across every pn junction; unscaled it costs up to
    // 1 % at Km = 1e4 (shared notes "scaling-rules.md" §6, ngspice 39 runs). Where ngspice
    // multiplies it by the device's m it follows m / Km by itself; elsewhere it is written
    // as GMIN / Km when the deck leaves it at its default (see note_gmin).
    bool gmin = s.gmin_apart && f.km != 1 && !deck.symbols.gmin_set;
    if (f.km != 1) note_gmin(deck);
    if (f.km != 1 && s.diode) note_diode_distortion(deck);
    result_.semiconductors_scaled = s.semiconductors;
    if ((f.km != 1 || f.kf != 1) && s.semiconductors && s.subckt_calls)
        for (auto& d : part_model_notes(deck, hold_ ? hold_->held_subckts : std::set<std::string>{}))
            result_.notes.push_back(std::move(d));
    if (!s.tran && !gmin) return;
    if (s.tran && f.km != 1 && !deck.symbols.inductors.empty()) {
        // cktterr.c: an inductor's truncation error is judged with ABSTOL on its voltage and
        // CHGTOL on its flux, which scale x1 and / Kf, not / Km and / (Km Kf). ngspice 39.3
        // run: an RLC pulse deck kept its 529 time points for 0.1 <= Km <= 1000, 527 at Km = 0.04.
        const SourceFile& file = *deck.files[s.tran->file].source;
        result_.notes.push_back(file.diagnose(
            Severity::note, s.tran->offset, 1,
            "with inductors and Km != 1 ngspice's transient error control cannot be scaled "
            "exactly (it applies ABSTOL and CHGTOL to inductor voltages and fluxes too): time "
            "points can differ slightly from the original's / Kf"));
    }
    std::string options, keys;
    if (s.tran && !s.abstol && factor_of(Unit::ampere, f) != 1) {
        options += " abstol=" +
                   format_plain(kDefaultAbstol * factor_of(Unit::ampere, f), settings_.digits);
        keys = "abstol";
    }
    if (s.tran && !s.chgtol && factor_of(Unit::farad, f) != 1) {
        options +=
            " chgtol=" + format_plain(kDefaultChgtol * factor_of(Unit::farad, f), settings_.digits);
        keys += keys.empty() ? "chgtol" : ", chgtol";
    }
    if (gmin) {
        options += " gmin=" + format_plain(deck.symbols.gmin / f.km, settings_.digits);
        keys += keys.empty() ? "gmin" : ", gmin";
    }
    if (options.empty()) return;
    // Before the top file's .end (an .options card anywhere in the deck applies to every
    // analysis, ngspice 39 manual §15.1), else at the end of the file of the transient (of
    // the top file when there is none).
    std::string_view top = deck.files[0].source->text();
    ToleranceScan::Place at =
        s.end    ? *s.end
        : s.tran ? *s.tran
                 : ToleranceScan::Place{0, 0, top.find("\r\n") != top.npos ? "\r\n" : "\n"};
    std::string_view text = deck.files[at.file].source->text();
    std::string line = ".options" + options + at.eol;
    if (!s.end) {
        at.offset = static_cast<std::uint32_t>(text.size());
        if (!text.empty() && text.back() != '\n') line = at.eol + line;
    }
    if (result_.edits.size() <= at.file) result_.edits.resize(at.file + 1);
    // At the file's end the last card may have an insertion of its own (an `area=` or `m=`
    // added to a last line without a newline; found by the deck fuzz target): after it.
    result_.edits[at.file].add_after(text, at.offset, line);
    ++result_.change_count;
    if (!settings_.record_changes) return;
    Change ch;
    ch.file = at.file;
    ch.offset = at.offset;
    ch.element = ".options";
    ch.field = keys + (!gmin    ? " (defaults written out for the transient)"
                       : s.tran ? " (defaults written out for the transient and the junctions)"
                                : " (default written out for the junctions)");
    ch.new_text = ".options" + options;
    ch.factor = 1;
    // The change list is in file order.
    auto later = std::find_if(result_.changes.begin(), result_.changes.end(), [&](const Change& c) {
        return c.file > at.file || (c.file == at.file && c.offset > at.offset);
    });
    result_.changes.insert(later, std::move(ch));
}

}  // namespace deckscale
