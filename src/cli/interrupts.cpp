#include "cli/interrupts.hpp"

#include <signal.h>

#include "base/output_file.hpp"

namespace deckscale {

namespace {

void on_interrupt(int sig) {
    remove_unfinished_outputs();
    ::signal(sig, SIG_DFL);  // then die of the signal, so the caller sees what happened
    ::raise(sig);
}

}  // namespace

void install_interrupt_cleanup() {
    struct sigaction sa {};
    sa.sa_handler = on_interrupt;
    sigemptyset(&sa.sa_mask);
    for (int sig : {SIGINT, SIGTERM, SIGHUP, SIGQUIT}) ::sigaction(sig, &sa, nullptr);
    ::signal(SIGXFSZ, SIG_IGN);
}

}  // namespace deckscale
