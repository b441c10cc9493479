// The report as a document model, and its renderings: one self-contained HTML file (inline
// CSS and SVG, no script, no network), the same document in Markdown, and its tables as CSV.
//
// The writer fixes the order of the closing parts so that every report reads the same way:
// title block → the caller's sections (answers first, then evidence) → inputs and
// assumptions → methods with references → cautions (report::safety_cautions() and any
// site-specific ones). All text is given unescaped; the renderers escape it.
#pragma once

#include <filesystem>
#include <string>
#include <string_view>
#include <variant>
#include <vector>

#include "tidewright/report/canvas.hpp"

namespace tidewright::report {

struct TableColumn {
  std::string title{};  // e.g. "Design height"
  std::string unit{};   // with the datum for levels, e.g. "m above CD"; empty if dimensionless
  [[nodiscard]] std::string header() const;  // "Design height (m above CD)"
};

struct Table {
  std::string name{};     // file stem of its CSV, e.g. "design_heights" (letters, digits, - and _)
  std::string caption{};  // one sentence saying what the rows are
  std::vector<TableColumn> columns{};
  std::vector<std::vector<std::string>> rows{};  // cell text (format numbers with fixed())
  // A numbers-only form for the CSV, for tables whose cells hold bounds or words ("< 1",
  // "not by 2150") a script cannot read: when csv_columns is set, table_csv writes these
  // (snake_case names with units, an empty cell where there is no number) instead of the cells.
  std::vector<std::string> csv_columns{};
  std::vector<std::vector<std::string>> csv_rows{};

  // Throw InputError when the row's width differs from the columns'.
  void add_row(std::vector<std::string> cells);
  void add_csv_row(std::vector<std::string> cells);
};

struct Figure {
  std::string name{};     // file stem of its SVG and PNG, e.g. "return_levels"
  std::string caption{};  // what the figure shows, with its data source
  Canvas canvas;
};

struct Paragraph {
  std::string text{};
};
struct BulletList {
  std::vector<std::string> items{};
};
struct Subheading {
  std::string text{};
};

using Block = std::variant<Paragraph, BulletList, Subheading, Table, Figure>;

struct Section {
  std::string heading{};
  std::vector<Block> blocks{};
};

struct InputItem {
  std::string name{};   // e.g. "Record"
  std::string value{};  // e.g. "demo_coast/gauge.csv, hourly, 1975-2024"
};

struct MethodReference {
  std::string method{};       // e.g. "Generalised extreme value fit"
  std::string description{};  // how the tool uses it
  std::string reference{};    // the published source
};

struct ReportDocument {
  std::string title = "Sea-level planning report";
  std::string site_name{};
  std::string date{};          // passed in by the caller (ISO 8601), so output is reproducible
  std::string tool_version{};  // e.g. "tidewright 0.1.0"
  std::string summary{};       // optional lead paragraph
  std::vector<Section> sections{};
  std::vector<InputItem> inputs{};
  std::vector<std::string> assumptions{};
  std::vector<MethodReference> methods{};
  std::vector<std::string> extra_cautions{};  // site-specific, after the standard cautions
};

// Escapes & < > " ' for HTML text and attribute values.
[[nodiscard]] std::string html_escape(std::string_view text);

[[nodiscard]] std::string render_html(const ReportDocument& doc);
// Figures are linked as `<figure_dir>/<name>.svg` (write them with write_figures).
[[nodiscard]] std::string render_markdown(const ReportDocument& doc,
                                          std::string_view figure_dir = "plots");
// RFC 4180 CSV: the header row (titles with units) then the rows, CRLF-free ("\n" endings).
[[nodiscard]] std::string table_csv(const Table& table);

// Every table of the document, in document order.
[[nodiscard]] std::vector<const Table*> tables_of(const ReportDocument& doc);
[[nodiscard]] std::vector<const Figure*> figures_of(const ReportDocument& doc);

// Writers through common/atomic_output.hpp; each refuses an existing file unless `force`.
void write_html(const ReportDocument& doc, const std::filesystem::path& file, bool force);
void write_markdown(const ReportDocument& doc, const std::filesystem::path& file, bool force,
                    std::string_view figure_dir = "plots");
// `<dir>/<table name>.csv` for every table; returns the paths written. Throws InputError on a
// bad or repeated table name before writing anything.
std::vector<std::filesystem::path> write_tables_csv(const ReportDocument& doc,
                                                    const std::filesystem::path& dir, bool force);
// `<dir>/<figure name>.svg` and `.png` for every figure; returns the paths written.
std::vector<std::filesystem::path> write_figures(const ReportDocument& doc,
                                                 const std::filesystem::path& dir, bool force);

}  // namespace tidewright::report
