#include "verify/tf_compare.hpp"

#include <algorithm>
#include <cmath>

#include <fmt/format.h>

#include "base/text_util.hpp"

namespace deckscale {

double tf_back_factor(const std::string& name, const TfSpec& tf, double km) {
    std::string n = to_lower(name);
    if (n == "transfer_function") {
        double out = tf.current_output ? 1 / km : 1;  // scaled over original
        double in = !tf.source.empty() && tf.source[0] == 'i' ? 1 / km : 1;
        return in / out;
    }
    if (n.find("input_impedance") != std::string::npos ||
        n.find("output_impedance") != std::string::npos)
        return 1 / km;
    return 0;
}

Comparison compare_tf(const SimPlot& o, const SimPlot& s, const TfSpec& tf, double km,
                      const Tolerances& tol) {
    Comparison c;
    c.analysis = "tf";
    c.points = 1;
    for (const auto& vo : o.vectors) {
        double back = tf_back_factor(vo.name, tf, km);
        if (back == 0 || vo.values.empty()) continue;
        const SimVector* vs = s.find(vo.name);
        if (!vs || vs->values.empty()) {
            c.problems.push_back(
                fmt::format("'{}' exists in the original but not in the scaled deck", vo.name));
            continue;
        }
        VectorResult r{vo.name, VectorKind::other};
        double a = vo.values[0].real(), b = vs->values[0].real() * back;
        double scale = std::max(std::fabs(a), std::fabs(b));
        r.peak = std::fabs(a);
        r.worst = scale > 1e-300 ? std::fabs(b - a) / scale : 0;
        r.passed = r.worst <= tol.relative || tol.held;
        mark_non_finite(r, vo, *vs);
        c.vectors.push_back(r);
    }
    if (c.vectors.empty()) c.problems.push_back("the transfer function analysis gave no values");
    sort_worst_first(c);
    return c;
}

}  // namespace deckscale
