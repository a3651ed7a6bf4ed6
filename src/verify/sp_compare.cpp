#include "verify/sp_compare.hpp"

#include <algorithm>
#include <cctype>

namespace deckscale {

bool impedance_matrix_vector(const std::string& name) {
    // "Z_<row>_<column>": a letter, then two underscore-led port numbers.
    if (name.size() < 5 || (std::tolower(static_cast<unsigned char>(name[0])) != 'z' &&
                            std::tolower(static_cast<unsigned char>(name[0])) != 'y'))
        return false;
    int groups = 0;
    std::size_t i = 1;
    while (i < name.size()) {
        if (name[i] != '_' || i + 1 == name.size() ||
            !std::isdigit(static_cast<unsigned char>(name[i + 1])))
            return false;
        ++i;
        while (i < name.size() && std::isdigit(static_cast<unsigned char>(name[i]))) ++i;
        ++groups;
    }
    return groups == 2;
}

Comparison compare_sp(const SimPlot& original, const SimPlot& scaled, double km, double kf,
                      const Tolerances& tol) {
    auto without_matrices = [](const SimPlot& p) {
        SimPlot q = p;
        std::erase_if(q.vectors,
                      [](const SimVector& v) { return impedance_matrix_vector(v.name); });
        return q;
    };
    Comparison c = compare_ac(without_matrices(original), without_matrices(scaled), km, kf, tol);
    c.analysis = "sp";
    c.notes.push_back("S-parameters compared as they are (every port's z0 x Km); the Z and Y "
                      "matrices follow from them");
    return c;
}

}  // namespace deckscale
