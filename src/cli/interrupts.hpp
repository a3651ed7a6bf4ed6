// What the command line does when it is interrupted or a write hits a file-size limit.
#pragma once

namespace deckscale {

// SIGINT, SIGTERM, SIGHUP and SIGQUIT remove the temporary files of outputs not yet renamed
// into place and then end the process as the signal would have; SIGXFSZ (a file-size limit
// such as `ulimit -f`) is ignored so that the write fails with an error the run reports and
// cleans up after, instead of killing the process mid-file.
void install_interrupt_cleanup();

}  // namespace deckscale
