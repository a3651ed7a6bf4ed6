#include "scale/part_models.hpp"

#include <fmt/format.h>

#include <map>

#include "base/text_util.hpp"
#include "scale/hold_scan.hpp"

namespace deckscale {
namespace {

bool is_semiconductor(const ScannedElement& e) {
    char letter = e.name.empty() ? ' ' : ascii_lower(e.name[0]);
    return letter == 'd' || letter == 'q' || letter == 'j' || letter == 'z' || letter == 'm';
}

}  // namespace

std::vector<Diagnostic> part_model_notes(const Deck& deck, const std::set<std::string>& held) {
    HoldScan s = scan_for_holds(deck);
    const std::size_t n = s.regions.size();
    std::multimap<std::string, std::size_t> by_name;  // top-level .subckt regions
    for (std::size_t r = 0; r < n; ++r) by_name.emplace(s.regions[r].name, r);
    // Which regions hold semiconductors directly (the first few names, for the message), and
    // who calls whom: callers[r] are the regions with an X line calling r (-1: the top level).
    std::vector<std::vector<std::string>> devices(n);
    std::vector<std::size_t> device_count(n, 0);
    std::vector<std::set<int>> callers(n);
    for (const ScannedElement& e : s.elements) {
        if (e.region >= 0 && is_semiconductor(e)) {
            auto r = static_cast<std::size_t>(e.region);
            if (devices[r].size() < 3) devices[r].push_back(e.name);
            ++device_count[r];
        }
        if (e.subckt.empty()) continue;
        // A name defined inside the caller's own region is local to it, not a top-level one.
        if (e.region >= 0 &&
            s.regions[static_cast<std::size_t>(e.region)].local_subckts.count(e.subckt))
            continue;
        auto [lo, hi] = by_name.equal_range(e.subckt);
        for (auto it = lo; it != hi; ++it)
            if (static_cast<int>(it->second) != e.region) callers[it->second].insert(e.region);
    }
    // Semiconductors reached through calls: from each region that holds them directly, up
    // through its callers (each region visited once: linear in regions and calls).
    std::vector<bool> semi(n, false);
    std::vector<std::size_t> work;
    for (std::size_t r = 0; r < n; ++r)
        if (device_count[r] > 0) {
            semi[r] = true;
            work.push_back(r);
        }
    while (!work.empty()) {
        std::size_t r = work.back();
        work.pop_back();
        for (int c : callers[r])
            if (c >= 0 && !semi[static_cast<std::size_t>(c)]) {
                semi[static_cast<std::size_t>(c)] = true;
                work.push_back(static_cast<std::size_t>(c));
            }
    }
    std::vector<Diagnostic> notes;
    for (std::size_t r = 0; r < n; ++r) {
        const ScannedRegion& region = s.regions[r];
        if (!semi[r] || held.count(region.name)) continue;
        bool outer_call = false;
        for (int c : callers[r])
            outer_call = outer_call || c < 0 || !semi[static_cast<std::size_t>(c)];
        if (!outer_call) continue;
        std::string which;
        if (device_count[r] == 0) {
            which = "through the .subckts it calls";
        } else {
            which = devices[r][0];
            for (std::size_t i = 1; i < devices[r].size(); ++i) which += ", " + devices[r][i];
            if (device_count[r] > devices[r].size()) which += ", ...";
        }
        notes.push_back(deck.files[region.file].source->diagnose(
            Severity::note, region.name_offset, static_cast<std::uint32_t>(region.written.size()),
            fmt::format("'{}' holds semiconductor devices ({}) and is scaled with the rest of "
                        "the deck: if it is the model of a real part, the rewritten .subckt no "
                        "longer describes that part; --hold subckt:{} keeps it as written, and "
                        "verify then shows how far the response moves",
                        region.written, which, region.written)));
    }
    return notes;
}

}  // namespace deckscale
