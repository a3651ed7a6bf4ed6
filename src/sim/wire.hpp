// The byte stream a simulator child sends to its parent over a pipe.
//
// A stream is a sequence of frames: tag (1 byte), payload length (u32), payload. Numbers are
// in the machine's own byte order (both ends are the same program on the same machine).
//   log     one line ngspice printed (sent as it is printed, so a killed child leaves its log)
//   plot    name, analysis, number of vectors; that many vector frames follow
//   vector  name, kind, count, count complex values (real and imaginary part as doubles)
//   result  status and message; the last frame of a complete stream
// Strings inside payloads are u32 length + bytes. A vector's values are the tail of its frame,
// so the child can send them straight out of ngspice's memory and the parent can read them
// straight into the vector: a plot is never copied whole on either side. Internal to the sim
// module.
#pragma once

#include <cstdint>
#include <span>
#include <string>
#include <string_view>

#include "sim/simulate.hpp"

namespace deckscale::wire {

enum class Tag : std::uint8_t { log = 'L', plot = 'P', vector = 'V', result = 'R' };

std::string log_frame(std::string_view line);
// The plot frame and the vector frames of a whole plot.
std::string plot_frame(const SimPlot& plot);
// The frame that announces a plot of `vectors` vectors.
std::string plot_header_frame(std::string_view name, std::string_view analysis,
                              std::uint32_t vectors);
// A vector frame up to its values: the sender follows it with exactly `count` pairs of doubles.
std::string vector_frame_start(std::string_view name, VectorKind kind, std::uint32_t count);
std::string result_frame(SimStatus status, std::string_view message);

enum class StreamState {
    complete,   // frames decoded up to and including a result frame, nothing after it
    truncated,  // the bytes end without a result frame (possibly inside a frame)
    garbled,    // a frame could not be decoded, or bytes follow the result frame
};

// Decodes a stream as it arrives, in pieces of any size, into an outcome (log lines, plots,
// status, message). Decoding stops at the first bad frame.
class StreamDecoder {
  public:
    void feed(std::string_view bytes);
    // Reading straight into the vectors: while the stream is inside a vector's values,
    // value_room() is the storage for the bytes of the values still expected (empty
    // otherwise: then feed() the next bytes). The caller writes the next bytes of the stream
    // to its start and calls fill_room() with their number (which may be 0) before any other
    // call; the room beyond them is given up.
    std::span<char> value_room();
    void fill_room(std::size_t filled);
    StreamState state() const { return state_; }
    SimOutcome& outcome() { return out_; }

  private:
    enum class Phase { header, payload, vector_head, vector_values };
    void start_frame();
    void finish_frame();
    bool start_vector();
    void take_values(std::string_view& bytes);
    bool plot_is_open() const { return !out_.plots.empty() && vectors_left_ > 0; }

    SimOutcome out_;
    StreamState state_ = StreamState::truncated;
    Phase phase_ = Phase::header;
    Tag tag_ = Tag::log;
    std::string pending_;             // the frame header, or a payload read so far
    std::size_t left_ = 0;            // payload bytes of the current frame not read yet
    std::uint32_t vectors_left_ = 0;  // vectors the open plot still expects
    std::uint32_t values_left_ = 0;   // values the current vector still expects
    std::size_t room_from_ = 0;       // the first value of the room handed out
    std::size_t room_skip_ = 0;       // bytes of it that were already read (a split value)
};

// Decodes the whole of `bytes` (StreamDecoder in one piece) into `out` and says how the
// stream ended.
StreamState decode(std::string_view bytes, SimOutcome& out);

}  // namespace deckscale::wire
