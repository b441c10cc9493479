// Numbers as tables print them: a probability never shows as 0 or 1 when it is not.
#include "tidewright/report/text_table.hpp"

#include <gtest/gtest.h>

using tidewright::report::probability_text;

TEST(ProbabilityText, NeverRoundsToZeroOrOne) {
  EXPECT_EQ(probability_text(0.25), "0.2500");
  EXPECT_EQ(probability_text(3.2e-6), "3.2e-06");
  EXPECT_EQ(probability_text(0.0), "0.0000");  // exactly zero: a level above the model's end point
  EXPECT_EQ(probability_text(0.99998), "0.999980");
  EXPECT_EQ(probability_text(0.9999999), "> 0.999999");
  EXPECT_EQ(probability_text(1.0, true), "> 0.999999");  // the caller knows 1 - p underflowed
}
