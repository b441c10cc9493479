// Reading annual maxima (and r largest values): hand-made files, every bad input with its
// message, and R evd's open datasets `sealevel` (Dover and Harwich, with missing years) and
// `venice` (ten largest levels per year in cm, fewer in 1935) exported live by Rscript.
#include "tidewright/record/annual_maxima.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <numeric>
#include <sstream>

#include "record/record_test_helpers.hpp"

namespace tr = tidewright::record;
using ::testing::DoubleEq;
using ::testing::ElementsAre;
using ::testing::HasSubstr;
using tr::testing::input_error_of;

namespace {
std::string maxima_error(const std::string& text, const tr::ReadOptions& options = {}) {
  return input_error_of([&] { (void)tr::parse_annual_maxima(text, "maxima.csv", options); });
}
}  // namespace

TEST(AnnualMaxima, ReadsYearsLevelsAndMissingYears) {
  tr::ReadOptions o;
  o.unit = "cm";
  o.datum = "ODN";
  o.missing.sentinels = {-99};
  const auto am = tr::parse_annual_maxima(
      "year,level\n1950,352\n1951,NA\n1952,-99\n1953,360\n1955,344.5\n", "maxima.csv", o);
  EXPECT_THAT(am.years, ElementsAre(1950, 1953, 1955));
  // 344.5 cm × 0.01 is 3.445 m to within one rounding of the product.
  EXPECT_THAT(am.level_m, ElementsAre(DoubleEq(3.52), DoubleEq(3.6), DoubleEq(3.445)));
  EXPECT_TRUE(am.r_largest_m.empty());
  EXPECT_TRUE(am.time_utc_s.empty());
  ASSERT_EQ(am.dropped.size(), 2U);
  EXPECT_EQ(am.dropped[0].year, 1951);
  EXPECT_EQ(am.dropped[1].reason, "no value in the file");
  EXPECT_EQ(am.cleaning.rows_read, 5U);
  EXPECT_EQ(am.cleaning.missing, 1U);
  EXPECT_EQ(am.cleaning.sentinels, 1U);
  EXPECT_EQ(am.summary(),
            "maxima.csv: 3 annual maxima 1950-1955; datum: ODN\n"
            "  5 rows read, 1 missing, 1 sentinels\n"
            "  2 years dropped: no value in the file: 1951, 1952\n");
}

TEST(AnnualMaxima, ReadsRLargestWithFewerValuesInSomeYears) {
  tr::ReadOptions o;
  o.level_column = "r1";
  o.r_largest_columns = {"r2", "r3"};
  const auto am = tr::parse_annual_maxima(
      "year,r1,r2,r3\n2001,3.0,2.5,2.0\n2002,2.8,2.8,\n2003,3.1,NA,NA\n2004,NA,,\n", "m.csv", o);
  EXPECT_THAT(am.years, ElementsAre(2001, 2002, 2003));
  ASSERT_EQ(am.r_largest_m.size(), 3U);
  EXPECT_THAT(am.r_largest_m[0], ElementsAre(3.0, 2.5, 2.0));
  EXPECT_THAT(am.r_largest_m[1], ElementsAre(2.8, 2.8));
  EXPECT_THAT(am.r_largest_m[2], ElementsAre(3.1));
  EXPECT_EQ(am.dropped.size(), 1U);
}

TEST(AnnualMaxima, BadRLargestRows) {
  tr::ReadOptions o;
  o.r_largest_columns = {"r2", "r3"};
  EXPECT_EQ(maxima_error("year,level,r2,r3\n2001,3,NA,2\n2002,3,2,1\n", o),
            "maxima.csv:2: column 'r3' holds a value after a missing one; give the r largest "
            "values of a year from the largest down, missing values only at the end of the row");
  EXPECT_EQ(maxima_error("year,level,r2,r3\n2001,3,2,2.5\n2002,3,2,1\n", o),
            "maxima.csv:2: column 'r3' holds 2.5, larger than the value before it; give the r "
            "largest values of a year in decreasing order");
}

// The bad inputs of issue 3 for annual maxima.
TEST(AnnualMaxima, YearGivenTwiceNamesBothLines) {
  EXPECT_EQ(maxima_error("year,level\n1990,1\n1991,2\n1990,3\n"),
            "maxima.csv:4: year 1990 is given twice (lines 2 and 4); give one row per year");
  EXPECT_EQ(maxima_error("year,level\n1990,1\n1990,2\n"),
            "maxima.csv:3: year 1990 is given twice (lines 2 and 3); give one row per year");
}

TEST(AnnualMaxima, UnsortedYearsNameBothLines) {
  EXPECT_EQ(maxima_error("year,level\n1990,1\n# a comment\n1989,2\n"),
            "maxima.csv:4: year 1989 comes after year 1990 on line 2; sort the rows by year");
}

TEST(AnnualMaxima, NonIntegerOrMissingYear) {
  EXPECT_EQ(maxima_error("year,level\n1990,1\n1990.5,2\n"),
            "maxima.csv:3: column 'year' holds '1990.5', which is not a whole year; write the "
            "year as an integer such as 1987");
  EXPECT_EQ(maxima_error("year,level\n,1\n"),
            "maxima.csv:2: column 'year' holds '', which is not a whole year; write the year as "
            "an integer such as 1987");
}

TEST(AnnualMaxima, UnparsableLevel) {
  EXPECT_EQ(maxima_error("year,level\n1990,1\n1991,4..1\n"),
            "maxima.csv:3: column 'level' holds '4..1', which is not a finite number; correct "
            "the value, or declare it a missing-value marker");
}

TEST(AnnualMaxima, MissingColumn) {
  tr::ReadOptions o;
  o.year_column = "Year ";
  o.level_column = "max";
  EXPECT_EQ(maxima_error("Year,level\n1990,1\n", o),
            "maxima.csv:1: has no column 'max' (columns: Year, level); name one of these columns "
            "in the options");
}

TEST(AnnualMaxima, ConstantAndTooFewValues) {
  EXPECT_EQ(maxima_error("year,level\n1990,2.5\n1991,2.5\n1992,NA\n"),
            "maxima.csv: all 2 annual maxima equal 2.5 m: the data are constant; check the level "
            "column, its missing-value markers and sentinels");
  EXPECT_EQ(maxima_error("year,level\n1990,2.5\n1991,NA\n"),
            "maxima.csv: has 1 annual maxima in column 'level' (1 years without a value): too "
            "few values; give at least 2 years (an extreme-value fit needs 10 or more)");
}

TEST(AnnualMaxima, MinimumForEachModel) {
  EXPECT_EQ(tr::minimum_maxima("gumbel"), 10U);
  EXPECT_EQ(tr::minimum_maxima("gev"), 15U);
  EXPECT_EQ(tr::minimum_maxima("rlargest"), 15U);
  EXPECT_EQ(tr::minimum_maxima("gpd"), 15U);
  EXPECT_NO_THROW(tr::require_minimum_maxima(15, "gev", 15));
  EXPECT_EQ(input_error_of([] { tr::require_minimum_maxima(12, "gev", 15, "pp.csv"); }),
            "pp.csv: 12 annual maxima are too few for a gev fit, which needs at least 15; give a "
            "longer record or a model with fewer parameters");
  EXPECT_EQ(
      input_error_of([] { tr::require_minimum_maxima(9, "gumbel", tr::minimum_maxima("gumbel")); }),
      "gumbel: 9 annual maxima are too few for a gumbel fit, which needs at least 10; give "
      "a longer record or a model with fewer parameters");
  EXPECT_EQ(input_error_of([] { tr::require_minimum_maxima(3, "gpd", 15, "tide.csv"); }),
            "tide.csv: 3 declustered exceedances are too few for a gpd fit, which needs at least "
            "15; lower the threshold or give a longer record");
  EXPECT_EQ(input_error_of([] { (void)tr::minimum_maxima("weibull"); }),
            "model: 'weibull' is not a model tidewright fits; use gumbel, gev, rlargest or gpd");
}

// R evd's `sealevel`: annual maxima at Dover and Harwich, 1912-1992, with NA years. Rscript
// writes the CSV and, as the check values, the years R counts as missing and the sum of the
// rest (printed with 17 significant digits).
TEST(AnnualMaximaReference, ReadsEvdSealevelWithMissingYears) {
  tidewright::testing::TempDir dir;
  const auto csv = dir / "sealevel.csv";
  const std::string script =
      "library(evd); data(sealevel); "
      "d <- data.frame(year = as.integer(rownames(sealevel)), dover = sealevel$dover, "
      "harwich = sealevel$harwich); "
      "write.csv(d, '" +
      csv.string() +
      "', row.names = FALSE); "
      "for (s in c('dover', 'harwich')) { x <- d[[s]]; "
      "cat(s, sum(!is.na(x)), sprintf('%.17g', sum(x, na.rm = TRUE)), d$year[is.na(x)], '\\n') }";
  const auto r = tr::testing::run_rscript(script);
  ASSERT_EQ(r.exit_code, 0);
  std::istringstream expected(r.out);
  for (const std::string station : {"dover", "harwich"}) {
    std::string line;
    ASSERT_TRUE(std::getline(expected, line)) << r.out;
    std::istringstream fields(line);
    std::string name;
    std::size_t count = 0;
    double sum = 0.0;
    fields >> name >> count >> sum;
    std::vector<int> missing_years;
    for (int y = 0; fields >> y;) missing_years.push_back(y);
    ASSERT_EQ(name, station);

    tr::ReadOptions o;
    o.level_column = station;
    o.datum = "as in evd::sealevel";
    const auto am = tr::read_annual_maxima(csv, o);
    EXPECT_EQ(am.size(), count) << station;
    EXPECT_NEAR(std::accumulate(am.level_m.begin(), am.level_m.end(), 0.0), sum, 1e-12) << station;
    std::vector<int> dropped;
    for (const auto& d : am.dropped) dropped.push_back(d.year);
    EXPECT_EQ(dropped, missing_years) << station;
    EXPECT_EQ(am.cleaning.rows_read, 81U);
    EXPECT_EQ(am.cleaning.missing, missing_years.size());
    if (station == "dover") {
      EXPECT_THAT(am.summary(),
                  HasSubstr(": 72 annual maxima 1912-1992; datum: as in evd::sealevel\n"
                            "  81 rows read, 9 missing, 0 sentinels\n"
                            "  9 years dropped: no value in the file: 1925, 1927, 1929, 1930, "
                            "1932, 1933, 1937, 1978, 1986\n"));
    }
  }
}

// R evd's `venice`: the ten largest sea levels (cm) of each year 1931-1981; 1935 has six.
TEST(AnnualMaximaReference, ReadsEvdVeniceAsRLargestInCentimetres) {
  tidewright::testing::TempDir dir;
  const auto csv = dir / "venice.csv";
  const std::string script =
      "library(evd); data(venice); v <- as.data.frame(venice); names(v) <- paste0('r', 1:10); "
      "d <- cbind(year = as.integer(rownames(venice)), v); "
      "write.csv(d, '" +
      csv.string() +
      "', row.names = FALSE); "
      "cat(nrow(d), sum(!is.na(venice)), sprintf('%.17g', sum(venice, na.rm = TRUE)), "
      "sum(!is.na(venice[rownames(venice) == '1935', ])), '\\n')";
  const auto r = tr::testing::run_rscript(script);
  ASSERT_EQ(r.exit_code, 0);
  std::istringstream expected(r.out);
  std::size_t years = 0;
  std::size_t values = 0;
  double sum_cm = 0.0;
  std::size_t in_1935 = 0;
  expected >> years >> values >> sum_cm >> in_1935;
  ASSERT_EQ(years, 51U) << r.out;

  tr::ReadOptions o;
  o.level_column = "r1";
  for (int k = 2; k <= 10; ++k) o.r_largest_columns.push_back("r" + std::to_string(k));
  o.unit = "cm";
  const auto am = tr::read_annual_maxima(csv, o);
  ASSERT_EQ(am.size(), years);
  std::size_t n = 0;
  double sum_m = 0.0;
  for (const auto& r_values : am.r_largest_m) {
    n += r_values.size();
    sum_m += std::accumulate(r_values.begin(), r_values.end(), 0.0);
  }
  EXPECT_EQ(n, values);
  EXPECT_NEAR(sum_m, sum_cm * 0.01, 1e-9);
  EXPECT_EQ(am.r_largest_m[1935 - 1931].size(), in_1935);
  EXPECT_EQ(am.level_m[0], am.r_largest_m[0][0]);
}
