// Planning core against SciPy (Debian python3-scipy): N_t(z) by scipy.integrate.quad and the
// allowance by brentq on the same inputs (tests/reference/scripts/planning_reference.py).
// The reference never skips: a missing interpreter or package fails the test and names it.
#include <gtest/gtest.h>

#include <array>
#include <cstdio>
#include <string>

#include "tidewright/planning/allowance.hpp"
#include "tidewright/planning/amplification.hpp"

using tidewright::extremes::Family;
using tidewright::extremes::StillWaterModel;
using namespace tidewright::planning;

namespace {

double scipy_value(const std::string& args) {
  const std::string cmd = std::string(TIDEWRIGHT_PYTHON) + " '" + TIDEWRIGHT_SOURCE_DIR +
                          "/tests/reference/scripts/planning_reference.py' " + args + " 2>&1";
  FILE* pipe = popen(cmd.c_str(), "r");
  if (pipe == nullptr) {
    ADD_FAILURE() << "cannot start " << TIDEWRIGHT_PYTHON;
    return 0.0;
  }
  std::string out;
  std::array<char, 256> buf{};
  while (std::fgets(buf.data(), buf.size(), pipe) != nullptr) out += buf.data();
  const int status = pclose(pipe);
  if (status != 0) {
    ADD_FAILURE() << "SciPy reference failed (needs Debian python3-scipy and python3-numpy at "
                  << TIDEWRIGHT_PYTHON << "): " << out;
    return 0.0;
  }
  return std::stod(out);
}

std::string num(double x) {
  char b[64];
  std::snprintf(b, sizeof b, "%.17g", x);
  return b;
}

}  // namespace

// Allowance for GEV with normal Delta ~ N(0.5, 0.15), mu 2, sigma 0.12, xi -+0.1: numeric
// values from SciPy (computed), to 1e-6 m. They also show Buchanan et al. (2016): growing
// with the return period for xi < 0, shrinking for xi > 0.
TEST(PlanningReference, GevAllowanceMatchesScipy) {
  const YearConditions c{2100, RiseDistribution::normal(0.5, 0.15), {}};
  for (double xi : {-0.1, 0.1}) {
    const StillWaterModel m{Family::gev, 2.0, 0.12, xi, 0.0, 1.0, {}};
    for (double T : {10.0, 100.0, 1000.0}) {
      const double ref = scipy_value("allowance gev 2 0.12 " + num(xi) + " 0.5 0.15 " + num(T));
      EXPECT_NEAR(allowance(m, c, T).allowance_m, ref, 1e-6) << "xi " << xi << " T " << T;
    }
  }
}

// Amplification factors for GEV and GPD against SciPy quadrature, to 1e-6 relative (issue 5).
TEST(PlanningReference, AmplificationMatchesScipyForGevAndGpd) {
  {
    const StillWaterModel m{Family::gev, 2.0, 0.15, -0.2, 0.0, 1.0, {}};
    const YearConditions c{2100, RiseDistribution::normal(0.4, 0.1), {}};
    for (double z : {2.3, 2.5, 2.7}) {
      const double ref = scipy_value("amplification gev 2 0.15 -0.2 0.4 0.1 " + num(z));
      EXPECT_NEAR(amplification(m, c, z).amplification_factor / ref, 1.0, 1e-6) << z;
    }
  }
  {
    const StillWaterModel m{Family::gev, 2.0, 0.15, 0.15, 0.0, 1.0, {}};
    const YearConditions c{2100, RiseDistribution::normal(0.3, 0.08), {}};
    for (double z : {2.5, 3.0}) {
      const double ref = scipy_value("amplification gev 2 0.15 0.15 0.3 0.08 " + num(z));
      EXPECT_NEAR(amplification(m, c, z).amplification_factor / ref, 1.0, 1e-6) << z;
    }
  }
  for (double xi : {0.05, -0.1}) {
    // The rate curve below u is never reached at these levels (z - Delta stays above u).
    const StillWaterModel m{Family::gpd, 0.0, 0.15, xi, 2.0, 3.0, {{1.6}, {20.0}}};
    const YearConditions c{2100, RiseDistribution::normal(0.3, 0.05), {}};
    for (double z : {3.0, 3.2}) {
      const double ref = scipy_value("amplification gpd 2 0.15 " + num(xi) + " 3 0.3 0.05 " + num(z));
      EXPECT_NEAR(amplification(m, c, z).amplification_factor / ref, 1.0, 1e-6) << xi << " " << z;
    }
  }
}
