// deckscale: a shim that parses the command line, runs one command, returns its exit code.
#include <iostream>
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

int main(int argc, char** argv) {
    using namespace deckscale;
    install_interrupt_cleanup();
    std::vector<std::string> args(argv + 1, argv + argc);
    Invocation inv = parse_command_line(args);
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
