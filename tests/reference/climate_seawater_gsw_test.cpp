// alpha(S_A, Theta, p) of the climate module against TEOS-10 as Debian's python3-gsw computes it,
// run live (tests/reference/scripts/climate_gsw_alpha.py). Two references:
//  - gsw.alpha: the same 75-term polynomial (Roquet et al. 2015) in GSW's own code, so agreement
//    to rounding shows the coefficients and the derivative were carried over without a slip;
//  - the full TEOS-10 Gibbs function (IOC, SCOR & IAPSO 2010) through gsw.alpha_wrt_t_exact
//    divided by dTheta/dt: an independent check of the polynomial's accuracy.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <sstream>
#include <string>
#include <vector>

#include "support/run_cli.hpp"
#include "tidewright/climate/seawater.hpp"
#include "tidewright/climate/thermal_expansion.hpp"
#include "tidewright/common/atomic_output.hpp"

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

// The layered route to thermal expansion (thermal_expansion.hpp: rise = alpha at the mid-warming
// temperature times warming times thickness) against TEOS-10 as python3-gsw computes it for a
// warmed profile (tests/reference/scripts/climate_gsw_column.py): per layer, the thickness times
// the integral of gsw.alpha over the warming, and the column's change of specific volume at
// fixed mass. Layers: the two-layer model's own (layered_ocean_for, warmed 0.5-3 K and
// 0.05-0.5 K) and a profile of five layers from the surface to 4,000 m warmed as the upper
// ocean warms more. Both references agree to 1e-3 relative, and so must the route.
TEST(ClimateSeawaterGsw, LayeredExpansionMatchesTheIntegralOfAlphaOverAWarmedProfile) {
  namespace tc = tidewright::climate;
  struct Case {
    tc::OceanLayer layer;
    double warming_k;
  };
  std::vector<Case> cases;
  const tc::LayeredOcean model = tc::layered_ocean_for(tc::TwoLayerParameters{});
  for (double w : {0.5, 1.5, 3.0}) cases.push_back({model.upper, w});
  for (double w : {0.05, 0.2, 0.5}) cases.push_back({model.deep, w});
  // An invented profile (thickness, S_A, Theta, mid pressure) warmed from the top down.
  cases.push_back({{50.0, 35.4, 22.0, 25.0}, 2.0});
  cases.push_back({{150.0, 35.3, 16.0, 125.0}, 1.2});
  cases.push_back({{500.0, 35.0, 9.0, 450.0}, 0.5});
  cases.push_back({{1300.0, 34.9, 4.0, 1350.0}, 0.15});
  cases.push_back({{2000.0, 34.9, 1.5, 3000.0}, 0.05});
  std::ostringstream input;
  input.precision(17);
  for (const Case& c : cases) {
    input << c.layer.absolute_salinity_g_kg << ' ' << c.layer.conservative_temperature_c << ' '
          << c.layer.mid_pressure_dbar << ' ' << c.layer.thickness_m << ' ' << c.warming_k << '\n';
  }
  tidewright::testing::TempDir dir;
  const auto in_path = dir / "layers.txt";
  tidewright::write_text_file(in_path, input.str(), false);
  const std::string cmd = std::string(TIDEWRIGHT_PYTHON) + " " + TIDEWRIGHT_SOURCE_DIR +
                          "/tests/reference/scripts/climate_gsw_column.py < " + in_path.string() + " 2>&1";
  const auto script = tidewright::testing::run_shell(cmd);
  const std::string& text = script.out;
  ASSERT_EQ(script.exit_code, 0) << "the gsw script failed (needs python3-gsw): " << text;
  std::istringstream lines(text);
  std::string line;
  std::getline(lines, line);  // header
  double worst = 0.0;
  for (const Case& c : cases) {
    ASSERT_TRUE(std::getline(lines, line)) << text;
    double by_alpha = 0.0;
    double by_specvol = 0.0;
    ASSERT_EQ(std::sscanf(line.c_str(), "%lf,%lf", &by_alpha, &by_specvol), 2) << line;
    const double heat_j =
        tc::seawater_rho_cp_j_m3_k * tc::ocean_surface_area_m2 * c.layer.thickness_m * c.warming_k;
    const double rise = tc::layer_expansion_m(c.layer, heat_j);
    const double rel = std::fabs(rise - by_alpha) / by_alpha;
    worst = std::max(worst, rel);
    EXPECT_LT(rel, 1e-3) << "layer at " << c.layer.mid_pressure_dbar << " dbar, warmed " << c.warming_k << " K";
    EXPECT_LT(std::fabs(rise - by_specvol) / by_specvol, 1e-3) << "specific-volume reference";
  }
  std::printf("layered expansion vs integral of gsw.alpha: worst relative %.2e over %zu layers\n", worst,
              cases.size());
}
