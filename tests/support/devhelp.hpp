// What ngspice 39's `devhelp <name>` prints for each name, run in batch mode, as the tests
// that hold a rule table against ngspice's own parameter lists read it.
#pragma once

#include <cstdlib>
#include <string>
#include <vector>

#include "support/common.hpp"

namespace deckscale::test {

// The listing of `devhelp` for every name, one after another: per name a "<name> - <what>"
// line, then "Model Parameters" and "Instance Parameters", each with a header and
// "<id> <name> <dir> <description>" rows.
inline std::string devhelp_listing(const std::vector<std::string>& names) {
    TempDir dir;
    std::string deck = "devhelp\n.control\n";
    for (const auto& n : names) deck += "devhelp " + n + "\n";
    deck += ".endc\n.end\n";
    write_bytes(dir.file("devhelp.cir"), deck);
    std::string cmd = ngspice_batch() + shell_quote(dir.file("devhelp.cir")) + " >" +
                      shell_quote(dir.file("devhelp.log")) + " 2>/dev/null";
    // Exit status not checked: ngspice -b may return 1 after a good run (codemodel-rules.md
    // pitfall 13); the caller checks the listing.
    (void)std::system(cmd.c_str());
    return read_bytes(dir.file("devhelp.log"));
}

}  // namespace deckscale::test
