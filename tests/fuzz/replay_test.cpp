// Runs the fuzz targets' code (targets.hpp) in the ordinary suite: on every deck of
// netlists/ with every factor setting, and on every input saved in tests/fuzz/regressions/
// (each one an input that once crashed or hung a target; the file name says which target:
// deck-*.bin or number-*.bin).
#include <gtest/gtest.h>

#include <filesystem>
#include <string>

#include "fuzz/targets.hpp"
#include "support/common.hpp"

namespace deckscale {
namespace {

namespace fs = std::filesystem;

const std::uint8_t* bytes_of(const std::string& s) {
    return reinterpret_cast<const std::uint8_t*>(s.data());
}

TEST(FuzzReplay, EveryProjectDeckWithEveryKnob) {
    int decks = 0;
    for (const auto& path : test::netlist_files()) {
        std::string text = test::read_bytes(path);
        for (int knobs = 0; knobs < 32; ++knobs) {
            std::string input = std::string(1, static_cast<char>(knobs)) + text;
            fuzz::deck(bytes_of(input), input.size());
        }
        ++decks;
    }
    EXPECT_GT(decks, 5);
}

TEST(FuzzReplay, SavedRegressionInputs) {
    fs::path dir = fs::path(test::source_dir()) / "tests" / "fuzz" / "regressions";
    int replayed = 0;
    for (const auto& e : fs::directory_iterator(dir)) {
        std::string name = e.path().filename().string();
        if (name == "README.md") continue;
        std::string input = test::read_bytes(e.path());
        SCOPED_TRACE(name);
        if (name.rfind("deck-", 0) == 0)
            fuzz::deck(bytes_of(input), input.size());
        else if (name.rfind("number-", 0) == 0)
            fuzz::number(bytes_of(input), input.size());
        else
            ADD_FAILURE() << "a regression input must be named deck-* or number-*";
        ++replayed;
    }
    EXPECT_GT(replayed, 0);
}

}  // namespace
}  // namespace deckscale
