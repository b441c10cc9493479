// Tick positions and labels for chart axes.
//
// Linear axes use the "loose labelling" of Heckbert (1990), "Nice numbers for graph labels",
// in Graphics Gems (ed. Glassner), pp. 61-63: a tick step of 1, 2 or 5 times a power of ten,
// with the axis widened to whole steps so that its ends carry labels. Log axes (return
// periods, amplification factors) put labels on 1-2-5 steps when the range spans up to three
// decades (return periods 1 to 1000 years: 1, 2, 5, 10, 20, ...), else on decades.
#pragma once

#include <string>
#include <vector>

namespace tidewright::report {

struct AxisTicks {
  double min = 0, max = 1;          // the axis range, widened to the outer ticks
  std::vector<double> major;        // labelled ticks, ascending
  std::vector<std::string> labels;  // one a major tick
  std::vector<double> minor;        // unlabelled ticks (log axes: 2..9 times each decade)
};

// Heckbert (1990): the nice number near x (round = true) or at least x (round = false);
// x > 0. Returns 1, 2, 5 or 10 times a power of ten.
[[nodiscard]] double nice_number(double x, bool round);

// Heckbert's loose labelling of [lo, hi] with about `target_count` ticks (>= 2). lo == hi is
// widened by one unit of its magnitude. Labels carry exactly the decimals the step needs.
[[nodiscard]] AxisTicks linear_ticks(double lo, double hi, int target_count = 6);

// Log10 axis for 0 < lo < hi, widened to whole decades (or to 1-2-5 steps for short ranges).
[[nodiscard]] AxisTicks log_ticks(double lo, double hi);

// A tick label: fixed with `decimals` digits, U+2212 for the minus sign.
[[nodiscard]] std::string tick_label(double value, int decimals);

}  // namespace tidewright::report
