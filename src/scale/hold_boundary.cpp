// Where held parts meet scaled ones (shared notes "scaling-rules.md" §5, partial scaling):
// a scaled part's impedance changed by Km and a held part's did not, so a node through which
// current flows between them no longer sees the original circuit. The rule is kept simple
// and stated in the warning: a node other than ground where a current-carrying terminal of
// a held part meets one of a scaled part (scale/terminals.hpp says which terminals carry
// current). Whether a held terminal is a buffer's input that draws no current is not known.
#include <fmt/format.h>

#include <map>

#include "scale/expression.hpp"
#include "scale/hold_scan.hpp"
#include "scale/terminals.hpp"

namespace deckscale {
namespace {

// The nodes of one scope (the top level, or the body of one .subckt) and who meets there.
struct Meeting {
    std::vector<std::size_t> held, scaled;  // element indices
};

std::string names_of(const HoldScan& scan, const std::vector<std::size_t>& which) {
    std::string s;
    for (std::size_t i = 0; i < which.size() && i < 4; ++i)
        s += (i ? ", " : "") + scan.elements[which[i]].name;
    if (which.size() > 4) s += fmt::format(" and {} more", which.size() - 4);
    return s;
}

}  // namespace

std::vector<Diagnostic> boundary_warnings(const Deck& deck, const HoldScan& scan,
                                          const std::vector<bool>& held,
                                          const std::vector<bool>& scaled_regions, double km) {
    // Scope -1 is the top level; a region's body counts where it is rendered scaled (a body
    // rendered as written is all held: its boundary is at the X line's nodes above it).
    std::map<int, std::map<std::string, Meeting>> scopes;
    for (std::size_t i = 0; i < scan.elements.size(); ++i) {
        const ScannedElement& e = scan.elements[i];
        if (e.nested || (e.region >= 0 && !scaled_regions[e.region])) continue;
        for (const auto& node : e.nodes) {
            if (is_ground(node)) continue;
            auto& m = scopes[e.region][node];
            auto& side = held[i] ? m.held : m.scaled;
            if (side.empty() || side.back() != i) side.push_back(i);
        }
    }
    // One warning per held part, naming each of its boundary nodes.
    std::map<std::size_t, std::string> per_part;
    for (const auto& [scope, nodes] : scopes)
        for (const auto& [node, m] : nodes) {
            if (m.held.empty() || m.scaled.empty()) continue;
            for (std::size_t h : m.held) {
                std::string& s = per_part[h];
                s += fmt::format("{}node '{}' ({})", s.empty() ? "" : ", ", node,
                                 names_of(scan, m.scaled));
            }
        }
    std::vector<Diagnostic> out;
    for (const auto& [i, nodes] : per_part) {
        const ScannedElement& e = scan.elements[i];
        out.push_back(deck.files[e.file].source->diagnose(
            Severity::warning, e.offset, static_cast<std::uint32_t>(e.name.size()),
            fmt::format(
                "held part '{}' meets scaled parts at {}: their impedance changed by Km = "
                "{} and its did not, so the circuit there is no longer the original's unless "
                "that terminal of '{}' draws no current (a buffer's input). Rule: a node other "
                "than ground where a held and a scaled part's terminals meet; V and E sources and "
                "the controlling inputs of F, G, H, S and W do not count",
                e.name, nodes, factor_text(km), e.name)));
    }
    return out;
}

}  // namespace deckscale
