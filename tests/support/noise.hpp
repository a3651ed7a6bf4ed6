// Independent ngspice runs of a noise analysis for the tests that check noise against the
// outside: the deck is prepared by verify's simulation_cards (its own analyses and .control
// removed; tight tolerances on decks with junctions, scaled for the rescaled deck), given
// one .noise card, and run by the ngspice program in batch mode (test::ngspice_batch()).
#pragma once

#include <algorithm>
#include <cstdlib>
#include <map>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

#include <gtest/gtest.h>

#include "base/file_system.hpp"
#include "support/common.hpp"
#include "verify/sim_cards.hpp"

namespace deckscale::test {

struct NoiseRun {
    std::map<std::string, std::vector<double>> spectra;  // "frequency", "onoise_spectrum", ...
    std::map<std::string, double> totals;                // "onoise_total", ...
};

inline NoiseRun run_noise(const std::string& deck_path, ScaleFactors factors,
                          const std::string& card, const TempDir& dir, const std::string& name) {
    Deck deck = load_deck(deck_path, DiskFileSystem{});
    std::vector<std::string> cards = simulation_cards(deck, SimDeckOptions{card, "", 1, factors});
    cards.pop_back();  // .end
    std::string spectra = dir.file(name + "_spectra.txt");
    std::string body;
    for (const auto& c : cards) body += c + "\n";
    body +=
        ".control\nset numdgt=15\nset wr_vecnames\nset wr_singlescale\nrun\nsetplot noise1\n"
        "wrdata " +
        spectra + " all\nsetplot noise2\nprint all\nquit 0\n.endc\n.end\n";
    write_bytes(dir.file(name + ".cir"), body);
    // In the scratch directory: BSIM models write a check log into the current directory.
    std::string log = dir.file(name + ".log");
    std::string cmd = "cd " + shell_quote(dir.file("")) + " && " + ngspice_batch() +
                      shell_quote(dir.file(name + ".cir")) + " >" + shell_quote(log) + " 2>&1";
    EXPECT_EQ(std::system(cmd.c_str()), 0) << read_bytes(log);
    NoiseRun r;
    std::istringstream in(read_bytes(spectra));
    std::string line;
    std::vector<std::string> names;
    if (std::getline(in, line)) {
        std::istringstream h(line);
        for (std::string n; h >> n;) names.push_back(n);
    }
    // `wrdata ... all` writes the frequency once as the scale and once as a vector.
    std::vector<bool> first(names.size());
    for (std::size_t i = 0; i < names.size(); ++i)
        first[i] = std::find(names.begin(), names.begin() + i, names[i]) == names.begin() + i;
    while (std::getline(in, line)) {
        std::istringstream f(line);
        double x;
        for (std::size_t i = 0; i < names.size() && f >> x; ++i)
            if (first[i]) r.spectra[names[i]].push_back(x);
    }
    // print's "name = value" lines of the integrated plot.
    std::istringstream out(read_bytes(log));
    while (std::getline(out, line)) {
        auto eq = line.find(" = ");
        if (eq == std::string::npos || line.find("total") == std::string::npos) continue;
        r.totals[line.substr(0, eq)] = std::stod(line.substr(eq + 3));
    }
    EXPECT_FALSE(r.spectra.empty()) << read_bytes(log);
    EXPECT_FALSE(r.totals.empty()) << read_bytes(log);
    return r;
}

}  // namespace deckscale::test
