// Round numbers for the report's axes, colour bars and scale bars: the 1-2-5 series
// (common practice, no source).
#include <gtest/gtest.h>

#include "io/nice_numbers.hpp"

namespace hearth {
namespace {

TEST(NiceNumbers, TicksAreRoundAndInsideTheRange) {
  EXPECT_EQ(nice_ticks(104.12, 1150.0, 6), (std::vector<double>{200, 400, 600, 800, 1000}));
  EXPECT_EQ(nice_ticks(0.0, 0.306, 6), (std::vector<double>{0, 0.05, 0.1, 0.15, 0.2, 0.25, 0.3}));
  EXPECT_EQ(nice_ticks(-5.0, 5.0, 4), (std::vector<double>{-4, -2, 0, 2, 4}));
  const auto tiny = nice_ticks(20.0, 20.0, 5);  // a uniform field: its value, twice
  EXPECT_EQ(tiny, (std::vector<double>{20.0, 20.0}));
}

TEST(NiceNumbers, ScaleBarLengthIsTheLargestRoundLengthThatFits) {
  EXPECT_DOUBLE_EQ(round_length_below(0.153), 0.1);
  EXPECT_DOUBLE_EQ(round_length_below(0.6), 0.5);
  EXPECT_DOUBLE_EQ(round_length_below(2.0), 2.0);
  EXPECT_DOUBLE_EQ(round_length_below(99.0), 50.0);
}

TEST(NiceNumbers, ShortNumbers) {
  EXPECT_EQ(short_number(1150.0), "1150");
  EXPECT_EQ(short_number(104.1234, 5), "104.12");
  EXPECT_EQ(short_number(0.025), "0.025");
}

}  // namespace
}  // namespace hearth
