#include "python/interrupt.hpp"

#include <utility>

namespace deckscale::python {
namespace {

thread_local bool tripped = false;

// Runs Python's signal handlers (on the main thread; elsewhere they run later): SIGINT's
// default one sets KeyboardInterrupt, kept here as `tripped` and raised after the call.
bool python_signal() {
    if (tripped) return true;
    pybind11::gil_scoped_acquire held;
    if (PyErr_CheckSignals() != 0) {
        PyErr_Clear();
        tripped = true;
    }
    return tripped;
}

}  // namespace

// The check is first asked once the call simulates, after `tripped` is reset here.
Simulating::Simulating() : released_(), scope_(python_signal) { tripped = false; }

void raise_if_interrupted() {
    if (!std::exchange(tripped, false)) return;
    PyErr_SetNone(PyExc_KeyboardInterrupt);
    throw pybind11::error_already_set();
}

}  // namespace deckscale::python
