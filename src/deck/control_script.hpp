// The commands of a .control block, split the way ngspice 39 splits them before it runs them
// (manual 17.4.1, 17.5.10; shared notes "control-and-sweeps.md" A.1): one command per line,
// several per line when separated by ';', a '+' line continues the command before it, '*'
// lines and '$ ' to the line end are comments. Words are spans into the file, so a rewrite
// lands on exactly the bytes of one number.
#pragma once

#include <cstdint>
#include <string_view>
#include <vector>

#include "deck/card.hpp"
#include "deck/source_file.hpp"

namespace deckscale {

struct ControlCommand {
    // The command's tokens from its first word to its last, trivia included ('+' marks are
    // continuation tokens, comments comment tokens); fields are the non-trivia ones: words,
    // '=', '(', ')', ',' and "strings" as in a dot card.
    std::vector<Token> tokens;
    std::vector<Token> fields;
    std::uint32_t line_begin = 0;  // offset of the line on which the command starts

    // The command as a dot card of the file (valid while this command lives).
    Card as_card(const SourceFile& file) const {
        return Card{CardKind::dot, &file, tokens, fields};
    }
};

// The TokenKind::control token of a control card, or nullptr.
const Token* control_token(const Card& card);

// The commands of `block` (a TokenKind::control token of `file`), in file order, without the
// .control and .endc lines. Empty commands (blank lines, comments, a trailing ';') are left out.
std::vector<ControlCommand> control_commands(const SourceFile& file, const Token& block);

// The offset (into `word`) of the first numeric literal inside a word of an expression
// ("2*pi*frequency" -> 0, "v(a)/1k" -> 5 when read as one word), or npos when there is none.
// A literal starts with a digit, or a '.' before a digit, not preceded by a letter, digit,
// '_' or '#' (so "v2", "out_3" and "n#2" hold none).
std::size_t first_literal(std::string_view word);

}  // namespace deckscale
