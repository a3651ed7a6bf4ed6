#include "python/convert.hpp"

#include <pybind11/stl.h>

#include <sstream>

namespace deckscale::python {

using namespace pybind11::literals;
namespace {

// The exception type, made once at import and kept for the life of the interpreter.
PyObject* deck_error_type = nullptr;

const char* severity_name(Severity s) {
    switch (s) {
        case Severity::note:
            return "note";
        case Severity::warning:
            return "warning";
        case Severity::error:
            break;
    }
    return "error";
}

void raise_deck_error(const Diagnostic& d) {
    std::string rendered = render(d);
    while (!rendered.empty() && rendered.back() == '\n') rendered.pop_back();
    py::object error = py::reinterpret_borrow<py::object>(deck_error_type)(text_of(rendered));
    error.attr("file") = text_of(d.file);
    error.attr("line") = d.line;
    error.attr("column") = d.column;
    error.attr("severity") = severity_name(d.severity);
    error.attr("message") = text_of(d.message);
    error.attr("rendered") = text_of(rendered);
    error.attr("diagnostic") = py::cast(d);
    PyErr_SetObject(deck_error_type, error.ptr());
}

// numpy, looked up once (null without it: not an error). The reference is kept for the life
// of the process: a static py::object would be released after the interpreter has ended.
py::handle numpy() {
    static py::handle np = []() -> py::handle {
        try {
            return py::module_::import("numpy").release();
        } catch (const py::error_already_set&) {
            return py::handle();
        }
    }();
    return np;
}

}  // namespace

void register_deck_error(py::module_& m) {
    py::class_<Diagnostic>(m, "Diagnostic",
                           "One message about a deck: severity, place, text (the one diagnostic "
                           "type of the command line).")
        .def_property_readonly("severity",
                               [](const Diagnostic& d) { return severity_name(d.severity); })
        .def_property_readonly("file", [](const Diagnostic& d) { return text_of(d.file); })
        .def_readonly("line", &Diagnostic::line)
        .def_readonly("column", &Diagnostic::column)
        .def_property_readonly("message", [](const Diagnostic& d) { return text_of(d.message); })
        .def_property_readonly("source_line",
                               [](const Diagnostic& d) { return text_of(d.source_line); })
        .def_readonly("notes", &Diagnostic::notes)
        .def_property_readonly("rendered", [](const Diagnostic& d) { return text_of(render(d)); })
        .def("__str__", [](const Diagnostic& d) { return text_of(render(d)); })
        .def("__repr__", [](const Diagnostic& d) {
            return text_of("<Diagnostic " + d.file + ":" + std::to_string(d.line) + ":" +
                           std::to_string(d.column) + ": " + severity_name(d.severity) + ": " +
                           d.message + ">");
        });
    deck_error_type = PyErr_NewExceptionWithDoc(
        "deckscale.DeckError",
        "Bad input: the deck, a suite or the arguments. Attributes: file, line, column (0 when "
        "not tied to a place), severity, message, rendered (as the command line prints it, "
        "with the source line), diagnostic.",
        PyExc_Exception, nullptr);
    m.add_object("DeckError", py::handle(deck_error_type));
    py::register_exception_translator([](std::exception_ptr p) {
        try {
            if (p) std::rethrow_exception(p);
        } catch (const DeckError& e) {
            raise_deck_error(e.diagnostic());
        }
    });
}

void raise_request_error(const std::string& message) {
    Diagnostic d;
    d.message = message;
    throw DeckError(d);
}

std::string path_of(py::handle x) {
    py::object p = py::module_::import("os").attr("fspath")(x);
    if (py::isinstance<py::bytes>(p)) return p.cast<std::string>();
    return p.cast<std::string>();
}

api::Deck deck_of(py::handle x) {
    if (py::isinstance<api::Deck>(x)) return x.cast<api::Deck>();
    return api::read_deck(path_of(x));
}

double factor_of(py::handle x) {
    if (py::isinstance<py::str>(x)) return api::parse_factor(x.cast<std::string>());
    return x.cast<double>();
}

std::vector<std::string> sweep_of(py::handle x) {
    std::vector<std::string> words;
    if (x.is_none()) return words;
    if (py::isinstance<py::str>(x)) {
        std::istringstream in(x.cast<std::string>());
        for (std::string w; in >> w;) words.push_back(w);
        return words;
    }
    for (py::handle w : x) words.push_back(py::str(w).cast<std::string>());
    return words;
}

py::object array_of(const std::vector<double>& values) {
    py::list list = py::cast(values);
    py::handle np = numpy();
    return np ? np.attr("asarray")(list, "dtype"_a = "float64") : py::object(list);
}

py::object array_of(const std::vector<bool>& values) {
    py::list list = py::cast(values);
    py::handle np = numpy();
    return np ? np.attr("asarray")(list, "dtype"_a = "bool") : py::object(list);
}

py::str text_of(std::string_view bytes) {
    PyObject* s = PyUnicode_DecodeUTF8(bytes.data(), static_cast<Py_ssize_t>(bytes.size()),
                                       "surrogateescape");
    if (!s) throw py::error_already_set();
    return py::reinterpret_steal<py::str>(s);
}

std::string text_bytes(py::handle text) {
    if (py::isinstance<py::bytes>(text)) return text.cast<std::string>();
    if (!py::isinstance<py::str>(text)) throw py::type_error("a deck's text must be str or bytes");
    PyObject* b = PyUnicode_AsEncodedString(text.ptr(), "utf-8", "surrogateescape");
    if (!b) throw py::error_already_set();
    return py::reinterpret_steal<py::bytes>(b).cast<std::string>();
}

py::object from_json(const std::string& text) {
    return py::module_::import("json").attr("loads")(text);
}

py::list diagnostics(const std::vector<Diagnostic>& ds) { return py::cast(ds); }

}  // namespace deckscale::python
