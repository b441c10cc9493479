// The CSV reader names the file and line of every problem it finds.
#include "tidewright/common/csv.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <fstream>

#include "support/run_cli.hpp"
#include "tidewright/common/error.hpp"

using tidewright::CsvTable;
using tidewright::InputError;
using tidewright::MissingValues;
using ::testing::HasSubstr;

namespace {
std::string message_of(const std::string& text) {
  try {
    auto t = CsvTable::parse(text, "gauge.csv");
    for (const auto& row : t.rows()) {
      for (std::size_t c = 0; c < row.cells.size(); ++c) (void)t.number(row, c);
    }
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}
}  // namespace

TEST(Csv, ReadsHeaderAndRowsWithLineNumbers) {
  const auto t = CsvTable::parse("# comment\nyear,level\n1923,4.03\n\n1924,3.83\n", "x.csv");
  ASSERT_EQ(t.header().size(), 2U);
  ASSERT_EQ(t.rows().size(), 2U);
  EXPECT_EQ(t.header_line(), 2U);
  EXPECT_EQ(t.rows()[0].line, 3U);
  EXPECT_EQ(t.rows()[1].line, 5U);
  EXPECT_DOUBLE_EQ(*t.number(t.rows()[1], t.column("LEVEL")), 3.83);
}

TEST(Csv, AcceptsBomCrlfAndQuotes) {
  const auto t = CsvTable::parse("\xEF\xBB\xBFtime,\"level, m\"\r\n\"2020-01-01\",\"1.5\"\r\n", "x.csv");
  EXPECT_EQ(t.header()[0], "time");
  EXPECT_EQ(t.header()[1], "level, m");
  EXPECT_EQ(t.rows()[0].cells[0], "2020-01-01");
  EXPECT_DOUBLE_EQ(*t.number(t.rows()[0], 1), 1.5);
}

TEST(Csv, BadNumberNamesFileLineAndColumn) {
  const auto m = message_of("year,level\n1923,4.03\n1924,4,1\n");
  EXPECT_THAT(m, HasSubstr("gauge.csv:3"));
  EXPECT_THAT(m, HasSubstr("3 cells but the header has 2"));
  const auto m2 = message_of("year,level\n1923,4.03\n1924,four\n");
  EXPECT_THAT(m2, HasSubstr("gauge.csv:3: column 'level' holds 'four'"));
}

TEST(Csv, InfinityIsNotANumberHere) {
  EXPECT_THAT(message_of("a\ninf\n"), HasSubstr("gauge.csv:2"));
  EXPECT_THAT(message_of("a\n1e999\n"), HasSubstr("gauge.csv:2"));
}

TEST(Csv, MissingMarkersAndSentinels) {
  const auto t = CsvTable::parse("v\nNA\n\n-99\nnan\n2.5\n", "x.csv");
  MissingValues missing;
  missing.sentinels = {-99.0};
  ASSERT_EQ(t.rows().size(), 4U);  // the blank line is skipped
  EXPECT_FALSE(t.number(t.rows()[0], 0, missing).has_value());
  EXPECT_FALSE(t.number(t.rows()[1], 0, missing).has_value());
  EXPECT_FALSE(t.number(t.rows()[2], 0, missing).has_value());
  EXPECT_DOUBLE_EQ(*t.number(t.rows()[3], 0, missing), 2.5);
}

TEST(Csv, MissingColumnListsTheColumnsThereAre) {
  const auto t = CsvTable::parse("year,level\n1,2\n", "gauge.csv");
  try {
    (void)t.column("height");
    FAIL() << "expected an InputError";
  } catch (const InputError& e) {
    EXPECT_THAT(std::string(e.what()), HasSubstr("gauge.csv:1: has no column 'height' (columns: year, level)"));
  }
}

TEST(Csv, RefusesBinaryAndBadEncodingAndEmpty) {
  EXPECT_THAT(message_of(std::string("a\n1\0\n", 5)), HasSubstr("gauge.csv:2: holds a NUL byte"));
  EXPECT_THAT(message_of("a\n\xff\xfe\n"), HasSubstr("gauge.csv:2: is not valid UTF-8"));
  EXPECT_THAT(message_of(""), HasSubstr("gauge.csv: is empty"));
  EXPECT_THAT(message_of("a\n\"open\n"), HasSubstr("never closed"));
  EXPECT_THAT(message_of("a,A\n1,2\n"), HasSubstr("appears twice"));
}

TEST(Csv, UnreadableFileIsAnInputError) {
  tidewright::testing::TempDir dir;
  EXPECT_THROW((void)CsvTable::read(dir / "absent.csv"), InputError);
  EXPECT_THROW((void)CsvTable::read(dir.path()), InputError);
}

// "# key: value" lines before the header are the file's own metadata; later comments and
// comments that are not "one-word key: value" are not.
TEST(Csv, MetadataLinesBeforeTheHeader) {
  const auto t = CsvTable::parse(
      "# tidewright members: a sentence, not a key\n# scenario: midway\n#reference_period: "
      "1995-2014\n"
      "# scenario: second\nyear,level\n# late: no\n2000,1.0\n",
      "m.csv");
  ASSERT_NE(t.metadata("scenario"), nullptr);
  EXPECT_EQ(t.metadata("scenario")->value, "midway");  // the first one counts
  EXPECT_EQ(t.metadata("scenario")->line, 2U);
  ASSERT_NE(t.metadata("reference_period"), nullptr);
  EXPECT_EQ(t.metadata("reference_period")->value, "1995-2014");
  EXPECT_EQ(t.metadata("late"), nullptr);
  EXPECT_EQ(t.metadata("tidewright members"), nullptr);
  EXPECT_EQ(t.rows().size(), 1U);
}
