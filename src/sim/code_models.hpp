// Whether a deck needs ngspice's XSPICE code models, and an init script that does not load
// them. Loading the six code-model libraries is a third of ngspice's initialisation (six more
// dlopens); most decks use none. Pure functions on text; internal to the sim module.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace deckscale {

// True unless the cards certainly use no code model. Conservative: an 'A' (XSPICE) or 'U'
// element, the word POLY (translated to the spice2poly model), TABLE (E/G tables become code-
// model devices), LAPLACE or FREQ (translated by compatibility modes), or a .model of a type
// ngspice does not build in each count as use.
// A wrong "false" makes ngspice reject the deck (unknown device or model), never pass it.
bool needs_code_models(const std::vector<std::string>& cards);

// The init script `spinit` without its "codemodel" commands; every other line is kept.
std::string without_code_models(std::string_view spinit);

// Where ngspice 39 reads its init script: $SPICE_SCRIPTS, else $SPICE_LIB_DIR/scripts, else
// the directory it was built with (/usr/share/ngspice/scripts in Debian's build).
std::string spinit_dir();

// The init script ngspice would read, without its codemodel commands; "" if it cannot be
// read (ngspice is then left to read its own).
std::string spinit_without_code_models();

}  // namespace deckscale
