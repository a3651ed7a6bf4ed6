#include "deckscale/verify.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <thread>

#include "deckscale/internal.hpp"
#include "sim/head_start.hpp"

namespace deckscale::api {
namespace {

PairRequest request_of(const Deck& original, const Deck& scaled, const VerifyOptions& o) {
    if (o.km.has_value() != o.kf.has_value())
        throw request_error("give both factors (km and kf) or neither (they are then inferred)");
    for (auto k : {o.km, o.kf})
        if (k && (!std::isfinite(*k) || !(*k > 0)))
            throw request_error(fmt::format("factors must be finite and positive, got {}", *k));
    PairRequest r;
    r.original = original.path();
    r.scaled = scaled.path();
    r.factors_given = o.km.has_value();
    r.km = o.km.value_or(1);
    r.kf = o.kf.value_or(1);
    r.sweep = o.sweep;
    r.drive = o.drive;
    r.tolerances.relative = o.tolerance;
    r.tolerances.transient = o.tran_tolerance;
    r.tolerances.db = o.tolerance_db;
    r.tolerances.degrees = o.tolerance_deg;
    r.timeout = std::chrono::milliseconds(static_cast<long>(o.timeout_s * 1000));
    r.memory_mb = o.memory_mb;
    if (!std::isfinite(o.max_step) || o.max_step < 0)
        throw request_error(fmt::format("max_step must be 0 (as the deck says) or a positive "
                                        "time in seconds, got {}", o.max_step));
    r.max_step = o.max_step;
    return r;
}

AnalysisComparison comparison_of(const Comparison& c) {
    // Node voltages and branch currents; noise densities and the .tf results are "other".
    AnalysisComparison a{c.analysis, c.points,   c.first,        c.last,
                         c.passed(), c.problems, c.not_compared, {},       c.axis_unit,
                         c.part};
    for (const auto& v : c.vectors)
        a.vectors.push_back({v.name,
                             v.kind == VectorKind::current   ? "current"
                             : v.kind == VectorKind::voltage ? "voltage"
                                                             : "other",
                             v.worst, v.at, v.db_error, v.deg_error, v.peak, v.passed, v.gmin_level,
                             v.original_value, v.scaled_value, v.quantity});
    return a;
}

}  // namespace

Verification verify(const Deck& original, const Deck& scaled, const VerifyOptions& options) {
    PairRequest request = request_of(original, scaled, options);
    MemoryFiles memory = original.impl().memory;
    for (const auto& [path, text] : scaled.impl().memory) memory[path] = text;
    OverlayFileSystem files(std::move(memory));
    // As the verify command: two simulator processes load libngspice while the decks are read.
    SimHeadStart head_start(std::min(2u, std::max(1u, std::thread::hardware_concurrency())));
    return verification_of(verify_pair(request, files, &head_start));
}

Verification verification_of(const PairVerification& v) {
    Verification out;
    out.problems = v.problems;
    for (const auto& f : v.failures)
        out.failures.push_back({f.label, f.analysis, to_string(f.status), f.message});
    using Outcome = PairVerification::Outcome;
    out.outcome = v.outcome == Outcome::bad_input    ? Verification::Outcome::bad_input
                  : v.outcome == Outcome::sim_failed ? Verification::Outcome::sim_failed
                                                     : Verification::Outcome::compared;
    if (out.outcome != Verification::Outcome::compared) return out;
    const VerifyReport& r = v.report;
    out.passed = r.passed();
    out.km = r.km;
    out.kf = r.kf;
    out.factors_inferred = r.factors_inferred;
    out.notes = r.notes;
    for (const auto& c : r.comparisons) out.analyses.push_back(comparison_of(c));
    out.text = report_text(r);
    out.json = report_json(r);
    return out;
}

}  // namespace deckscale::api
