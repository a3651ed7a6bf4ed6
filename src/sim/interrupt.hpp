// Stopping simulations on request: Ctrl-C in the Python module, where the calling thread sits
// in the simulation loop with Python's interpreter released and Python's own handler cannot
// run. A caller installs a check for its thread; the simulation loop on that thread asks it
// at least once a second, and once it says yes, every running child is killed (its whole
// process group) and every job not yet done ends as `interrupted`, at once, also in later
// calls while the check is installed. The command line installs none: SIGINT ends the tool,
// and its children end with it (sim/process).
#pragma once

#include <functional>

namespace deckscale {

class InterruptScope {
public:
    // `check` is called on this thread only, and answers whether to stop.
    explicit InterruptScope(std::function<bool()> check);
    ~InterruptScope();
    InterruptScope(const InterruptScope&) = delete;
    InterruptScope& operator=(const InterruptScope&) = delete;

private:
    std::function<bool()> previous_;
};

// Whether this thread's check asks to stop (false without one).
bool interrupt_requested();

}  // namespace deckscale
