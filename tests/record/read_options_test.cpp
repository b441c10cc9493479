// Units of record files: metres inside.
#include "tidewright/record/read_options.hpp"

#include "tidewright/record/annual_maxima.hpp"
#include "tidewright/record/level_plausibility.hpp"

#include <gtest/gtest.h>

#include "record/record_test_helpers.hpp"

namespace tr = tidewright::record;

TEST(RecordUnits, ConversionFactors) {
  EXPECT_EQ(tr::metres_per_unit("m"), 1.0);
  EXPECT_EQ(tr::metres_per_unit("cm"), 0.01);
  EXPECT_EQ(tr::metres_per_unit("mm"), 0.001);
  // The international foot is exactly 0.3048 m (international yard and pound agreement, 1959).
  EXPECT_EQ(tr::metres_per_unit("ft"), 0.3048);
  EXPECT_EQ(tr::metres_per_unit(" FT "), 0.3048);
  EXPECT_EQ(tr::accepted_units(), "m, cm, mm, ft");
}

TEST(RecordUnits, UnknownUnitNamesTheAcceptedOnes) {
  EXPECT_EQ(tr::testing::input_error_of([] { (void)tr::metres_per_unit("inch", "--unit"); }),
            "--unit: unit 'inch' is not one tidewright reads; use one of m, cm, mm, ft");
}

// The unit a column name states: its last word, when it is a unit and not the whole name.
TEST(RecordPlausibility, UnitInColumnName) {
  EXPECT_EQ(tr::unit_in_column_name("level_cm"), "cm");
  EXPECT_EQ(tr::unit_in_column_name("Height (mm)"), "mm");
  EXPECT_EQ(tr::unit_in_column_name("wl_feet"), "ft");
  EXPECT_EQ(tr::unit_in_column_name("level_m"), "m");
  EXPECT_EQ(tr::unit_in_column_name("level"), std::nullopt);
  EXPECT_EQ(tr::unit_in_column_name("m"), std::nullopt);
  EXPECT_EQ(tr::unit_in_column_name("cm_level"), std::nullopt);
}

// An undeclared 9999 among 2 m levels is refused at its line, declared as a sentinel it is
// dropped, and accepted on purpose it is read; the threshold is 20 m from the median.
TEST(RecordPlausibility, FarLevelsAreRefusedUnlessDeclaredOrAccepted) {
  const std::string text = "year,level\n1990,2.1\n1991,2.3\n1992,2.2\n1993,2.4\n1994,9999\n1995,2.0\n";
  tr::ReadOptions o;
  EXPECT_EQ(tr::testing::input_error_of([&] { (void)tr::parse_annual_maxima(text, "am.csv", o); }),
            "am.csv:6: level 9999 m lies more than 20 m from the record's median 2.3 m (1 such value): a no-data "
            "value or another unit; declare no-data values (--sentinel 9999), check the unit (--units) and that "
            "it is one unit throughout, or accept the record on purpose (--accept-implausible-levels)");
  tr::ReadOptions declared;
  declared.missing.sentinels = {9999.0};
  EXPECT_EQ(tr::parse_annual_maxima(text, "am.csv", declared).size(), 5U);
  tr::ReadOptions accepted;
  accepted.accept_implausible_levels = true;
  EXPECT_EQ(tr::parse_annual_maxima(text, "am.csv", accepted).size(), 6U);
  // 22.2 m lies 19.9 m from the median 2.3 m: plausible by the rule.
  const std::string near = "year,level\n1990,2.1\n1991,2.3\n1992,2.2\n1993,2.4\n1994,22.2\n1995,2.0\n";
  EXPECT_EQ(tr::parse_annual_maxima(near, "am.csv", o).size(), 6U);
}
