// Properties of the scaling pass on mutated decks: whatever bytes come in, the reader and
// the pass either succeed or report a DeckError (nothing else escapes), and the one-pass
// load_and_scale gives exactly what load_deck + scale_deck give.
#include <gtest/gtest.h>

#include <random>
#include <string>
#include <vector>

#include "base/file_system.hpp"
#include "scale/rescale.hpp"
#include "support/common.hpp"
#include "write/edit.hpp"

namespace deckscale {
namespace {

TEST(ScalerProperty, MutatedDecksFailCleanlyAndOnePassEqualsTwoPasses) {
    std::vector<std::string> seeds;
    for (const auto& path : test::netlist_files())
        if (test::is_top_deck(path)) seeds.push_back(test::read_bytes(path));
    ASSERT_FALSE(seeds.empty());
    std::mt19937 rng(20261202);  // fixed: the run is repeatable
    const std::string alphabet =
        "{}()'\"=,;$/+*\\\n\r\t .0123456789eEkKmMuUnNpPfFgGtTdD-abcRLCVIEGFHBTOUSWKXDQ";
    int ok = 0, refused = 0;
    for (int it = 0; it < 3000; ++it) {
        std::string s = seeds[rng() % seeds.size()];
        for (int k = 0, n = 1 + static_cast<int>(rng() % 4); k < n && !s.empty(); ++k) {
            std::size_t pos = rng() % s.size();
            char c = alphabet[rng() % alphabet.size()];
            switch (rng() % 3) {
                case 0: s[pos] = c; break;
                case 1: s.insert(pos, 1, c); break;
                default: s.erase(pos, 1 + rng() % 3); break;
            }
        }
        MemoryFileSystem fs;
        fs.add("deck.cir", s);
        ScaleSettings settings;
        settings.factors = {7, 3};
        settings.mark_unscalable = it % 2 == 1;
        try {
            ScaledDeck one = load_and_scale("deck.cir", fs, settings);
            ScaleResult two = scale_deck(one.deck, settings);
            ASSERT_EQ(apply_edits(one.deck.top().text(), one.result.edits[0]),
                      apply_edits(one.deck.top().text(), two.edits[0]))
                << "iteration " << it << ":\n" << s;
            ++ok;
        } catch (const DeckError&) {
            ++refused;
        }
    }
    // Both outcomes must really occur, or the mutations test nothing.
    EXPECT_GT(ok, 300);
    EXPECT_GT(refused, 300);
}

}  // namespace
}  // namespace deckscale
