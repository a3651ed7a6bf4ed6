// Ctrl-C during a call that simulates. Such a call runs with the interpreter released, so
// Python's SIGINT handler cannot run until it returns (a long verification went on to its
// end). While a `Simulating` scope lives, the simulation loop (sim/interrupt) asks about once a
// second, briefly taking the interpreter back, whether a signal arrived; if so every running
// simulation is killed and the rest end at once. After the scope, raise_if_interrupted()
// raises the KeyboardInterrupt.
#pragma once

#include <pybind11/pybind11.h>

#include "sim/interrupt.hpp"

namespace deckscale::python {

class Simulating {
public:
    Simulating();

private:
    pybind11::gil_scoped_release released_;  // first released, last taken back
    InterruptScope scope_;
};

// Raises KeyboardInterrupt if Ctrl-C stopped the last Simulating scope of this thread.
void raise_if_interrupted();

}  // namespace deckscale::python
