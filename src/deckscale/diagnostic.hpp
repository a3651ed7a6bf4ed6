// The one diagnostic type, as part of the library's public surface (Diagnostic, DeckError,
// render). In the tree it lives in deck/diagnostic.hpp; `cmake --install` puts that file here
// under this name, so it must keep including standard headers only (tests/layers_test.cpp).
#pragma once

#include "deck/diagnostic.hpp"
