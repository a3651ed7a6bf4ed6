// Producing output files: a large file's second half is produced on a second thread; the
// bytes must be exactly those of one sequential pass, also when edits are insertions.
#include "write/plan.hpp"

#include <gtest/gtest.h>

#include <string>

#include <fmt/format.h>

#include "base/file_system.hpp"
#include "scale/rescale.hpp"
#include "write/edit.hpp"

namespace deckscale {
namespace {

std::string produce(const Deck& deck, const OutputPlan& plan) {
    std::string out;
    StringSink sink(out);
    produce_output(deck, plan, plan.files.back(), sink);
    sink.flush();
    return out;
}

TEST(ScaleOutput, LargeFileProducedInTwoHalvesEqualsOnePass) {
    // Over the 8 MB threshold; the second deck also marks every fourth card (an insertion
    // at the card's start), so the split may fall on an insertion.
    for (bool marks : {false, true}) {
        SCOPED_TRACE(marks ? "with marking insertions" : "values only");
        std::string text = "generated deck\n";
        for (int i = 0; text.size() < (9u << 20); ++i) {
            text += fmt::format("R{0} n{0} n{1} 1.5k\nC{0} n{1} 0 22p\n", i, i + 1);
            if (marks && i % 2 == 0) text += fmt::format("Q{0} c{0} b e qm\n", i);
        }
        text += ".end\n";
        MemoryFileSystem fs;
        fs.add("big.cir", text);
        ScaleSettings settings;
        settings.factors = {50, 1000};
        settings.mark_unscalable = marks;
        ScaledDeck scaled = load_and_scale("big.cir", fs, settings);
        std::string whole = apply_edits(scaled.deck.top().text(), scaled.result.edits[0]);
        OutputPlan plan =
            plan_output(scaled.deck, std::move(scaled.result.edits), "out.cir", false);
        plan.parallel = false;
        EXPECT_TRUE(produce(scaled.deck, plan) == whole);
        plan.parallel = true;
        std::string halves = produce(scaled.deck, plan);
        EXPECT_EQ(halves.size(), whole.size());
        EXPECT_TRUE(halves == whole);
    }
}

}  // namespace
}  // namespace deckscale
