// The numbers of a sweep written together so that ngspice 39 steps through the same points
// times the factor (deck/sweep_rewrite; ngspice-39.3 src/spicelib/analysis/acan.c, noisean.c,
// dctrcurv.c): a rounded fstop can cost or add a point or never stop, a rounded DC stop can
// move the last point. What cannot be written so is reported at the card, never rounded.
#include "scale/pass.hpp"
#include "scale/rules.hpp"

namespace deckscale {

bool scale_sweep_exactly(ScalePass& p, SweepKind kind, const std::vector<Atom>& atoms,
                         std::size_t at, std::size_t count, Unit unit,
                         const std::vector<std::string>& names) {
    bool frequencies = kind == SweepKind::ac || kind == SweepKind::noise;
    std::size_t first_number = frequencies ? 1 : 0, first_scaled = frequencies ? 2 : 0;
    if (at + count > atoms.size()) return false;
    std::vector<const Token*> fields;
    for (std::size_t i = at; i < at + count; ++i) {
        if (atoms[i].key || !atoms[i].value) return false;
        fields.push_back(atoms[i].value);
    }
    for (std::size_t i = first_number; i < fields.size(); ++i)
        if (!p.is_number(*fields[i])) return false;
    double factor = factor_of(unit, p.factors());
    if (factor == 1) return true;  // nothing moves: the card stays as written
    std::vector<std::string> texts;
    for (const Token* t : fields) texts.push_back(p.text(*t));
    double reltol = frequencies ? p.reltol() : 1e-3;  // only frequency sweeps stop by reltol
    SweepRewrite w = rewrite_sweep(kind, std::vector<std::string_view>(texts.begin(), texts.end()),
                                   factor, reltol);
    if (!w.refusal.empty()) {
        p.unscalable(*fields[first_scaled], w.refusal);
        return true;
    }
    for (std::size_t i = first_scaled; i < fields.size(); ++i)
        p.replace(*fields[i], w.fields[i], names[i - first_scaled], unit);
    return true;
}

}  // namespace deckscale
