// Shared by the module's files: Python arguments to the library's types, and results to
// Python objects (numpy arrays when numpy can be imported, lists otherwise).
#pragma once

#include <pybind11/pybind11.h>

#include <string>
#include <string_view>
#include <vector>

#include "deck/diagnostic.hpp"
#include "deckscale/deck.hpp"

namespace deckscale::python {

namespace py = pybind11;

// Makes deckscale.DeckError and turns every DeckError into it (file, line, column, severity,
// message, rendered, diagnostic; str() is the rendered text).
void register_deck_error(py::module_& m);

// A DeckError about the call rather than a place in a file.
[[noreturn]] void raise_request_error(const std::string& message);

// os.fspath(x) as a string (str, bytes or path-like).
std::string path_of(py::handle x);

// A Deck object, or a path (read with read_deck).
api::Deck deck_of(py::handle x);

// A number, or a factor as the command line writes it ("2*pi*10meg").
double factor_of(py::handle x);

// None: no sweep; "dec 50 1k 1meg" or ["dec", 50, "1k", "1meg"]: its words.
std::vector<std::string> sweep_of(py::handle x);

// numpy.asarray(values) when numpy is there, else a list.
py::object array_of(const std::vector<double>& values);
py::object array_of(const std::vector<bool>& values);

// Deck bytes as str, decoded as UTF-8 with surrogate escapes (other bytes survive a round
// trip through text_bytes), and back: str (encoded the same way) or bytes.
py::str text_of(std::string_view bytes);
std::string text_bytes(py::handle text);

// The library's JSON text as Python objects (json.loads).
py::object from_json(const std::string& text);

py::list diagnostics(const std::vector<Diagnostic>& ds);

}  // namespace deckscale::python
