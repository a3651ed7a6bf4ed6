// Data files that a deck's code models read by a relative path: filesource's `file`,
// d_source's `input_file`, d_state's `state_file`, table2d's and table3d's `file`. ngspice
// looks for them from the folder it runs in, and verify runs each deck in its own folder: a
// scaled deck written to another folder than the original finds them no more (the shared
// notes' filesource deck: "Transient op failed, timestep too small", nothing about a file).
#pragma once

#include <string>
#include <vector>

#include "base/file_system.hpp"
#include "deck/diagnostic.hpp"
#include "deck/load.hpp"

namespace deckscale {

// A note at each such path that can be read beside the original deck but not beside
// `output` (the main output's path; "" for standard output: no notes).
std::vector<Diagnostic> data_files_left_behind(const Deck& deck, const std::string& original,
                                               const std::string& output,
                                               const FileSystem& fs);

}  // namespace deckscale
