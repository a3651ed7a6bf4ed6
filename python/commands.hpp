// The module's functions beyond scale and verify: preferred values and snapping, retarget,
// tolerance yield, part stress, regression suites and surveys. Each wraps its stage's entry
// point and returns what the command's --json report holds, as Python objects.
#pragma once

#include <pybind11/pybind11.h>

#include "deckscale/verify.hpp"

namespace deckscale::python {

namespace py = pybind11;

void add_commands(py::module_& m);

// A verification as a dict: the --json report with 'text', 'outcome', 'problems', 'failures'
// and per analysis 'errors' (the vectors' errors as columns). Raises DeckError for bad input.
py::dict verification_dict(const api::Verification& v);

}  // namespace deckscale::python
