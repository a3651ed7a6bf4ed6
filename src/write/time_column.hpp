// The time column of d_source's input file, rewritten for a frequency change. d_source has no
// time-scale parameter: its times live in the file (shared notes "codemodel-rules.md" §3,
// "write a new file"), read by ngspice 39's src/xspice/icm/digital/d_source/cfunc.mod:
// lines are read with fgets into 200 bytes; a line whose first non-blank byte after any
// blanks and '*' is the end is skipped, one starting with '*' is a comment, every other line
// holds a time and one state per output bit, separated by blanks, '=', '(', ')' or ','. The
// time is read by cnv_get_spice_value: the bytes up to the first letter other than e/E as a
// C number, scaled by that letter (t g k u n p f, m, meg, mil; any other letter: 1).
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace deckscale {

// `text` with the time of every data line multiplied by `factor` and written with `digits`
// significant digits (more where fewer would make two times equal), every other byte as it
// was. Null with `why` (naming the 1-based line) when a time cannot be read, the times do not
// increase, or a line would not fit d_source's 200-byte line buffer.
std::optional<std::string> scale_time_column(std::string_view text, double factor, int digits,
                                             std::string& why);

}  // namespace deckscale
