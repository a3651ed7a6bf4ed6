// The JUnit XML form of a batch report (the format CI systems read), written with pugixml:
// <testsuites> holding one <testsuite> per suite and one <testcase> per case. A case that
// did not meet its expectation carries <failure> (the comparison found a difference, or
// none when one was expected) or <error> (refused, unreadable, simulation failed), whose
// message names the worst vector and its error. Times are in seconds.
#pragma once

#include <string>

#include "batch/report.hpp"

namespace deckscale {

std::string junit_xml(const BatchReport& r);

}  // namespace deckscale
