#include "scale/param_solve.hpp"

#include <set>

namespace deckscale {
namespace {

// row -= k * other
void subtract(ParamEquation& row, const ParamEquation& other, Fraction k) {
    add_scaled(row.form, other.form, -k);
    row.rhs.km = row.rhs.km - k * other.rhs.km;
    row.rhs.kf = row.rhs.kf - k * other.rhs.kf;
}

std::vector<std::int64_t> key_of(const ParamEquation& e) {
    std::vector<std::int64_t> k;
    for (const auto& [id, c] : e.form) k.insert(k.end(), {id, c.num, c.den});
    k.insert(k.end(), {e.rhs.km.num, e.rhs.km.den, e.rhs.kf.num, e.rhs.kf.den});
    return k;
}

// Reduced row echelon form, built one equation at a time: every pivot row has coefficient 1
// on its pivot and no other pivot in it.
class Echelon {
public:
    // False when the equation contradicts those added before.
    bool add(ParamEquation row) {
        std::vector<std::pair<int, Fraction>> hits;
        for (const auto& [id, c] : row.form)
            if (pivots_.count(id)) hits.emplace_back(id, c);
        for (const auto& [id, c] : hits) subtract(row, pivots_.at(id), c);
        if (row.form.empty()) return row.rhs.km.zero() && row.rhs.kf.zero();
        auto [p, c] = *row.form.begin();
        Fraction inv = Fraction::of(1) / c;
        ParamEquation norm;
        add_scaled(norm.form, row.form, inv);
        norm.rhs = Exponents{row.rhs.km * inv, row.rhs.kf * inv};
        for (auto& [q, other] : pivots_)
            if (auto it = other.form.find(p); it != other.form.end())
                subtract(other, norm, it->second);
        pivots_.emplace(p, std::move(norm));
        return true;
    }
    const std::map<int, ParamEquation>& pivots() const { return pivots_; }

private:
    std::map<int, ParamEquation> pivots_;
};

}  // namespace

ParamSolution solve_params(const std::vector<int>& params,
                           const std::vector<const ParamEquation*>& equations) {
    ParamSolution s;
    if (params.size() > kMaxLinkedParams) {
        s.status = ParamSolution::Status::too_large;
        return s;
    }
    try {
        Echelon e;
        std::set<std::vector<std::int64_t>> seen;
        for (std::size_t i = 0; i < equations.size(); ++i) {
            if (!seen.insert(key_of(*equations[i])).second) continue;
            if (!e.add(*equations[i])) {
                s.status = ParamSolution::Status::conflict;
                s.conflict = i;
                return s;
            }
        }
        for (int p : params) {
            auto it = e.pivots().find(p);
            // A pivot row that still names other parameters leaves its pivot open too.
            if (it == e.pivots().end() || it->second.form.size() > 1)
                s.open.push_back(p);
            else
                s.dims[p] = it->second.rhs;
        }
        if (!s.open.empty()) s.status = ParamSolution::Status::open;
    } catch (const ExponentOverflow&) {
        s.status = ParamSolution::Status::too_large;
        s.dims.clear();
    }
    return s;
}

}  // namespace deckscale
