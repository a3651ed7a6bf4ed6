#include "sim/interrupt.hpp"

#include <utility>

namespace deckscale {
namespace {

thread_local std::function<bool()> current_check;

}  // namespace

InterruptScope::InterruptScope(std::function<bool()> check)
    : previous_(std::exchange(current_check, std::move(check))) {}

InterruptScope::~InterruptScope() { current_check = std::move(previous_); }

bool interrupt_requested() { return current_check && current_check(); }

}  // namespace deckscale
