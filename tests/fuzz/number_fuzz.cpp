// libFuzzer entry point: SPICE numbers, factors and expressions on arbitrary bytes (see
// targets.hpp). Built and run by scripts/fuzz.
#include "fuzz/targets.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
    deckscale::fuzz::number(data, size);
    return 0;
}
