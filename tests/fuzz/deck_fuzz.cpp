// libFuzzer entry point: read -> scale -> write on arbitrary bytes (see targets.hpp).
// Built and run by scripts/fuzz.
#include "fuzz/targets.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    deckscale::fuzz::deck(data, size);
    return 0;
}
