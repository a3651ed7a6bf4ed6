// The Python module `deckscale`: the command line's work as functions. Reading, scaling,
// writing and verifying go through the library's public surface (src/deckscale); the other
// commands wrap their stage's entry point (python/commands.cpp). Long calls release the GIL.
#include <pybind11/pybind11.h>
#include <pybind11/stl.h>

#include "deckscale/scale.hpp"
#include "deckscale/verify.hpp"
#include "python/commands.hpp"
#include "python/convert.hpp"
#include "python/interrupt.hpp"

namespace deckscale::python {
namespace {

using namespace pybind11::literals;

py::object scale(py::handle deck, py::handle km, py::handle kf, py::object output, bool write,
                 bool flatten, int digits, bool leave_unscalable, unsigned threads) {
    api::ScaleOptions o;
    o.km = factor_of(km);
    o.kf = factor_of(kf);
    o.output = output.is_none() ? "" : path_of(output);
    o.flatten = flatten;
    o.digits = digits;
    o.leave_unscalable = leave_unscalable;
    o.threads = threads;
    bool given = py::isinstance<api::Deck>(deck);
    std::optional<api::Deck> read = given ? std::optional(deck.cast<api::Deck>()) : std::nullopt;
    std::string path = given ? "" : path_of(deck);
    api::Scaled s;
    {
        py::gil_scoped_release unlocked;
        s = read ? api::scale(*read, o) : api::scale_file(path, o);
        if (write && !o.output.empty() && !s.refused()) api::write(s);
    }
    return py::cast(std::move(s));
}

// The vectors of one comparison as columns, in the report's order (worst first).
py::dict error_columns(const api::AnalysisComparison& a) {
    py::list names, kinds, quantities;
    std::vector<double> worst, at, db, deg, peak, original_value, scaled_value;
    std::vector<bool> passed, gmin_level;
    for (const auto& v : a.vectors) {
        names.append(v.name);
        kinds.append(v.kind);
        worst.push_back(v.worst);
        at.push_back(v.at);
        db.push_back(v.db_error);
        deg.push_back(v.deg_error);
        peak.push_back(v.peak);
        passed.push_back(v.passed);
        gmin_level.push_back(v.gmin_level);
        original_value.push_back(v.original_value);
        scaled_value.push_back(v.scaled_value);
        quantities.append(v.quantity);
    }
    return py::dict("name"_a = names, "kind"_a = kinds, "worst"_a = array_of(worst),
                    "at"_a = array_of(at), "db_error"_a = array_of(db),
                    "deg_error"_a = array_of(deg), "peak"_a = array_of(peak),
                    "passed"_a = array_of(passed), "gmin_level"_a = array_of(gmin_level),
                    "original_value"_a = array_of(original_value),
                    "scaled_value"_a = array_of(scaled_value), "quantity"_a = quantities);
}

api::Deck pair_member(py::handle x) {
    if (py::isinstance<api::Scaled>(x)) return api::scaled_deck(x.cast<const api::Scaled&>());
    return deck_of(x);
}

py::dict verify(py::handle original, py::handle scaled, py::object km, py::object kf,
                py::object sweep, py::object drive, double tolerance, double tran_tolerance,
                double tolerance_db, double tolerance_deg, double timeout,
                std::uint64_t memory_mb, double max_step) {
    api::VerifyOptions o;
    if (!km.is_none()) o.km = factor_of(km);
    if (!kf.is_none()) o.kf = factor_of(kf);
    o.sweep = sweep_of(sweep);
    o.drive = drive.is_none() ? "" : drive.cast<std::string>();
    o.tolerance = tolerance;
    o.tran_tolerance = tran_tolerance;
    o.tolerance_db = tolerance_db;
    o.tolerance_deg = tolerance_deg;
    o.timeout_s = timeout;
    o.memory_mb = memory_mb;
    o.max_step = max_step;
    api::Deck a = pair_member(original), b = pair_member(scaled);
    api::Verification v;
    {
        Simulating unlocked;
        v = api::verify(a, b, o);
    }
    raise_if_interrupted();
    return verification_dict(v);
}

}  // namespace

py::dict verification_dict(const api::Verification& v) {
    using Outcome = api::Verification::Outcome;
    if (v.outcome == Outcome::bad_input) {
        std::string why;
        for (const auto& p : v.problems) why += (why.empty() ? "" : "; ") + p;
        raise_request_error(why);
    }
    py::list failures;
    for (const auto& f : v.failures)
        failures.append(py::dict("deck"_a = f.deck, "analysis"_a = f.analysis,
                                 "status"_a = f.status, "message"_a = f.message));
    py::dict d;
    if (v.outcome == Outcome::compared) {
        d = from_json(v.json);
        py::list analyses = d["analyses"];
        for (std::size_t i = 0; i < v.analyses.size(); ++i)
            analyses[i]["errors"] = error_columns(v.analyses[i]);
        d["text"] = v.text;
    } else {
        d["passed"] = false;
    }
    d["outcome"] = v.outcome == Outcome::compared ? "compared" : "sim_failed";
    d["problems"] = v.problems;
    d["failures"] = failures;
    return d;
}

}  // namespace deckscale::python

PYBIND11_MODULE(deckscale, m) {
    using namespace deckscale;
    using namespace deckscale::python;
    m.doc() =
        "deckscale: rescale SPICE decks by an impedance factor Km and a frequency factor Kf, "
        "keeping every other byte, and prove the result equivalent in embedded ngspice.";
    m.attr("__version__") = api::version();
    register_deck_error(m);

    py::class_<api::Deck>(m, "Deck", "A deck as read: the top file and every file it includes.")
        .def_property_readonly("path", &api::Deck::path)
        .def_property_readonly("files", &api::Deck::files)
        .def(
            "text", [](const api::Deck& d, std::size_t file) { return text_of(d.text(file)); },
            "file"_a = 0, "A file's text as read (UTF-8, other bytes as surrogate escapes).")
        .def(
            "data",
            [](const api::Deck& d, std::size_t file) {
                return py::bytes(std::string(d.text(file)));
            },
            "file"_a = 0, "A file's bytes as read.")
        .def_property_readonly("warnings", &api::Deck::warnings)
        .def("__repr__", [](const api::Deck& d) { return "<deckscale.Deck " + d.path() + ">"; });
    m.def(
        "read_deck", [](py::handle path) { return api::read_deck(path_of(path)); }, "path"_a,
        "Reads a deck and everything it includes; DeckError for bad input.");
    m.def(
        "read_text",
        [](py::handle text, py::handle name) {
            return api::read_text(text_bytes(text), path_of(name));
        },
        "text"_a, "name"_a = "deck.cir",
        "Reads a deck given as text, standing for the file `name` (includes are looked up in "
        "its folder).");
    m.def("parse_factor", &api::parse_factor, "text"_a,
          "A factor as the command line reads it: '50', '1k', '2*pi*10meg', '1/50'.");

    py::class_<api::ValueChange>(m, "Change", "One rewritten value.")
        .def_readonly("file", &api::ValueChange::file)
        .def_readonly("line", &api::ValueChange::line)
        .def_readonly("column", &api::ValueChange::column)
        .def_readonly("element", &api::ValueChange::element)
        .def_readonly("field", &api::ValueChange::field)
        .def_readonly("unit", &api::ValueChange::unit)
        .def_readonly("old", &api::ValueChange::old_text)
        .def_readonly("new", &api::ValueChange::new_text)
        .def_readonly("factor", &api::ValueChange::factor)
        .def("__repr__", [](const api::ValueChange& c) {
            return "<Change " + c.element + " " + c.field + " " + c.old_text + " -> " + c.new_text +
                   ">";
        });
    py::class_<api::OutputText>(m, "OutputFile", "One file a scaling run writes.")
        .def_readonly("path", &api::OutputText::path)
        .def_readonly("source", &api::OutputText::source)
        .def_property_readonly("text", [](const api::OutputText& f) { return text_of(f.text); })
        .def_property_readonly("data", [](const api::OutputText& f) { return py::bytes(f.text); })
        .def("__repr__", [](const api::OutputText& f) { return "<OutputFile " + f.path + ">"; });
    py::class_<api::Scaled>(m, "ScaleResult",
                            "What scale() made: every output file's text (included copies "
                            "first, the main deck last), the changes and the refusals.")
        .def_readonly("files", &api::Scaled::files)
        .def_property_readonly("text",
                               [](const api::Scaled& s) -> py::object {
                                   if (s.files.empty()) return py::none();
                                   return text_of(s.text());
                               })
        .def_readonly("changes", &api::Scaled::changes)
        .def_readonly("refusals", &api::Scaled::refusals)
        .def_readonly("notes", &api::Scaled::notes)
        .def_readonly("warnings", &api::Scaled::warnings)
        .def_property_readonly("refused", &api::Scaled::refused)
        .def_readonly("changes_text", &api::Scaled::changes_text)
        .def_readonly("changes_json", &api::Scaled::changes_json)
        .def_readonly("cautions", &api::Scaled::cautions)
        .def("deck", &api::scaled_deck,
             "The output as a Deck in memory (verify it before writing anything).")
        .def("write", &api::write, py::call_guard<py::gil_scoped_release>(),
             "Writes every output file atomically (all or none); never over an input file.");

    m.def("scale", &scale, "deck"_a, "km"_a = 1.0, "kf"_a = 1.0, py::kw_only(),
          "output"_a = py::none(), "write"_a = true, "flatten"_a = false, "digits"_a = 9,
          "leave_unscalable"_a = false, "threads"_a = 0,
          "Scales a deck (a path or a Deck) by Km and Kf. With `output` the files are written "
          "there (unless write=False or the run is refused); the input is never changed.");
    m.def("write", &api::write, "result"_a, py::call_guard<py::gil_scoped_release>(),
          "Writes a ScaleResult's files atomically (all or none).");
    m.def("verify", &verify, "original"_a, "scaled"_a, "km"_a = py::none(), "kf"_a = py::none(),
          py::kw_only(), "sweep"_a = py::none(), "drive"_a = py::none(), "tolerance"_a = 1e-6,
          "tran_tolerance"_a = 1e-3, "tolerance_db"_a = 0.0, "tolerance_deg"_a = 0.0,
          "timeout"_a = 60.0, "memory_mb"_a = 8192, "max_step"_a = 0.0,
          "Simulates both decks (paths, Decks or a ScaleResult) and compares every vector; "
          "returns the report as a dict (the --json report, 'text', 'outcome', and per analysis "
          "'errors': the vectors' errors as columns).");
    add_commands(m);
}
