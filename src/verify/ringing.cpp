#include "verify/ringing.hpp"

#include <algorithm>

namespace deckscale {
namespace {

// Points k and k+1 are apart in time: a jump is written as two points at one instant, or (as
// ngspice 39 wrote a 50 ps edge's corner at 7.1 ns) 9e-18 s apart against steps of 4e-13 s
// around them; a step below 1e-3 of its neighbours' counts as one instant.
bool apart(const std::vector<std::complex<double>>& t, std::size_t k) {
    double step = t[k + 1].real() - t[k].real();
    double around = 0;
    if (k > 0) around = std::max(around, t[k].real() - t[k - 1].real());
    if (k + 2 < t.size()) around = std::max(around, t[k + 2].real() - t[k + 1].real());
    return step > 0 && step > 1e-3 * around;
}

}  // namespace

bool rings_at(const std::vector<std::complex<double>>& y,
              const std::vector<std::complex<double>>& t, std::size_t i) {
    std::size_t n = std::min(y.size(), t.size());
    if (i == 0 || i + 3 >= n) return false;
    double slope[4];
    for (std::size_t k = 0; k < 4; ++k) {
        std::size_t a = i - 1 + k;
        if (!apart(t, a)) return false;
        slope[k] = (y[a + 1].real() - y[a].real()) / (t[a + 1].real() - t[a].real());
    }
    double c0 = slope[1] - slope[0], c1 = slope[2] - slope[1], c2 = slope[3] - slope[2];
    return c0 != 0 && c1 != 0 && c2 != 0 && (c0 > 0) != (c1 > 0) && (c1 > 0) != (c2 > 0);
}

double ringing_average(const std::vector<std::complex<double>>& y,
                       const std::vector<std::complex<double>>& t, std::size_t i) {
    bool left = i > 0 && i < t.size() && apart(t, i - 1);
    bool right = i + 1 < y.size() && i + 1 < t.size() && apart(t, i);
    if (left && right) return (y[i - 1].real() + 2 * y[i].real() + y[i + 1].real()) / 4;
    if (left) return (y[i - 1].real() + y[i].real()) / 2;
    if (right) return (y[i].real() + y[i + 1].real()) / 2;
    return y[i].real();
}

std::pair<double, double> ringing_band(const std::vector<std::complex<double>>& y,
                                       const std::vector<std::complex<double>>& t, std::size_t j) {
    std::size_t n = std::min(y.size(), t.size());
    double lo = y[j].real(), hi = lo;
    auto take = [&](std::size_t i) {
        lo = std::min(lo, y[i].real());
        hi = std::max(hi, y[i].real());
    };
    if (j > 0 && apart(t, j - 1)) take(j - 1);
    if (j + 1 < n && apart(t, j)) {
        take(j + 1);
        if (j + 2 < n && apart(t, j + 1)) take(j + 2);
    }
    return {lo, hi};
}

}  // namespace deckscale
