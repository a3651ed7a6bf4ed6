// Running one case in this process: the rescaled deck made (flattened, in `scratch`, a folder
// the caller owns and removes) or taken from the suite, then the pair verified by verify_pair,
// whose simulations run in child processes of their own. Never prints, never throws for a bad deck:
// every problem becomes the case's outcome.
#pragma once

#include "base/file_system.hpp"
#include "batch/case_result.hpp"
#include "batch/suite.hpp"
#include "verify/report.hpp"

namespace deckscale {

CaseResult run_case(const SuiteCase& c, const FileSystem& fs, const std::string& scratch);

// "ac v(n2): relative error 3.1e-03 at 1.59e+07 (tolerance 1e-06)": the vector furthest
// beyond (or closest to) its tolerance; "" without compared vectors.
std::string worst_vector(const VerifyReport& report);

}  // namespace deckscale
