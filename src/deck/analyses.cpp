#include "deck/analyses.hpp"

#include <algorithm>

#include <fmt/format.h>

#include "base/text_util.hpp"
#include "deck/control_script.hpp"
#include "deck/deck_params.hpp"
#include "deck/spice_number.hpp"
#include "deck/sweep_rewrite.hpp"
#include "deck/sweep_steps.hpp"

namespace deckscale {
namespace {

// The plain words of a card after its name ('(' ')' ',' '=' dropped).
std::vector<std::string_view> words_of(const Card& c) {
    std::vector<std::string_view> w;
    for (std::size_t i = 1; i < c.fields.size(); ++i) {
        auto k = c.fields[i].kind;
        if (k == TokenKind::word || k == TokenKind::brace || k == TokenKind::squote)
            w.push_back(c.field_text(i));
    }
    return w;
}

std::optional<AcSweep> sweep_from(const std::vector<std::string_view>& w, std::string& error,
                                  const ParamTable* params) {
    if (w.size() < 4) {
        error = "needs dec|oct|lin, a point count and two frequencies";
        return std::nullopt;
    }
    AcSweep s;
    s.type = to_lower(w[0]);
    if (s.type != "dec" && s.type != "oct" && s.type != "lin") {
        error = fmt::format("unknown sweep type '{}'", w[0]);
        return std::nullopt;
    }
    auto n = analysis_value(w[1], params, &s.points_text);
    auto f1 = analysis_value(w[2], params, &s.fstart_text);
    auto f2 = analysis_value(w[3], params, &s.fstop_text);
    if (!n || !f1 || !f2) {
        error = params ? "the point count and frequencies must be numbers or expressions of "
                         "the deck's top-level parameters"
                       : "the point count and frequencies must be numbers";
        return std::nullopt;
    }
    if (*n < 1 || *f1 <= 0 || *f2 < *f1) {
        error = "the sweep must have at least one point and 0 < fstart <= fstop";
        return std::nullopt;
    }
    s.points = clamped_long(*n);
    s.fstart = *f1;
    s.fstop = *f2;
    return s;
}

// `.dc item start stop step [item2 start2 stop2 step2]`.
std::optional<DcSweep> dc_from(const std::vector<std::string_view>& w, std::string& error,
                               const ParamTable& params) {
    if (w.size() != 4 && w.size() != 8) {
        error = "needs an item and its start, stop and step, once or twice";
        return std::nullopt;
    }
    DcSweep s;
    for (std::size_t i = 0; i < w.size(); i += 4) {
        DcLevel l;
        l.item = to_lower(w[i]);
        auto start = analysis_value(w[i + 1], &params, &l.start);
        auto stop = analysis_value(w[i + 2], &params, &l.stop);
        auto step = analysis_value(w[i + 3], &params, &l.step);
        if (!start || !stop || !step) {
            error = "its start, stop and step must be numbers or expressions of the deck's "
                    "top-level parameters";
            return std::nullopt;
        }
        s.levels.push_back(std::move(l));
    }
    return s;
}

// `.tf v(a) src`, `.tf v(a,b) src` or `.tf i(vx) src`, as plain words.
std::optional<TfSpec> tf_from(const std::vector<std::string_view>& w) {
    if (w.size() < 3) return std::nullopt;
    TfSpec t;
    t.source = to_lower(w.back());
    if (iequals(w[0], "v") && (w.size() == 3 || w.size() == 4))
        t.output = w.size() == 3 ? fmt::format("v({})", w[1])
                                 : fmt::format("v({},{})", w[1], w[2]);
    else if (iequals(w[0], "i") && w.size() == 3)
        t.output = fmt::format("i({})", w[1]);
    else
        return std::nullopt;
    t.current_output = iequals(w[0], "i");
    return t;
}

// Records one analysis card (or a .control command read as one) in `a`.
void take(DeckAnalyses& a, const std::string& kw, const Card& c, const ParamTable& params) {
    auto w = words_of(c);
    if (kw == ".ac" && !a.ac) {
        std::string err;
        a.ac = sweep_from(w, err, &params);
        if (!a.ac) a.problems.push_back(fmt::format(".ac card: {}", err));
    } else if (kw == ".tran" && !a.tran) {
        TranSpec t;
        std::vector<double> v;
        bool ok = true;
        for (auto s : w) {
            if (iequals(s, "uic")) {
                t.uic = true;
                continue;
            }
            if (auto x = analysis_value(s, &params)) v.push_back(*x);
            else ok = false;
        }
        if (!ok || v.size() < 2) {
            a.problems.push_back(
                ".tran card: its times must be numbers or expressions of the deck's top-level "
                "parameters");
            return;
        }
        t.tstep = v[0];
        t.tstop = v[1];
        if (v.size() > 2) t.tstart = v[2];
        if (v.size() > 3) t.tmax = v[3];
        a.tran = t;
    } else if (kw == ".op") {
        a.op = true;
    } else if (kw == ".noise" && !a.noise) {
        std::string err;
        a.noise = read_noise_card(c, err, &params);
        if (!a.noise) a.problems.push_back(fmt::format(".noise card: {}", err));
    } else if (kw == ".dc" && !a.dc) {
        std::string err;
        a.dc = dc_from(w, err, params);
        if (!a.dc) a.problems.push_back(fmt::format(".dc card: {}", err));
    } else if (kw == ".tf" && !a.tf) {
        a.tf = tf_from(w);
        if (!a.tf) a.problems.push_back(".tf card: needs v(node), v(node,node) or i(source), and "
                                        "an input source");
    } else if (kw == ".sp" && !a.sp) {
        std::string err;
        a.sp = sweep_from(w, err, &params);
        if (!a.sp) a.problems.push_back(fmt::format(".sp card: {}", err));
    } else if (kw == ".disto") {
        a.asks_disto = true;
        if (a.disto) return;
        std::string err;
        auto sweep = sweep_from(w, err, &params);
        DistoSpec d;
        if (sweep && w.size() > 5) err = "needs dec|oct|lin, a point count, two frequencies and "
                                         "at most f2overf1";
        else if (sweep && w.size() == 5 && !analysis_value(w[4], &params, &d.f2overf1))
            err = "its f2overf1 must be a number or an expression of the deck's top-level "
                  "parameters";
        if (!sweep || !err.empty()) {
            a.problems.push_back(fmt::format(".disto card: {}", err));
            return;
        }
        d.sweep = *sweep;
        a.disto = std::move(d);
    } else if (kw == ".pz" || kw == ".sens" || kw == ".pss" || kw == ".four") {
        if (std::find(a.uncompared.begin(), a.uncompared.end(), kw) == a.uncompared.end())
            a.uncompared.push_back(kw);
    }
}

}  // namespace

DeckAnalyses find_analyses(const Deck& deck) {
    DeckAnalyses a, control;
    const ParamTable params = top_level_params(deck);
    for (std::size_t f = 0; f < deck.files.size(); ++f) {
        deck.visit_file(f, [&](const Card& c) {
            if (c.kind == CardKind::control) {
                // The analyses of .control, read (never run) as the dot cards they stand for.
                if (const Token* t = control_token(c))
                    for (const auto& cmd : control_commands(*c.file, *t)) {
                        Card cc = cmd.as_card(*c.file);
                        take(control, "." + to_lower(cc.field_text(0)), cc, params);
                    }
                return;
            }
            if (c.fields.empty()) return;
            std::string kw = card_keyword(c);
            if (c.kind == CardKind::element && (kw[0] == 'v' || kw[0] == 'i')) {
                a.sources.push_back(kw);
                for (std::size_t i = 3; i < c.fields.size(); ++i)
                    if (iequals(c.field_text(i), "ac") || iequals(c.field_text(i), "acmag")) {
                        a.ac_sources.push_back(kw);
                        break;
                    }
                return;
            }
            if (c.kind != CardKind::dot) return;
            take(a, kw, c, params);
        });
    }
    // Analyses in .control count only for a deck with no analysis card.
    if (!a.ac && !a.tran && !a.op && !a.noise && !a.dc && !a.tf && !a.sp && !a.disto &&
        (control.ac || control.tran || control.op || control.noise || control.dc ||
         control.tf || control.sp || control.disto)) {
        a.ac = control.ac;
        a.tran = control.tran;
        a.op = control.op;
        a.noise = control.noise;
        a.dc = control.dc;
        a.tf = control.tf;
        a.sp = control.sp;
        a.disto = control.disto;
        for (auto& p : control.problems) a.problems.push_back(p);
    }
    a.asks_disto = a.asks_disto || control.asks_disto;
    for (const auto& kw : control.uncompared)
        if (std::find(a.uncompared.begin(), a.uncompared.end(), kw) == a.uncompared.end())
            a.uncompared.push_back(kw);
    if (a.ac) a.ac->reltol = deck.symbols.reltol;
    if (a.sp) a.sp->reltol = deck.symbols.reltol;
    if (a.disto) a.disto->sweep.reltol = deck.symbols.reltol;
    if (a.noise) a.noise->reltol = deck.symbols.reltol;
    return a;
}

std::optional<AcSweep> parse_sweep(const std::vector<std::string>& words, std::string& error) {
    std::vector<std::string_view> w(words.begin(), words.end());
    return sweep_from(w, error, nullptr);
}

AcSweep map_sweep(const AcSweep& s, double kf) {
    AcSweep m = s;
    m.fstart = s.fstart * kf;
    m.fstop = s.fstop * kf;
    std::string n = s.points_text.empty() ? std::to_string(s.points) : s.points_text;
    std::string f1 = s.fstart_text.empty() ? fmt::format("{}", s.fstart) : s.fstart_text;
    std::string f2 = s.fstop_text.empty() ? fmt::format("{}", s.fstop) : s.fstop_text;
    SweepRewrite w = rewrite_sweep(SweepKind::ac, {s.type, n, f1, f2}, kf, s.reltol);
    if (!w.refusal.empty()) {  // ngspice cannot step the original either
        m.points_text = m.fstart_text = m.fstop_text = "";
        return m;
    }
    m.points_text = w.fields[1];
    m.fstart_text = w.fields[2];
    m.fstop_text = w.fields[3];
    m.fstart = ngspice_read(m.fstart_text);
    m.fstop = ngspice_read(m.fstop_text);
    return m;
}

TranSpec map_tran(const TranSpec& t, double kf) {
    return TranSpec{t.tstep / kf, t.tstop / kf, t.tstart / kf, t.tmax / kf, t.uic};
}

namespace {

std::string sweep_card(std::string_view keyword, const AcSweep& s) {
    if (!s.fstart_text.empty() && !s.fstop_text.empty() && !s.points_text.empty())
        return fmt::format("{} {} {} {} {}", keyword, s.type, s.points_text, s.fstart_text,
                           s.fstop_text);
    return fmt::format("{} {} {} {:.17g} {:.17g}", keyword, s.type, s.points, s.fstart, s.fstop);
}

}  // namespace

std::string ac_card(const AcSweep& s) { return sweep_card(".ac", s); }

std::string sp_card(const AcSweep& s) { return sweep_card(".sp", s); }

std::string tran_card(const TranSpec& t) {
    std::string s = fmt::format(".tran {:.17g} {:.17g}", t.tstep, t.tstop);
    if (t.tstart != 0 || t.tmax != 0) s += fmt::format(" {:.17g}", t.tstart);
    if (t.tmax != 0) s += fmt::format(" {:.17g}", t.tmax);
    if (t.uic) s += " uic";
    return s;
}

std::string dc_card(const DcSweep& s) {
    std::string c = ".dc";
    for (const auto& l : s.levels) c += fmt::format(" {} {} {} {}", l.item, l.start, l.stop, l.step);
    return c;
}

std::string tf_card(const TfSpec& t) { return fmt::format(".tf {} {}", t.output, t.source); }

std::string disto_card(const DistoSpec& d) {
    std::string c = sweep_card(".disto", d.sweep);
    return d.f2overf1.empty() ? c : c + " " + d.f2overf1;
}

}  // namespace deckscale
