// The scaling dimensions of linked parameters solved exactly (scale/param_solve): a unique
// solution, the first equation that contradicts the ones before it, and what stays open.
#include "scale/param_solve.hpp"

#include <gtest/gtest.h>

namespace deckscale {
namespace {

ParamEquation eq(LinearForm form, int km, int kf) {
    return ParamEquation{std::move(form), Exponents{Fraction::of(km), Fraction::of(kf)}};
}

std::vector<const ParamEquation*> pointers(const std::vector<ParamEquation>& eqs) {
    std::vector<const ParamEquation*> out;
    for (const auto& e : eqs) out.push_back(&e);
    return out;
}

const Fraction one = Fraction::of(1), minus = Fraction::of(-1);

// rr a resistance, q - w0 - rr and -q - w0 - rr capacitances (the two capacitors of a
// unity-gain Sallen-Key low-pass, C1 = 2Q/(w0 R), C2 = 1/(2Q w0 R)): w0 is a frequency and
// q has no unit.
TEST(ParamSolve, SolvesTheSallenKeyParameters) {
    const int rr = 0, q = 1, w0 = 2;
    std::vector<ParamEquation> eqs{eq({{rr, one}}, 1, 0),
                                   eq({{q, one}, {w0, minus}, {rr, minus}}, -1, -1),
                                   eq({{q, minus}, {w0, minus}, {rr, minus}}, -1, -1)};
    auto s = solve_params({rr, q, w0}, pointers(eqs));
    ASSERT_EQ(s.status, ParamSolution::Status::solved);
    EXPECT_EQ(s.dims.at(rr), (Exponents{one, Fraction::of(0)}));
    EXPECT_EQ(s.dims.at(q), (Exponents{Fraction::of(0), Fraction::of(0)}));
    EXPECT_EQ(s.dims.at(w0), (Exponents{Fraction::of(0), one}));
}

TEST(ParamSolve, NamesTheFirstEquationThatDisagrees) {
    std::vector<ParamEquation> eqs{eq({{0, one}}, 1, 0), eq({{0, one}}, 1, 0),
                                   eq({{0, one}, {1, one}}, 1, 0), eq({{0, one}}, -1, -1)};
    auto s = solve_params({0, 1}, pointers(eqs));
    EXPECT_EQ(s.status, ParamSolution::Status::conflict);
    EXPECT_EQ(s.conflict, 3u);
}

TEST(ParamSolve, AProductAloneLeavesBothOpen) {
    std::vector<ParamEquation> eqs{eq({{0, one}, {1, one}}, 1, 0), eq({{2, one}}, 0, 1)};
    auto s = solve_params({0, 1, 2}, pointers(eqs));
    EXPECT_EQ(s.status, ParamSolution::Status::open);
    EXPECT_EQ(s.open, (std::vector<int>{0, 1}));
    EXPECT_EQ(s.dims.count(2), 1u);  // what is fixed is still reported
}

TEST(ParamSolve, HalfPowersStayExact) {
    // sqrt(l/c) is a resistance and l an inductance: c is a capacitance.
    std::vector<ParamEquation> eqs{eq({{0, Fraction::of(1, 2)}, {1, Fraction::of(-1, 2)}}, 1, 0),
                                   eq({{0, one}}, 1, -1)};
    auto s = solve_params({0, 1}, pointers(eqs));
    ASSERT_EQ(s.status, ParamSolution::Status::solved);
    EXPECT_EQ(s.dims.at(1), (Exponents{minus, minus}));
}

TEST(ParamSolve, TooManyLinkedParametersAreNotSolved) {
    std::vector<int> params(kMaxLinkedParams + 1);
    for (std::size_t i = 0; i < params.size(); ++i) params[i] = static_cast<int>(i);
    EXPECT_EQ(solve_params(params, {}).status, ParamSolution::Status::too_large);
}

}  // namespace
}  // namespace deckscale
