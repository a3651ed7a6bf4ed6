#include "scale/hold_plan.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "base/text_util.hpp"
#include "scale/hold_items.hpp"
#include "scale/hold_scan.hpp"

namespace deckscale {
namespace {

// Who uses a .subckt or a .model: held parts, scaled parts, or both.
struct Uses {
    bool held = false, scaled = false;
    std::vector<std::string> held_by;  // the held users, for the report
    bool add(bool as_held, const std::string& by) {
        bool& flag = as_held ? held : scaled;
        bool changed = !flag;
        flag = true;
        if (as_held && !by.empty() &&
            std::find(held_by.begin(), held_by.end(), by) == held_by.end())
            held_by.push_back(by);
        return changed;
    }
};

std::string name_list(const std::vector<std::string>& names, std::size_t most = 6) {
    std::string s;
    for (std::size_t i = 0; i < names.size() && i < most; ++i) s += (i ? ", " : "") + names[i];
    if (names.size() > most) s += fmt::format(" and {} more", names.size() - most);
    return s;
}

// A name not used by any .subckt or .model (lower case), from `base` + "_scaled".
std::string copy_name(const std::string& base, const HoldScan& scan, std::set<std::string>& taken) {
    for (int n = 1;; ++n) {
        std::string name = base + (n == 1 ? "_scaled" : fmt::format("_scaled{}", n));
        std::string lower = to_lower(name);
        if (scan.subckts.count(lower) || scan.models.count(lower) || taken.count(lower)) continue;
        taken.insert(lower);
        return name;
    }
}

class Planner {
  public:
    Planner(const Deck& deck, ScaleFactors f) : deck_(deck), f_(f), scan_(scan_for_holds(deck)) {}

    HoldPlan plan(const std::vector<std::string>& texts) {
        plan_.items = texts;
        std::string error;
        auto items = read_hold_items(texts, error);
        if (!items) fail(error);
        std::vector<std::string> unknown;
        for (const auto& item : *items)
            if (!resolve(item)) unknown.push_back(hint(item));
        if (!unknown.empty())
            fail(fmt::format("--hold names what {} does not have: {}", deck_.top().path(),
                             name_list(unknown, 20)));
        held_.assign(scan_.elements.size(), false);
        for (std::size_t i = 0; i < scan_.elements.size(); ++i) held_[i] = is_held(i);
        subckt_uses();
        model_uses();
        regions();
        if (f_.km != 1) {
            std::vector<bool> scaled(scan_.regions.size());
            for (std::size_t r = 0; r < scaled.size(); ++r)
                scaled[r] = !plan_.regions[r].held || !plan_.regions[r].copy.empty();
            plan_.boundaries = boundary_warnings(deck_, scan_, held_, scaled, f_.km);
        }
        plan_.file_region = scan_.file_region;
        plan_.held_line_at = scan_.title_end;
        plan_.held_line_eol = scan_.title_eol;
        return std::move(plan_);
    }

    const std::vector<bool>& held() const { return held_; }
    const HoldScan& scan() const { return scan_; }

  private:
    [[noreturn]] void fail(const std::string& message) const {
        throw DeckError(Diagnostic{Severity::error, deck_.top().path(), 0, 0, 0, "", message, {}});
    }

    std::size_t add_part(std::string kind, const std::string& name, std::size_t file,
                         std::uint32_t offset, std::string why) {
        plan_.parts.push_back(
            HeldPart{std::move(kind), name, file, offset, std::move(why), "", {}});
        return plan_.parts.size() - 1;
    }

    // Marks what the item names; false when it names nothing.
    bool resolve(const HoldItem& item) {
        std::string asked = "asked: --hold " + item.text;
        if (item.kind == HoldKind::any) {
            bool any = false;
            for (const auto& e : scan_.elements) {
                if (e.region >= 0 || !name_matches(item.pattern, to_lower(e.name))) continue;
                any = true;
                auto key = std::make_pair(e.file, e.offset);
                if (plan_.held_elements.count(key)) continue;
                bool x = e.name[0] == 'x' || e.name[0] == 'X';
                plan_.held_elements[key] =
                    add_part(x ? "instance" : "element", e.name, e.file, e.offset, asked);
            }
            if (any) return true;
        }
        if (item.kind != HoldKind::model) {
            bool any = false;
            for (const auto& [name, defs] : scan_.subckts) {
                if (!name_matches(item.pattern, name)) continue;
                any = true;
                if (!plan_.held_subckts.insert(name).second) continue;
                std::vector<std::string> users;
                for (const auto& e : scan_.elements)
                    if (e.subckt == name) users.push_back(e.name);
                subckt_parts_[name] =
                    add_part("subckt", defs.front().written, defs.front().file, defs.front().offset,
                             fmt::format("{}; every instance ({})", asked,
                                         users.empty() ? "none" : name_list(users)));
            }
            if (any || item.kind == HoldKind::subckt) return any;
        }
        bool any = false;
        for (const auto& [name, defs] : scan_.models) {
            if (!name_matches(item.pattern, name)) continue;
            any = true;
            if (plan_.held_models.count(name)) continue;
            std::vector<std::string> users;
            for (const auto& e : scan_.elements)
                if (e.model == name) users.push_back(e.name);
            plan_.held_models[name] =
                add_part("model", defs.front().written, defs.front().file, defs.front().offset,
                         fmt::format("{}; every instance ({})", asked,
                                     users.empty() ? "none" : name_list(users)));
        }
        return any;
    }

    // "'R5' (an element inside .subckt filt at deck.cir:12: hold an X line that uses it, or
    // subckt:filt)" for an item that matched nothing.
    std::string hint(const HoldItem& item) const {
        std::string what = item.kind == HoldKind::model    ? "no .model of that name"
                           : item.kind == HoldKind::subckt ? "no .subckt of that name"
                                                           : "nothing of that name";
        if (item.kind == HoldKind::any)
            for (const auto& e : scan_.elements) {
                if (e.region < 0 || !name_matches(item.pattern, to_lower(e.name))) continue;
                const auto& r = scan_.regions[e.region];
                auto pos = deck_.files[r.file].source->position(r.name_offset);
                return fmt::format(
                    "'{}' ({} is inside .subckt {} at {}:{}: hold an X line that "
                    "uses it, or subckt:{})",
                    item.text, e.name, r.written, deck_.files[r.file].source->path(), pos.line,
                    r.written);
            }
        return fmt::format("'{}' ({})", item.text, what);
    }

    bool is_held(std::size_t i) const {
        const ScannedElement& e = scan_.elements[i];
        if (e.region < 0 && plan_.held_elements.count({e.file, e.offset})) return true;
        if (!e.model.empty() && plan_.held_models.count(e.model)) return true;
        return !e.subckt.empty() && plan_.held_subckts.count(e.subckt);
    }

    // A region used by nothing is scaled in place, as without --hold.
    bool region_scaled(const std::string& name) const {
        auto it = subckt_.find(name);
        return it == subckt_.end() || it->second.scaled || !it->second.held;
    }
    bool region_held(const std::string& name) const {
        auto it = subckt_.find(name);
        return it != subckt_.end() && it->second.held;
    }

    void subckt_uses() {
        // Top-level X lines first, then through the definitions until nothing changes (each
        // round adds a use, so it ends; a .subckt calling itself is the reader's problem).
        for (std::size_t i = 0; i < scan_.elements.size(); ++i) {
            const auto& e = scan_.elements[i];
            if (e.region < 0 && !e.subckt.empty() && scan_.subckts.count(e.subckt))
                subckt_[e.subckt].add(held_[i], e.name);
        }
        for (bool changed = true; changed;) {
            changed = false;
            for (std::size_t i = 0; i < scan_.elements.size(); ++i) {
                const auto& e = scan_.elements[i];
                if (e.region < 0 || e.subckt.empty() || !scan_.subckts.count(e.subckt)) continue;
                const ScannedRegion& r = scan_.regions[e.region];
                if (r.local_subckts.count(e.subckt)) continue;
                std::string by = fmt::format("{} inside .subckt {}", e.name, r.written);
                if (held_[i]) {
                    changed |= subckt_[e.subckt].add(true, by);
                    continue;
                }
                if (region_held(r.name)) changed |= subckt_[e.subckt].add(true, by);
                if (region_scaled(r.name)) changed |= subckt_[e.subckt].add(false, "");
            }
        }
    }

    void model_uses() {
        std::map<std::string, Uses> uses;
        for (std::size_t i = 0; i < scan_.elements.size(); ++i) {
            const auto& e = scan_.elements[i];
            if (e.model.empty() || plan_.held_models.count(e.model)) continue;
            auto defs = scan_.models.find(e.model);
            if (defs == scan_.models.end()) continue;
            if (e.region >= 0 && scan_.regions[e.region].local_models.count(e.model)) continue;
            bool global = std::any_of(defs->second.begin(), defs->second.end(),
                                      [](const ScannedDefinition& d) { return d.region < 0; });
            if (!global) continue;
            if (e.region < 0) {
                uses[e.model].add(held_[i], e.name);
                continue;
            }
            const std::string& r = scan_.regions[e.region].name;
            if (region_held(r))
                uses[e.model].add(true, fmt::format("{} inside .subckt {}", e.name,
                                                    scan_.regions[e.region].written));
            if (region_scaled(r)) uses[e.model].add(false, "");
        }
        if (f_.km == 1 && f_.kf == 1) return;  // nothing changes: no copies
        for (const auto& [name, u] : uses) {
            if (!u.held || !u.scaled) continue;
            const auto& d = scan_.models.at(name).front();
            std::size_t part = add_part(
                "model", d.written, d.file, d.offset,
                fmt::format("used by held parts ({}) and by scaled ones", name_list(u.held_by)));
            plan_.shared_models[name] = {copy_name(d.written, scan_, taken_), part};
        }
    }

    void regions() {
        for (const auto& r : scan_.regions) {
            HoldRegion h;
            h.name = r.name;
            h.file = r.file;
            h.begin = r.begin;
            h.end = r.end;
            h.copy_at = r.copy_at;
            h.eol = r.eol;
            h.local_subckts = r.local_subckts;
            h.local_models = r.local_models;
            h.held = region_held(r.name);
            if (h.held) {
                const Uses& u = subckt_.at(r.name);
                bool both = u.scaled && !(f_.km == 1 && f_.kf == 1);
                if (both && !plan_.subckt_copies.count(r.name))
                    plan_.subckt_copies[r.name] = copy_name(r.written, scan_, taken_);
                if (both) h.copy = plan_.subckt_copies[r.name];
                auto part = subckt_parts_.find(r.name);
                if (part == subckt_parts_.end())
                    part = subckt_parts_
                               .emplace(r.name,
                                        add_part("subckt", r.written, r.file, r.name_offset,
                                                 "used by held parts: " + name_list(u.held_by)))
                               .first;
                h.part = part->second;
                plan_.parts[h.part].copy = h.copy;
            }
            plan_.regions.push_back(std::move(h));
        }
    }

    const Deck& deck_;
    ScaleFactors f_;
    HoldScan scan_;
    HoldPlan plan_;
    std::vector<bool> held_;
    std::map<std::string, Uses> subckt_;
    std::map<std::string, std::size_t> subckt_parts_;
    std::set<std::string> taken_;
};

}  // namespace

const HoldRegion* HoldPlan::region_at(std::size_t file, std::uint32_t offset) const {
    if (file < file_region.size() && file_region[file] >= 0)
        return &regions[static_cast<std::size_t>(file_region[file])];
    // The last region that starts at or before the offset (regions are in file order).
    auto after =
        std::upper_bound(regions.begin(), regions.end(), std::make_pair(file, offset),
                         [](const std::pair<std::size_t, std::uint32_t>& at, const HoldRegion& r) {
                             return at < std::make_pair(r.file, r.begin);
                         });
    if (after == regions.begin()) return nullptr;
    const HoldRegion& r = *(after - 1);
    return r.file == file && offset < r.end ? &r : nullptr;
}

HoldPlan plan_holds(const Deck& deck, const std::vector<std::string>& items, ScaleFactors f) {
    return Planner(deck, f).plan(items);
}

std::set<std::string> held_top_level_names(const Deck& deck,
                                           const std::vector<std::string>& items) {
    Planner planner(deck, ScaleFactors{});
    planner.plan(items);
    std::set<std::string> out;
    const auto& elements = planner.scan().elements;
    for (std::size_t i = 0; i < elements.size(); ++i)
        if (elements[i].region < 0 && planner.held()[i]) out.insert(to_lower(elements[i].name));
    return out;
}

}  // namespace deckscale
