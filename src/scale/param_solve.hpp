// The scaling dimensions of a group of linked parameters, solved exactly from what their uses
// and definitions require (scale/param_dims.hpp): one linear equation per use, over the
// rationals, for the Km and the Kf exponent together.
#pragma once

#include <cstddef>
#include <map>
#include <string>
#include <vector>

#include "scale/param_dims.hpp"

namespace deckscale {

struct Exponents {
    Fraction km, kf;
    bool operator==(const Exponents&) const = default;
};

// form == rhs
struct ParamEquation {
    LinearForm form;
    Exponents rhs;
};

struct ParamSolution {
    enum class Status { solved, conflict, open, too_large };
    Status status = Status::solved;
    std::map<int, Exponents> dims;  // the parameters the equations fix (all when solved)
    std::size_t conflict = 0;       // conflict: the first equation that disagreed
    std::vector<int> open;          // open: parameters the equations leave free
};

// Parameters beyond this many in one group are not solved (the group is wrapped).
constexpr std::size_t kMaxLinkedParams = 1000;

// Solves `equations` (in the order given: a conflict names the first one that disagrees with
// those before it) for `params`.
ParamSolution solve_params(const std::vector<int>& params,
                           const std::vector<const ParamEquation*>& equations);

}  // namespace deckscale
