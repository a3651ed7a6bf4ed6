// Verifying a pair of deck texts with the factors given, as the verify tests do.
#pragma once

#include <string>

#include "support/common.hpp"
#include "verify/pair.hpp"

namespace deckscale::test {

// Writes both decks to a temporary folder and verifies them at Km, Kf.
inline PairVerification verify_texts(const std::string& original, const std::string& scaled,
                                     double km, double kf) {
    TempDir dir;
    write_bytes(dir.file("o.cir"), original);
    write_bytes(dir.file("s.cir"), scaled);
    PairRequest r;
    r.original = dir.file("o.cir");
    r.scaled = dir.file("s.cir");
    r.factors_given = true;
    r.km = km;
    r.kf = kf;
    DiskFileSystem disk;
    return verify_pair(r, disk);
}

}  // namespace deckscale::test
