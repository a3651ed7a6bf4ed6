// Turning a scaled deck into output files: the main deck, copies of included files that
// changed (written beside the output deck, include lines repointed), or one flattened deck.
#pragma once

#include <string>
#include <vector>

#include "deck.hpp"
#include "scaler.hpp"

namespace deckscale {

struct OutputFile {
    std::string path;     // where to write ("" = standard output)
    std::string content;
    std::size_t source_file = 0;  // index into Deck::files
};

struct OutputPlan {
    std::vector<OutputFile> files;  // included copies first, the main deck last
};

// `output` is the main deck's path ("" for standard output). Throws DeckError when the
// deck cannot be written that way (changed includes with standard output).
OutputPlan plan_output(const Deck& deck, const ScaleResult& result, const std::string& output,
                       bool flatten);

// The name of the copy of an included file: "<stem>-scaled<ext>".
std::string scaled_copy_name(const std::string& original_path);

}  // namespace deckscale
