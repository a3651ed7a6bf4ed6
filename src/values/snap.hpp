// Snapping a deck to parts you can buy: every R, C and L with a plain numeric value is
// rounded to the nearest member of the series chosen for its kind (values/series), and the
// new value keeps the deck's spelling style (deck/spice_number respell: a suffix stays a
// suffix). The result is edits in write's terms plus each part's error. A value written as
// `{NAME}` is rounded at NAME's `.param` definition when that parameter is nothing but such
// values (values/snap_params); other parameters and expressions are listed as left alone, never
// skipped silently.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "deck/diagnostic.hpp"
#include "deck/load.hpp"
#include "values/series.hpp"
#include "write/edit.hpp"

namespace deckscale {

struct SnapSeries {
    std::optional<ESeries> r, c, l;  // none: that kind is left as it is
};

// "R=E96,C=E12,L=E12" (kinds in any order and case), with at most one bare series for every
// kind not named ("E24", "E12,R=E96"); nullopt with `error` set otherwise.
std::optional<SnapSeries> parse_snap_series(const std::string& text, std::string& error);

struct SnappedPart {
    std::string name;  // as written: "C3"
    std::string file;
    std::uint32_t line = 0;
    std::string old_text, new_text;
    double ideal = 0, rounded = 0;
    // A parameter (values/snap_params): the parts whose whole value it is ("R1", "R2");
    // empty for a part whose own value is rounded.
    std::vector<std::string> elements{};
    double error() const { return rounded / ideal - 1; }
};

struct SnapResult {
    std::vector<EditSet> edits;          // one per Deck::files entry
    std::vector<SnappedPart> parts;      // every part considered, in file order
    std::vector<Diagnostic> left_alone;  // parts of a chosen kind whose value is not a number
};

SnapResult snap_deck(const Deck& deck, const SnapSeries& series);

}  // namespace deckscale
