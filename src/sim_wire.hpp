// The byte stream a simulator child sends to its parent over a pipe.
//
// A stream is a sequence of frames: tag (1 byte), payload length (u32), payload. Numbers are
// in the machine's own byte order (both ends are the same program on the same machine).
//   log     one line ngspice printed (sent as it is printed, so a killed child leaves its log)
//   plot    name, analysis, vectors (name, kind, complex values)
//   result  status and message; the last frame of a complete stream
// Strings inside payloads are u32 length + bytes. Internal to the sim module.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

#include "sim.hpp"

namespace deckscale::wire {

enum class Tag : std::uint8_t { log = 'L', plot = 'P', result = 'R' };

std::string log_frame(std::string_view line);
std::string plot_frame(const SimPlot& plot);
std::string result_frame(SimStatus status, std::string_view message);

enum class StreamState {
    complete,   // frames decoded up to and including a result frame, nothing after it
    truncated,  // the bytes end without a result frame (possibly inside a frame)
    garbled,    // a frame could not be decoded, or bytes follow the result frame
};

// Decodes every complete frame of `bytes` into `out` (log lines, plots, status, message)
// and says how the stream ended. Decoding stops at the first bad frame.
StreamState decode(std::string_view bytes, SimOutcome& out);

}  // namespace deckscale::wire
