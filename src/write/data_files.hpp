// Data files that a deck's code models read by a relative path: filesource's `file`,
// d_source's `input_file`, d_state's `state_file`, table2d's and table3d's `file`. ngspice
// looks for them from the folder it runs in, and verify runs each deck in its own folder: a
// scaled deck written to another folder than the original finds them no more (the shared
// notes' filesource deck: "Transient op failed, timestep too small", nothing about a file).
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "base/file_system.hpp"
#include "deck/diagnostic.hpp"
#include "deck/load.hpp"
#include "write/plan.hpp"

namespace deckscale {

// A data file the scaled deck reads under a new name: d_source's input file with its time
// column multiplied by `time_factor` (write/time_column.hpp), written beside the output.
struct DataFileCopy {
    std::size_t file = 0;                // the .model card's file (Deck::files index)
    std::uint32_t offset = 0, size = 0;  // its value token, which now names `copy`
    std::string path;                    // as the original names it, without quotes
    std::string copy;                    // the copy's file name
    double time_factor = 1;
};

// A note at each such path that can be read beside the original deck but not beside
// `output` (the main output's path; "" for standard output: no notes), except at the value
// tokens of `copies` (those files are written there, rewritten).
std::vector<Diagnostic> data_files_left_behind(const Deck& deck, const std::string& original,
                                               const std::string& output, const FileSystem& fs,
                                               const std::vector<DataFileCopy>& copies = {});

// The copies as output files beside `output`, each read from the folder of the deck's top
// file (where ngspice runs) and rewritten. Throws DeckError at the value token naming it when
// it cannot be read or rewritten, when two copies would take one name, or when the deck goes
// to standard output (`output` empty).
std::vector<OutputFile> data_file_outputs(const Deck& deck, const std::vector<DataFileCopy>& copies,
                                          const std::string& output, const FileSystem& fs,
                                          int digits);

// Puts them into `plan`, before its main deck.
void add_data_files(OutputPlan& plan, std::vector<OutputFile> files);

}  // namespace deckscale
