// Tests of the job message a head-started simulator process receives (sim/job_wire.hpp).
#include "sim/job_wire.hpp"

#include <gtest/gtest.h>

#include <string>

namespace deckscale {
namespace {

SimJob sample_job() {
    SimJob job;
    job.label = "stays with the parent";
    job.work_dir = "/decks/with space";
    job.cards = {"title", "", "R1 in 0 1k \xff", ".ac dec 10 1 1meg", ".end"};
    job.memory_limit_mb = 2048;
    return job;
}

TEST(SimJobWire, RoundTripKeepsDirectoryMemoryLimitAndCards) {
    auto got = wire::read_job_message(wire::job_message(sample_job()));
    ASSERT_TRUE(got);
    EXPECT_EQ(got->work_dir, sample_job().work_dir);
    EXPECT_EQ(got->cards, sample_job().cards);
    EXPECT_EQ(got->memory_limit_mb, 2048u);
    EXPECT_TRUE(got->label.empty());

    auto empty = wire::read_job_message(wire::job_message(SimJob{}));
    ASSERT_TRUE(empty);
    EXPECT_TRUE(empty->cards.empty());
}

TEST(SimJobWire, EveryTruncationAndTrailingBytesAreRefused) {
    std::string bytes = wire::job_message(sample_job());
    for (std::size_t n = 0; n < bytes.size(); ++n)
        EXPECT_FALSE(wire::read_job_message(std::string_view(bytes).substr(0, n))) << n;
    EXPECT_FALSE(wire::read_job_message(bytes + "x"));
    std::string huge_count = wire::job_message(SimJob{});
    huge_count[8] = '\xff';  // four billion cards in twelve bytes
    huge_count[11] = '\x7f';
    EXPECT_FALSE(wire::read_job_message(huge_count));
}

}  // namespace
}  // namespace deckscale
