// Nice tick numbers after Heckbert (1990), "Nice numbers for graph labels", Graphics Gems,
// pp. 61-63. Expected ticks below are worked by hand from the published procedure
// (range = nicenum(hi - lo, false); d = nicenum(range / (n - 1), true); floor/ceil to d).
#include "tidewright/report/axis_ticks.hpp"

#include <gtest/gtest.h>

#include <cmath>

namespace tr = tidewright::report;

namespace {
void expect_ticks(const tr::AxisTicks& t, const std::vector<double>& major) {
  ASSERT_EQ(t.major.size(), major.size());
  for (std::size_t i = 0; i < major.size(); ++i) EXPECT_NEAR(t.major[i], major[i], 1e-12) << i;
  EXPECT_DOUBLE_EQ(t.min, major.front());
  EXPECT_DOUBLE_EQ(t.max, major.back());
  EXPECT_EQ(t.labels.size(), major.size());
}
}  // namespace

TEST(NiceNumber, RoundAndCeilingBranches) {
  // Heckbert's nicenum: round -> 1 (f < 1.5), 2 (f < 3), 5 (f < 7), else 10.
  EXPECT_DOUBLE_EQ(tr::nice_number(1.4, true), 1);
  EXPECT_DOUBLE_EQ(tr::nice_number(1.5, true), 2);
  EXPECT_DOUBLE_EQ(tr::nice_number(2.99, true), 2);
  EXPECT_DOUBLE_EQ(tr::nice_number(6.9, true), 5);
  EXPECT_DOUBLE_EQ(tr::nice_number(7.0, true), 10);
  EXPECT_DOUBLE_EQ(tr::nice_number(0.0125, true), 0.01);
  // ceiling -> the smallest of 1, 2, 5, 10 (times 10^k) not below x.
  EXPECT_DOUBLE_EQ(tr::nice_number(438, false), 500);
  EXPECT_DOUBLE_EQ(tr::nice_number(2.01, false), 5);
  EXPECT_DOUBLE_EQ(tr::nice_number(5.01, false), 10);
  EXPECT_DOUBLE_EQ(tr::nice_number(0.2, false), 0.2);
  EXPECT_THROW((void)tr::nice_number(0, true), std::invalid_argument);
}

TEST(LinearTicks, HeckbertLooseLabellingOnKnownRanges) {
  // 105..543, 5 ticks: range = 500, d = nicenum(125) = 100 -> 100..600.
  expect_ticks(tr::linear_ticks(105, 543, 5), {100, 200, 300, 400, 500, 600});
  // 0..1, 6 ticks: range 1, d = nicenum(0.2) = 0.2; one decimal in the labels.
  const auto unit = tr::linear_ticks(0, 1, 6);
  expect_ticks(unit, {0, 0.2, 0.4, 0.6, 0.8, 1.0});
  EXPECT_EQ(unit.labels.front(), "0.0");
  EXPECT_EQ(unit.labels[3], "0.6");
  // -0.37..2.81, 6 ticks: range = nicenum(3.18) = 5, d = 1 -> -1..3, U+2212 minus sign.
  const auto neg = tr::linear_ticks(-0.37, 2.81, 6);
  expect_ticks(neg, {-1, 0, 1, 2, 3});
  EXPECT_EQ(neg.labels.front(), "\u22121");
  EXPECT_EQ(neg.labels[1], "0");
  // Sea levels in metres, 1.62..2.47, 6 ticks: range = nicenum(0.85) = 1, d = 0.2 -> 1.6..2.6.
  expect_ticks(tr::linear_ticks(1.62, 2.47, 6), {1.6, 1.8, 2.0, 2.2, 2.4, 2.6});
  // Years 2020..2150, 8 ticks: range = nicenum(130) = 200, d = nicenum(28.6) = 20.
  expect_ticks(tr::linear_ticks(2020, 2150, 8), {2020, 2040, 2060, 2080, 2100, 2120, 2140, 2160});
}

TEST(LinearTicks, DegenerateAndReversedRanges) {
  const auto flat = tr::linear_ticks(3, 3, 5);
  EXPECT_LT(flat.min, 3);
  EXPECT_GT(flat.max, 3);
  const auto rev = tr::linear_ticks(543, 105, 5);
  EXPECT_DOUBLE_EQ(rev.min, 100);
  EXPECT_DOUBLE_EQ(rev.max, 600);
  EXPECT_THROW((void)tr::linear_ticks(0, NAN, 5), std::invalid_argument);
}

TEST(LogTicks, ReturnPeriodsOneToThousandGetOneTwoFiveLabels) {
  const auto t = tr::log_ticks(1.02, 1000);
  expect_ticks(t, {1, 2, 5, 10, 20, 50, 100, 200, 500, 1000});
  EXPECT_EQ(t.labels.front(), "1");
  EXPECT_EQ(t.labels[5], "50");
  EXPECT_EQ(t.labels.back(), "1000");
  // Minor ticks at the unlabelled 3, 4, 6, 7, 8, 9 of each of the three decades.
  EXPECT_EQ(t.minor.size(), 18U);
  EXPECT_DOUBLE_EQ(t.minor.front(), 3);
  EXPECT_DOUBLE_EQ(t.minor.back(), 900);
}

TEST(LogTicks, FourToSixDecadesGetDecadeLabels) {
  const auto t = tr::log_ticks(1, 9000);
  expect_ticks(t, {1, 10, 100, 1000, 10000});
  EXPECT_EQ(t.labels, (std::vector<std::string>{"1", "10", "100", "1000", "10000"}));
  EXPECT_EQ(t.minor.size(), 32U);  // 2..9 in each of four decades
}

TEST(LogTicks, ShortRangeUsesOneTwoFive) {
  const auto t = tr::log_ticks(2.5, 8);
  expect_ticks(t, {2, 5, 10});
  EXPECT_EQ(t.labels, (std::vector<std::string>{"2", "5", "10"}));
  const auto sub = tr::log_ticks(0.012, 0.4);
  expect_ticks(sub, {0.01, 0.02, 0.05, 0.1, 0.2, 0.5});
  EXPECT_EQ(sub.labels.front(), "0.01");
}

TEST(LogTicks, WideRangeLabelsEveryOtherDecadeWithPowers) {
  const auto t = tr::log_ticks(1e-4, 1e8);  // 12 decades
  EXPECT_DOUBLE_EQ(t.min, 1e-4);
  EXPECT_DOUBLE_EQ(t.max, 1e8);
  ASSERT_EQ(t.major.size(), 7U);
  // One style on the whole axis: every label a power of ten, 10^0 included.
  EXPECT_EQ(t.labels.front(), "10\u207b\u2074");  // 10^-4 in superscript digits
  EXPECT_EQ(t.labels[2], "10\u2070");
  EXPECT_EQ(t.labels.back(), "10\u2078");
  EXPECT_EQ(t.minor.size(), 6U);  // the unlabelled decades only: no 2..9 ticks over 12 decades
  EXPECT_THROW((void)tr::log_ticks(0, 10), std::invalid_argument);
}

TEST(LogTicks, ShortRangeOfLargeNumbersWritesMantissaTimesPower) {
  const auto t = tr::log_ticks(1.5e5, 4e6);
  expect_ticks(t, {1e5, 2e5, 5e5, 1e6, 2e6, 5e6});
  EXPECT_EQ(t.labels[1], "2\u00d710\u2075");
  EXPECT_EQ(t.labels[3], "10\u2076");
}
