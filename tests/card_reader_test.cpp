#include <gtest/gtest.h>
TEST(CardReader, Placeholder) {}
