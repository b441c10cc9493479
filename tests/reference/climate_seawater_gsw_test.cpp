// alpha(S_A, Theta, p) of the climate module against TEOS-10 as Debian's python3-gsw computes it,
// run live (tests/reference/scripts/climate_gsw_alpha.py). Two references:
//  - gsw.alpha: the same 75-term polynomial (Roquet et al. 2015) in GSW's own code, so agreement
//    to rounding shows the coefficients and the derivative were carried over without a slip;
//  - the full TEOS-10 Gibbs function (IOC, SCOR & IAPSO 2010) through gsw.alpha_wrt_t_exact
//    divided by dTheta/dt: an independent check of the polynomial's accuracy.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <sstream>
#include <string>
#include <vector>

#include "tidewright/climate/seawater.hpp"

namespace {

struct GswPoint {
  double sa, ct, p, alpha_gsw, alpha_exact;
};

std::vector<GswPoint> run_gsw_script(std::string& failure) {
  const std::string cmd = std::string(TIDEWRIGHT_PYTHON) + " " + TIDEWRIGHT_SOURCE_DIR +
                          "/tests/reference/scripts/climate_gsw_alpha.py 2>&1";
  std::vector<GswPoint> out;
  FILE* pipe = popen(cmd.c_str(), "r");
  if (pipe == nullptr) {
    failure = "cannot start " + cmd;
    return out;
  }
  std::string text;
  char buf[4096];
  std::size_t n = 0;
  while ((n = std::fread(buf, 1, sizeof buf, pipe)) > 0) text.append(buf, n);
  const int status = pclose(pipe);
  if (status != 0) {
    failure = "the gsw script failed (needs /usr/bin/python3 with Debian package python3-gsw): " + text;
    return out;
  }
  std::istringstream lines(text);
  std::string line;
  std::getline(lines, line);  // header
  while (std::getline(lines, line)) {
    GswPoint g{};
    if (std::sscanf(line.c_str(), "%lf,%lf,%lf,%lf,%lf", &g.sa, &g.ct, &g.p, &g.alpha_gsw, &g.alpha_exact) == 5) {
      out.push_back(g);
    }
  }
  return out;
}

}  // namespace

TEST(ClimateSeawaterGsw, AlphaMatchesTeos10) {
  std::string failure;
  const std::vector<GswPoint> points = run_gsw_script(failure);
  ASSERT_TRUE(failure.empty()) << failure;
  ASSERT_GE(points.size(), 200U) << "expected the full grid from the script";
  double worst_same = 0.0;
  double worst_exact_rel = 0.0;
  double worst_exact_abs = 0.0;
  for (const GswPoint& g : points) {
    const double a = tidewright::climate::thermal_expansion_per_k(g.sa, g.ct, g.p);
    // Same polynomial: relative agreement to 1e-12 (rounding of ~75 products).
    const double same = std::fabs(a - g.alpha_gsw) / std::fabs(g.alpha_gsw);
    worst_same = std::max(worst_same, same);
    EXPECT_LT(same, 1e-12) << "SA " << g.sa << " CT " << g.ct << " p " << g.p;
    // Full Gibbs function: within 0.25 % of alpha (the issue aims at 1 %; measured worst 0.13 %).
    const double diff = std::fabs(a - g.alpha_exact);
    worst_exact_abs = std::max(worst_exact_abs, diff);
    worst_exact_rel = std::max(worst_exact_rel, diff / std::fabs(g.alpha_exact));
    EXPECT_LT(diff, 2.5e-3 * std::fabs(g.alpha_exact)) << "SA " << g.sa << " CT " << g.ct << " p " << g.p;
  }
  RecordProperty("points", static_cast<int>(points.size()));
  std::printf("alpha vs gsw.alpha: worst relative %.2e; vs exact Gibbs: worst relative %.2e, worst absolute %.2e 1/K (%zu points)\n",
              worst_same, worst_exact_rel, worst_exact_abs, points.size());
}
