// Judging ngspice's output: which printed lines mean the deck was rejected or a run failed,
// and what to quote. Pure functions on text; internal to the sim module.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace deckscale {

// One line as ngspice printed it, without the "stdout "/"stderr " channel prefix.
struct PrintedLine {
    std::string text;
    bool to_stderr = false;
};

// The line reports an error: it contains "Error", "ERROR", "Fatal error", "aborted",
// "not parsed" or "cannot recover", and is no measurement's error.
bool is_error_line(std::string_view line);

// The line reports that a .meas card gave no result. That is no failed run: verification
// compares the measurements of both runs (verify/meas_compare.hpp), and one that fails in
// one run only fails there.
bool is_measure_error(std::string_view line);

// The line is a warning that means the simulated circuit is not the deck as written
// (a resistor without a value set to 1 mOhm, a model that cannot be found).
bool is_substitution_warning(std::string_view line);

// ngspice's progress talk while it fights for convergence (gmin and source stepping, notes):
// never quoted.
bool is_chatter(std::string_view line);

// Some line of lines[first, last) is a substitution warning or (with `errors`) an error line.
bool any_problem(const std::vector<PrintedLine>& lines, std::size_t first, std::size_t last,
                 bool errors);

// Lines worth quoting from lines[first, last): every error line and substitution warning and
// every other line ngspice sent to stderr except chatter, without immediate repetitions, at
// most a dozen; joined with '\n'. Empty if there are none.
std::string quote_problems(const std::vector<PrintedLine>& lines, std::size_t first,
                           std::size_t last);

// Removes ngspice's channel prefix and any trailing '\r' or '\n'.
PrintedLine strip_channel(std::string_view raw);

// The title ngspice gives the circuit: the text of the last ".title" card if there is one
// (ngspice lets it replace the first line), else the first card.
std::string expected_title(const std::vector<std::string>& cards);

// Plot titles are the deck's title as ngspice stored it: compared without case and without
// surrounding white space.
bool same_title(std::string_view sent, std::string_view reported);

}  // namespace deckscale
