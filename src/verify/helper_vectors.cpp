#include "verify/helper_vectors.hpp"

#include <algorithm>

namespace deckscale {
namespace {

// The element name x of a node named `x_int<N>` (N digits), or "".
std::string internal_node_element(const std::string& n) {
    auto at = n.rfind("_int");
    if (at == std::string::npos || at == 0 || at + 4 == n.size()) return "";
    bool digits = std::all_of(n.begin() + static_cast<std::ptrdiff_t>(at + 4), n.end(),
                              [](char c) { return c >= '0' && c <= '9'; });
    return digits ? n.substr(0, at) : "";
}

}  // namespace

bool current_as_voltage(const SimVector& v) {
    if (v.kind != VectorKind::voltage) return false;
    std::string x = internal_node_element(v.name);
    if (x.empty()) return false;
    // G's second node (TABLE) holds the value of its controlling expression, which the
    // rewrite substitutes to read as in the original: no current.
    return x[0] == 'c' || (x[0] == 'g' && v.name.ends_with("_int1"));
}

bool translation_state(const SimVector& v, const SimPlot& plot) {
    if (v.kind == VectorKind::voltage) {
        std::string x = internal_node_element(v.name);
        return !x.empty() && x[0] == 'l';
    }
    const std::string suffix = "#branch";
    const std::string& n = v.name;
    if (v.kind != VectorKind::current || n.size() <= suffix.size() + 2 || n[0] != 'l' ||
        n[1] != 'c' || n.compare(n.size() - suffix.size(), suffix.size(), suffix) != 0)
        return false;
    std::string element = n.substr(1, n.size() - suffix.size() - 1);  // "c1" of "lc1#branch"
    return plot.find(element + "_int1") != nullptr;
}

}  // namespace deckscale
