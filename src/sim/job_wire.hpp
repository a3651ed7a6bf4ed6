// A job as the parent hands it to a simulator process that was started before the job was
// known (sim/head_start.hpp): the work directory (a u32 length and its bytes), the memory
// limit in MB (u32), the number of cards (u32) and the cards, each a u32 length and its
// bytes. Internal to the sim module.
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "sim/simulate.hpp"

namespace deckscale::wire {

std::string job_message(const SimJob& job);

// The job in `bytes` (work_dir, memory limit and cards; label and timeout stay with the
// parent), or nothing
// if they are not exactly one job message.
std::optional<SimJob> read_job_message(std::string_view bytes);

}  // namespace deckscale::wire
