// deckscale: a shim that parses the command line, runs one command, returns its exit code.
#include <iostream>
#include <new>
#include <stdexcept>
#include <string>
#include <vector>

#include "cli/batch_command.hpp"
#include "cli/exit_codes.hpp"
#include "cli/interrupts.hpp"
#include "cli/options.hpp"
#include "cli/retarget_command.hpp"
#include "cli/scale_command.hpp"
#include "cli/snap_command.hpp"
#include "cli/verify_command.hpp"
#include "cli/stress_command.hpp"
#include "cli/yield_command.hpp"

namespace {

int run(const deckscale::Invocation& inv) {
    using namespace deckscale;
    switch (inv.what) {
        case Invocation::What::help:
        case Invocation::What::version:
            std::cout << inv.text;
            return exit_ok;
        case Invocation::What::usage_error:
            std::cerr << "deckscale: error: " << inv.text << "\n"
                      << "Run 'deckscale --help' for usage.\n";
            return exit_bad_input;
        case Invocation::What::scale:
            return run_scale(inv.scale, std::cout, std::cerr);
        case Invocation::What::verify:
            return run_verify(inv.verify, std::cout, std::cerr);
        case Invocation::What::yield:
            return run_yield_command(inv.yield, std::cout, std::cerr);
        case Invocation::What::stress:
            return run_stress_command(inv.stress, std::cout, std::cerr);
        case Invocation::What::retarget:
            return run_retarget(inv.retarget, std::cout, std::cerr);
        case Invocation::What::snap:
            return run_snap(inv.snap, std::cout, std::cerr);
        case Invocation::What::batch:
            return run_batch(inv.batch, std::cout, std::cerr);
    }
    return exit_bad_input;
}

}  // namespace

// Bad input never reaches the handlers below: it is a diagnostic with exit 2. What does is a
// bug or exhausted memory; unwinding (not std::terminate) lets every unfinished output remove
// its temporary file, so the user's files are as they were.
int main(int argc, char** argv) {
    using namespace deckscale;
    install_interrupt_cleanup();
    try {
        std::vector<std::string> args(argv + 1, argv + argc);
        return run(parse_command_line(args));
    } catch (const std::bad_alloc&) {
        std::cerr << "deckscale: error: out of memory; nothing was written\n";
    } catch (const std::exception& e) {
        std::cerr << "deckscale: internal error: " << e.what()
                  << "\nThis is a bug in deckscale, not in your deck; nothing was written. "
                     "Please report it with the deck and the command line.\n";
    }
    return exit_internal;
}
