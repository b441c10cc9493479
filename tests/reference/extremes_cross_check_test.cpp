// Live cross-checks of the extreme-value fits against R evd (fgev, fpot) and SciPy
// (genextreme, gumbel_r, genpareto, and an independent implementation of the r-largest
// likelihood, Coles 2001 eq. 3.15) on the open datasets portpirie, sealevel (Dover) and venice
// from R evd (Debian r-cran-evd, GPL-3) and on seeded samples from known parameters.
// The scripts are tests/reference/scripts/extremes_evd.R and extremes_scipy.py; both run here.
// A missing Rscript, evd, NumPy or SciPy is a failure naming the Debian package, never a skip.
//
// Agreement asked for: estimates and maximised log-likelihoods to 1e-4 relative. The
// reference optimisers are run with tight tolerances (see the scripts); with evd's default
// settings optim's finite-difference gradient stops short of the maximum, which the test
// portpirie_default shows through the log-likelihoods and the gradient.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include "tidewright/common/csv.hpp"
#include "tidewright/extremes/fit.hpp"

namespace tx = tidewright::extremes;
namespace fs = std::filesystem;

namespace {

const std::string source_dir = TIDEWRIGHT_SOURCE_DIR;
const std::string python = TIDEWRIGHT_PYTHON;

struct Reference {
  std::string name;
  std::string model;
  double loc = std::nan("");
  double scale = std::nan("");
  double shape = std::nan("");
  double loglik = std::nan("");
  double se_loc = std::nan("");
  double se_scale = std::nan("");
  double se_shape = std::nan("");
};

std::string slurp(const fs::path& p) {
  std::ifstream in(p);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

// Runs a command; on failure returns a message naming the program, the Debian package and the
// command's stderr.
std::string run(const std::string& command, const fs::path& err, const std::string& package) {
  const int status = std::system((command + " 2> \"" + err.string() + "\"").c_str());
  if (status == 0) return "";
  return "reference command failed (needs Debian package " + package + "): " + command +
         "\n  exit status " + std::to_string(status) + "\n  stderr: " + slurp(err);
}

std::vector<Reference> read_results(const fs::path& path) {
  const auto t = tidewright::CsvTable::read(path);
  std::vector<Reference> out;
  auto num = [&](const tidewright::CsvRow& r, const char* col) {
    const auto c = t.find_column(col);
    if (!c) return std::nan("");
    const auto v = t.number(r, *c);
    return v ? *v : std::nan("");
  };
  for (const auto& r : t.rows()) {
    Reference x;
    x.name = r.cells[t.column("name")];
    x.model = r.cells[t.column("model")];
    x.loc = num(r, "loc");
    x.scale = num(r, "scale");
    x.shape = num(r, "shape");
    x.loglik = num(r, "loglik");
    x.se_loc = num(r, "se_loc");
    x.se_scale = num(r, "se_scale");
    x.se_shape = num(r, "se_shape");
    out.push_back(x);
  }
  return out;
}

class ExtremesCrossCheck : public ::testing::Test {
 protected:
  static void SetUpTestSuite() {
    std::random_device rd;
    dir_ = fs::temp_directory_path() / ("tidewright-extremes-ref-" + std::to_string(rd()));
    fs::create_directories(dir_);
    const fs::path err = dir_ / "stderr.txt";
    setup_error_ = run("Rscript \"" + source_dir + "/tests/reference/scripts/extremes_evd.R\" \"" +
                           dir_.string() + "\"",
                       err, "r-base-core and r-cran-evd");
    if (setup_error_.empty()) {
      setup_error_ =
          run(python + " \"" + source_dir + "/tests/reference/scripts/extremes_scipy.py\" fit \"" +
                  dir_.string() + "\"",
              err, "python3-numpy and python3-scipy");
    }
    if (setup_error_.empty()) {
      evd_ = read_results(dir_ / "evd_results.csv");
      scipy_ = read_results(dir_ / "scipy_results.csv");
    }
  }
  static void TearDownTestSuite() {
    std::error_code ec;
    fs::remove_all(dir_, ec);
  }
  void SetUp() override { ASSERT_TRUE(setup_error_.empty()) << setup_error_; }

  static std::vector<double> levels(const std::string& name) {
    const auto t = tidewright::CsvTable::read(dir_ / ("data_" + name + ".csv"));
    const std::size_t c = t.column("level");
    std::vector<double> v;
    for (const auto& r : t.rows()) {
      if (const auto x = t.number(r, c)) v.push_back(*x);  // "NA" years dropped
    }
    return v;
  }
  static std::vector<std::vector<double>> venice() {
    const auto t = tidewright::CsvTable::read(dir_ / "data_venice.csv");
    std::vector<std::vector<double>> years;
    for (const auto& r : t.rows()) {
      std::vector<double> y;
      for (int k = 1; k <= 10; ++k) {
        if (const auto x = t.number(r, t.column("X" + std::to_string(k)))) y.push_back(*x);
      }
      years.push_back(y);
    }
    return years;
  }
  static tx::FitResult our_fit(const Reference& r) {
    const auto x = levels(r.name);
    if (r.model == "gumbel") return tx::fit_gumbel(x);
    if (r.model == "gpd") return tx::fit_gpd(x, 2.0, 10.0);  // threshold 2 in the scripts
    return tx::fit_gev(x);
  }

  static fs::path dir_;
  static std::string setup_error_;
  static std::vector<Reference> evd_;
  static std::vector<Reference> scipy_;
};
fs::path ExtremesCrossCheck::dir_;
std::string ExtremesCrossCheck::setup_error_;
std::vector<Reference> ExtremesCrossCheck::evd_;
std::vector<Reference> ExtremesCrossCheck::scipy_;

double rel(double a, double b) { return std::abs(a - b) / std::abs(b); }

constexpr double agree = 1e-4;  // asked for by the project (issue 3)

void expect_agree(const tx::FitResult& f, const Reference& r, const std::string& who) {
  SCOPED_TRACE(who + " " + r.name + " " + r.model);
  if (r.model != "gpd") {
    EXPECT_LT(rel(f.location(), r.loc), agree) << f.location() << " vs " << r.loc;
  }
  EXPECT_LT(rel(f.scale(), r.scale), agree) << f.scale() << " vs " << r.scale;
  if (r.model != "gumbel") {
    EXPECT_LT(rel(f.shape(), r.shape), agree) << f.shape() << " vs " << r.shape;
  }
  EXPECT_LT(rel(f.log_likelihood, r.loglik), agree) << f.log_likelihood << " vs " << r.loglik;
  // Ours is the maximum: never below the reference's log-likelihood beyond rounding.
  EXPECT_GE(f.log_likelihood, r.loglik - 1e-9 * (1.0 + std::abs(r.loglik)));
  std::printf("[ %-5s ] %-12s %-7s rel. diff loc %.1e scale %.1e shape %.1e loglik %.1e\n",
              who.c_str(), r.name.c_str(), r.model.c_str(),
              r.model == "gpd" ? 0.0 : rel(f.location(), r.loc), rel(f.scale(), r.scale),
              r.model == "gumbel" ? 0.0 : rel(f.shape(), r.shape), rel(f.log_likelihood, r.loglik));
}

}  // namespace

TEST_F(ExtremesCrossCheck, AgreesWithEvdFgevAndFpot) {
  int compared = 0;
  for (const auto& r : evd_) {
    if (r.model == "gev_default") continue;
    expect_agree(our_fit(r), r, "evd");
    ++compared;
  }
  EXPECT_EQ(compared, 14);  // 6 datasets x (GEV, Gumbel) + 2 GPD samples
}

// Standard errors from our analytic Hessian against the SciPy script's Hessian of the same
// log-likelihood by Richardson-extrapolated central differences (error O(h^4), far below
// 1e-4). evd's standard errors are printed only: optim's finite-difference Hessian with steps
// h ~ 1e-6 carries rounding error of order eps |l| / h^2, about 1e-3 relative for venice
// (|l| = 223, h = 2e-5 cm in mu), so they agree with ours to about three digits and are no
// oracle at 1e-4.
TEST_F(ExtremesCrossCheck, StandardErrorsAgreeWithFiniteDifferenceHessian) {
  int compared = 0;
  for (const auto& r : scipy_) {
    if (r.model != "gev") continue;
    const auto f = our_fit(r);
    SCOPED_TRACE(r.name);
    EXPECT_LT(rel(f.standard_error(0), r.se_loc), agree);
    EXPECT_LT(rel(f.standard_error(1), r.se_scale), agree);
    EXPECT_LT(rel(f.standard_error(2), r.se_shape), agree);
    ++compared;
  }
  EXPECT_EQ(compared, 6);
  for (const auto& r : evd_) {
    if (r.model != "gev") continue;
    const auto f = our_fit(r);
    std::printf("[ evd   ] %-12s se rel. diff %.1e %.1e %.1e (finite-difference Hessian in evd)\n",
                r.name.c_str(), rel(f.standard_error(0), r.se_loc),
                rel(f.standard_error(1), r.se_scale), rel(f.standard_error(2), r.se_shape));
  }
}

TEST_F(ExtremesCrossCheck, AgreesWithScipy) {
  int compared = 0;
  for (const auto& r : scipy_) {
    if (r.name == "venice") continue;  // r-largest: next test
    expect_agree(our_fit(r), r, "scipy");
    ++compared;
  }
  EXPECT_EQ(compared, 14);
}

// With evd's default optimiser settings fgev stops about 1e-4 short in the shape. Why: optim's
// BFGS differentiates numerically with step 1e-3; the log-likelihood at its stopping point is
// lower than ours, and our analytic gradient there is far from zero.
TEST_F(ExtremesCrossCheck, EvdDefaultSettingsStopShortOfTheMaximum) {
  const Reference* d = nullptr;
  for (const auto& r : evd_) {
    if (r.model == "gev_default") d = &r;
  }
  ASSERT_NE(d, nullptr);
  const auto f = tx::fit_gev(levels("portpirie"));
  tx::ParamVector at(3);
  at << d->loc, d->scale, d->shape;
  const auto there = f.log_likelihood_at(at);
  EXPECT_NEAR(there.value, d->loglik, 1e-9);  // same function: our likelihood at evd's point
  EXPECT_GT(f.log_likelihood - d->loglik, 1e-9);
  const double g_there = there.gradient.norm();
  const double g_ours = f.log_likelihood_at(f.estimate).gradient.norm();
  EXPECT_GT(g_there, 1000.0 * g_ours);
  std::printf(
      "[ evd   ] default fgev: shape %.8f vs ours %.8f; loglik %.10f vs ours %.10f; |grad| %.2e vs "
      "%.2e\n",
      d->shape, f.shape(), d->loglik, f.log_likelihood, g_there, g_ours);
}

// Venice, r largest values per year (Coles 2001, sec. 3.5.3). r = 1 against fgev on the annual
// maxima; r = 3, 5, 10 against the independent eq. 3.15 fit in the SciPy script, and our
// log-likelihood at our estimate against that script's evaluation of eq. 3.15.
TEST_F(ExtremesCrossCheck, VeniceRLargestAgreesWithIndependentImplementation) {
  const auto years = venice();
  ASSERT_EQ(years.size(), 51U);
  for (const auto& r : evd_) {
    if (r.name == "venice_r1" && r.model == "gev") {
      expect_agree(tx::fit_gev_r_largest(years, 1), r, "evd");
    }
  }
  int compared = 0;
  for (const auto& r : scipy_) {
    if (r.name != "venice") continue;
    const std::size_t rr = std::stoul(r.model.substr(std::string("rlargest").size()));
    const auto f = tx::fit_gev_r_largest(years, rr);
    expect_agree(f, r, "scipy");
    char cmd[1024];
    std::snprintf(cmd, sizeof cmd,
                  "%s \"%s/tests/reference/scripts/extremes_scipy.py\" rlargest-loglik \"%s\" %zu "
                  "%.17g %.17g %.17g",
                  python.c_str(), source_dir.c_str(), dir_.string().c_str(), rr, f.location(),
                  f.scale(), f.shape());
    FILE* pipe = popen(cmd, "r");
    ASSERT_NE(pipe, nullptr);
    double py = std::nan("");
    ASSERT_EQ(std::fscanf(pipe, "%lf", &py), 1) << cmd;
    pclose(pipe);
    EXPECT_NEAR(f.log_likelihood, py, 1e-10 * std::abs(py)) << "r = " << rr;
    ++compared;
  }
  EXPECT_EQ(compared, 3);
}
