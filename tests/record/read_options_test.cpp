// Units of record files: metres inside.
#include "tidewright/record/read_options.hpp"

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
