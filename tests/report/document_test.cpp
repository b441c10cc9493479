// The report document: HTML that is self-contained, escaped and balanced (checked by Python's
// html.parser and xml.etree), the cautions in it, Markdown and RFC 4180 CSV of the same tables.
#include "tidewright/report/document.hpp"

#include <gtest/gtest.h>

#include <algorithm>

#include "report/report_probe.hpp"
#include "support/run_cli.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/report/cautions.hpp"
#include "tidewright/report/plots.hpp"
#include "tidewright/report/text_table.hpp"

namespace tr = tidewright::report;
namespace tt = tidewright::testing;

namespace {

tr::ReportDocument small_document() {
  tr::ReportDocument doc;
  doc.site_name = "Harbour <North> & \"Quay\" 'B'";
  doc.date = "2026-12-01";
  doc.tool_version = "tidewright 0.1.0";
  doc.summary = "Levels are metres above CD.";
  tr::Table t{"design_heights",
              "Design heights, a < b.",
              {{"Year", ""}, {"Design height", "m above CD"}},
              {}};
  t.add_row({"2050", "2.91"});
  t.add_row({"2100", "3.40"});
  tr::Table odd{"odd_cells", "Cells that need quoting.", {{"Note", ""}, {"Value", "m"}}, {}};
  odd.add_row({"a, \"b\"", "1.0"});
  odd.add_row({"x | y", "\u22120.2"});
  tr::Section answers{"Answers",
                      {tr::Paragraph{"First <b>answer</b> & more."}, std::move(t),
                       tr::BulletList{{"one", "two & three"}}}};
  tr::Section evidence{"Evidence", {tr::Subheading{"Fit"}, std::move(odd)}};
  evidence.blocks.emplace_back(
      tr::Figure{"allowance", "Allowance by year.",
                 tr::allowance_plot({2030, 2050, 2100}, {{"Scenario A", {0.1, 0.2, 0.5}}})});
  evidence.blocks.emplace_back(
      tr::Figure{"allowance_b", "Allowance again.",
                 tr::allowance_plot({2030, 2050, 2100}, {{"Scenario B", {0.2, 0.3, 0.6}}})});
  doc.sections = {std::move(answers), std::move(evidence)};
  doc.inputs = {{"Record", "gauge.csv"}};
  doc.assumptions = {"Stationary storms."};
  doc.methods = {{"Gumbel fit", "Return levels.", "Coles (2001)."}};
  doc.extra_cautions = {"The record has gaps > 10%."};
  return doc;
}

std::size_t count(const std::string& s, const std::string& what) {
  std::size_t n = 0;
  for (auto p = s.find(what); p != std::string::npos; p = s.find(what, p + 1)) ++n;
  return n;
}

}  // namespace

TEST(HtmlEscape, EscapesTheFiveSpecialCharacters) {
  EXPECT_EQ(tr::html_escape("<a href='x'>&\"</a>"),
            "&lt;a href=&#39;x&#39;&gt;&amp;&quot;&lt;/a&gt;");
  EXPECT_EQ(tr::html_escape("plain \u2212 text"), "plain \u2212 text");
}

TEST(HtmlReport, EscapesAllCallerText) {
  const std::string html = tr::render_html(small_document());
  EXPECT_NE(html.find("Harbour &lt;North&gt; &amp; &quot;Quay&quot; &#39;B&#39;"),
            std::string::npos);
  EXPECT_EQ(html.find("<North>"), std::string::npos);
  EXPECT_NE(html.find("First &lt;b&gt;answer&lt;/b&gt; &amp; more."), std::string::npos);
  EXPECT_NE(html.find("gaps &gt; 10%"), std::string::npos);
}

TEST(HtmlReport, IsSelfContained) {
  const std::string html = tr::render_html(small_document());
  // No network and no files: no URLs, no src attributes, no linked style sheets or scripts, no
  // CSS url() other than references to ids in the same page.
  for (const char* bad :
       {"http:", "https:", "src=", "<link", "@import", "<script", "<img", "file:"}) {
    EXPECT_EQ(html.find(bad), std::string::npos) << bad;
  }
  // Every url( and href= points into the page (#id) or is an inline PNG.
  for (const std::string key : {"url(", "href=\""}) {
    for (auto at = html.find(key); at != std::string::npos; at = html.find(key, at + 1)) {
      const std::string rest = html.substr(at + key.size(), 22);
      EXPECT_TRUE(rest[0] == '#' || rest == "data:image/png;base64,") << key << rest;
    }
  }
  EXPECT_GT(count(html, "href=\"#"), 0U);  // the contents links are there to be checked
}

TEST(HtmlReport, IsBalancedWithWellFormedInlineSvg) {
  tt::TempDir tmp;
  tr::write_html(small_document(), tmp / "report.html", false);
  const auto r = tt::probe_report_file("html", tmp / "report.html");
  ASSERT_TRUE(r.contains("errors"));
  EXPECT_TRUE(r["errors"].empty()) << r["errors"].dump();
  ASSERT_EQ(r["svgs"].size(), 2U);
  const auto& texts = r["svgs"][0]["texts"];
  EXPECT_NE(std::find(texts.begin(), texts.end(), "Sea-level allowance"), texts.end());
  // Two charts on one page: their clip-path ids differ.
  const std::string html = tt::read_all(tmp / "report.html");
  EXPECT_EQ(count(html, "id=\"fig1-plot-area\""), 1U);
  EXPECT_EQ(count(html, "id=\"fig2-plot-area\""), 1U);
  // An existing report is not replaced without force.
  EXPECT_THROW(tr::write_html(small_document(), tmp / "report.html", false),
               tidewright::InputError);
}

TEST(HtmlReport, CarriesEveryCautionInTheCautionsBox) {
  const std::string html = tr::render_html(small_document());
  const auto box = html.find("<section id=\"cautions\" class=\"cautions\">");
  ASSERT_NE(box, std::string::npos);
  for (const auto& c : tr::safety_cautions()) {
    const auto at = html.find(tr::html_escape(c));
    EXPECT_NE(at, std::string::npos) << c;
    EXPECT_GT(at, box) << c;
  }
  EXPECT_GT(html.find("The record has gaps"), box);
}

TEST(HtmlReport, PartsComeInTheFixedOrder) {
  const std::string html = tr::render_html(small_document());
  const std::vector<std::string> order{"class=\"title-block\"",
                                       "<h2>Answers</h2>",
                                       "<h2>Evidence</h2>",
                                       "<h2>Inputs and assumptions</h2>",
                                       "<h2>Methods and references</h2>",
                                       "<h2>Cautions</h2>"};
  std::size_t last = 0;
  for (const auto& part : order) {
    const auto at = html.find(part);
    ASSERT_NE(at, std::string::npos) << part;
    EXPECT_GT(at, last) << part;
    last = at;
  }
  EXPECT_NE(html.find("<th scope=\"col\">Design height (m above CD)</th>"), std::string::npos);
  EXPECT_NE(html.find("<td class=\"num\">2.91</td>"), std::string::npos);
  EXPECT_NE(html.find("<td class=\"num\">\u22120.2</td>"), std::string::npos);
  EXPECT_NE(html.find("<b>Table 2.</b> Cells that need quoting."), std::string::npos);
  EXPECT_NE(html.find("<b>Figure 2.</b> Allowance again."), std::string::npos);
  EXPECT_NE(html.find("<dd>2026-12-01</dd>"), std::string::npos);
  EXPECT_NE(html.find("<dd>tidewright 0.1.0</dd>"), std::string::npos);
}

TEST(HtmlReport, SameDocumentGivesIdenticalBytes) {
  EXPECT_EQ(tr::render_html(small_document()), tr::render_html(small_document()));
  EXPECT_EQ(tr::render_markdown(small_document()), tr::render_markdown(small_document()));
}

TEST(MarkdownReport, HasTheSamePartsEscaped) {
  const std::string md = tr::render_markdown(small_document(), "plots");
  EXPECT_NE(md.find("## Answers\n"), std::string::npos);
  EXPECT_NE(md.find("| Year | Design height (m above CD) |\n| --- | --- |\n| 2050 | 2.91 |"),
            std::string::npos);
  EXPECT_NE(md.find("x \\| y"), std::string::npos);
  EXPECT_NE(md.find("](plots/allowance.svg)"), std::string::npos);
  EXPECT_NE(md.find("Harbour \\<North\\>"), std::string::npos);
  for (const auto& c : tr::safety_cautions()) {
    EXPECT_NE(md.find("> - " + std::string(c).substr(0, 20)), std::string::npos) << c;
  }
}

TEST(TableCsv, QuotesFieldsAsRfc4180) {
  tr::Table t{"t", "", {{"Note", ""}, {"Level", "m above CD"}}, {}};
  t.add_row({"a, \"b\"", "1.0"});
  t.add_row({"plain", "2.0"});
  // RFC 4180, 2.6-2.7: fields with commas or quotes are quoted, quotes doubled.
  EXPECT_EQ(tr::table_csv(t), "Note,Level (m above CD)\n\"a, \"\"b\"\"\",1.0\nplain,2.0\n");
  EXPECT_THROW(t.add_row({"only one"}), tidewright::InputError);
}

TEST(TableCsv, NumbersOnlyFormReplacesTheDisplayCells) {
  tr::Table t{"t", "", {{"Future return period", "years"}, {"Factor", ""}}, {}};
  t.add_row({"< 1.16", "> 8.6"});
  t.csv_columns = {"future_return_period_yr", "amplification_factor_above"};
  t.add_csv_row({"", "8.6"});
  EXPECT_EQ(tr::table_csv(t), "future_return_period_yr,amplification_factor_above\n,8.6\n");
  EXPECT_THROW(t.add_csv_row({"1"}), tidewright::InputError);
  // The HTML keeps the display cells.
  EXPECT_NE(tr::render_html(tr::ReportDocument{.sections = {{"S", {t}}}}).find("&lt; 1.16"), std::string::npos);
}

TEST(TableCsv, WritesEveryTableAndRefusesBadNames) {
  tt::TempDir tmp;
  const auto doc = small_document();
  const auto paths = tr::write_tables_csv(doc, tmp.path(), false);
  ASSERT_EQ(paths.size(), 2U);
  EXPECT_EQ(tt::read_all(tmp / "design_heights.csv"),
            "Year,Design height (m above CD)\n2050,2.91\n2100,3.40\n");
  EXPECT_THROW((void)tr::write_tables_csv(doc, tmp.path(), false), tidewright::InputError);
  EXPECT_NO_THROW((void)tr::write_tables_csv(doc, tmp.path(), true));

  auto dup = doc;
  std::get<tr::Table>(dup.sections[1].blocks[1]).name = "design_heights";
  tt::TempDir empty;
  EXPECT_THROW((void)tr::write_tables_csv(dup, empty.path(), false), tidewright::InputError);
  EXPECT_TRUE(std::filesystem::is_empty(empty.path()));  // nothing written before the check
  std::get<tr::Table>(dup.sections[1].blocks[1]).name = "../escape";
  EXPECT_THROW((void)tr::write_tables_csv(dup, empty.path(), false), tidewright::InputError);
}

TEST(Figures, WriteSvgAndPngPerFigure) {
  tt::TempDir tmp;
  const auto paths = tr::write_figures(small_document(), tmp.path(), false);
  ASSERT_EQ(paths.size(), 4U);
  const auto svg = tt::probe_report_file("svg", tmp / "allowance.svg");
  const auto& texts = svg["texts"];
  EXPECT_NE(std::find(texts.begin(), texts.end(), "Sea-level allowance"), texts.end());
  const auto png = tt::probe_report_file("png", tmp / "allowance.png");
  EXPECT_EQ(png.value("width", 0), 720);
  EXPECT_EQ(png.value("height", 0), 450);
}

TEST(Significant, WidelyRangingNumbers) {
  EXPECT_EQ(tr::significant(4249.0, 3), "4250");
  EXPECT_EQ(tr::significant(3641922.4, 3), "3.64 \u00d7 10\u2076");
  EXPECT_EQ(tr::significant(0.012345, 3), "0.0123");
  EXPECT_EQ(tr::significant(9.996, 3), "10.0");
  EXPECT_EQ(tr::significant(-2.5, 2), "\u22122.5");
  EXPECT_EQ(tr::significant(NAN, 3), "\u2014");
}
