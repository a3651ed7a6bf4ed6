// Units still to be found, as slots that expressions unite (union-find): every number and
// every variable of a .control block has one (scale/control_units.hpp). A slot ends bound to
// exponents of Km and Kf, unbound, or bad (with the reason); a slot that is one product of
// numbers keeps a pure unit only (which factor would carry another is not known).
#pragma once

#include <optional>
#include <string>
#include <vector>

#include <fmt/format.h>

#include "scale/control_units.hpp"
#include "scale/units.hpp"

namespace deckscale {

inline bool same_exponents(UnitExponents a, UnitExponents b) {
    return a.km == b.km && a.kf == b.kf;
}
inline constexpr UnitExponents kPureNumber{0, 0};

// "s", "A", ... or "volts or pure numbers" for the exponents of a unit, for messages.
std::string unit_text(UnitExponents e);

class UnitSlots {
public:
    int make(bool variable = false) {
        parent_.push_back(static_cast<int>(parent_.size()));
        dim_.emplace_back();
        why_.emplace_back();
        product_.push_back(false);
        variable_.push_back(variable);
        return parent_.back();
    }
    int find(int s) {
        while (parent_[s] != s) s = parent_[s] = parent_[parent_[s]];
        return s;
    }
    void bind(int s, UnitExponents e) {
        s = find(s);
        if (dim_[s] && !same_exponents(*dim_[s], e))
            fail(s, fmt::format("it meets quantities of two units ({} and {})",
                                unit_text(*dim_[s]), unit_text(e)));
        else
            dim_[s] = e;
    }
    void unite(int a, int b) {
        a = find(a);
        b = find(b);
        if (a == b) return;
        parent_[b] = a;
        product_[a] = product_[a] || product_[b];
        variable_[a] = variable_[a] || variable_[b];
        if (why_[a].empty()) why_[a] = why_[b];
        if (dim_[b]) bind(a, *dim_[b]);
    }
    void fail(int s, std::string why) {
        s = find(s);
        if (why_[s].empty()) why_[s] = std::move(why);
    }
    void mark_product(int s) { product_[find(s)] = true; }
    // The unit bound to s so far, unless s is bad.
    std::optional<UnitExponents> bound(int s) {
        s = find(s);
        if (!why_[s].empty()) return std::nullopt;
        return dim_[s];
    }
    // The slot met a quantity through a product: unless something else binds it, its unit
    // is not known.
    void met(int s, std::string why) {
        met_.resize(parent_.size());
        if (met_[s].empty()) met_[s] = std::move(why);
    }
    void resolve_met() {
        met_.resize(parent_.size());
        for (std::size_t s = 0; s < met_.size(); ++s)
            if (!met_[s].empty() && !dim_[find(static_cast<int>(s))])
                fail(static_cast<int>(s), met_[s]);
    }

    // A slot with a variable and no unit: what its numbers are is told by nothing here.
    bool free_variable(int s) {
        s = find(s);
        return variable_[s] && !dim_[s] && why_[s].empty();
    }

    // The outcome for a number of slot s.
    void resolve(int s, ExpressionLiteral& l) {
        s = find(s);
        if (!why_[s].empty()) {
            l.why = why_[s];
            return;
        }
        UnitExponents e = dim_[s].value_or(kPureNumber);  // unbound: never meets the circuit
        if (product_[s] && !same_exponents(e, kPureNumber)) {
            l.why = "it is one factor of a product of numbers that has a unit: which factor "
                    "carries it is not known";
            return;
        }
        l.exponents = e;
    }

private:
    std::vector<int> parent_;
    std::vector<std::optional<UnitExponents>> dim_;
    std::vector<std::string> why_;
    std::vector<bool> product_;
    std::vector<bool> variable_;
    std::vector<std::string> met_;
};

}  // namespace deckscale
