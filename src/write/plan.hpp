// Turning an edited deck into output files: the main deck, copies of included files that
// changed (written beside the output deck, include lines repointed), or one flattened deck.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "base/byte_sink.hpp"
#include "deck/load.hpp"
#include "write/edit.hpp"

namespace deckscale {

struct OutputFile {
    std::string path;             // where to write ("" = standard output)
    std::size_t source_file = 0;  // index into Deck::files
    bool flattened = false;       // then `content` holds the whole deck
    std::string content;
    std::string origin;  // a data file's copy (write/data_files.hpp): what it was read from,
                         // and `content` holds it
};

struct OutputPlan {
    std::vector<EditSet> edits;     // per Deck::files entry, include lines repointed
    std::vector<OutputFile> files;  // included copies first, the main deck last
    bool parallel = true;           // a large file's second half is produced on a thread
};

// `edits` are the scaling pass's (one per Deck::files entry); `output` is the main deck's
// path ("" for standard output); a changed include's copy is named with `copy_suffix`
// (scaled_copy_name). Throws DeckError when the deck cannot be written that way (changed
// includes with standard output).
OutputPlan plan_output(const Deck& deck, std::vector<EditSet> edits, const std::string& output,
                       bool flatten, std::string_view copy_suffix = "-scaled");

// Hands the bytes of one planned file to `sink`, in pieces.
void produce_output(const Deck& deck, const OutputPlan& plan, const OutputFile& file,
                    ByteSink& sink);

// The name of the copy of an included file: "<stem>-scaled<ext>" (snap's: "-snapped").
std::string scaled_copy_name(const std::string& original_path,
                             std::string_view suffix = "-scaled");

}  // namespace deckscale
