#include "tidewright/report/document.hpp"

#include <cctype>
#include <set>

#include "tidewright/common/atomic_output.hpp"
#include "tidewright/common/csv.hpp"
#include "tidewright/common/error.hpp"
#include "tidewright/report/cautions.hpp"

namespace tidewright::report {
namespace {

// The report's own style sheet: a narrow reading column, tables with ruled headers, numbers in
// tabular figures, a cautions box that stands out. Local fonts only (no web fonts).
constexpr std::string_view style_sheet = R"css(
:root { --ink: #1f2328; --muted: #59636e; --rule: #d0d7de; --head: #f3f5f7;
        --accent: #0b4f6c; --warn: #d55e00; --warn-bg: #fff5eb; }
* { box-sizing: border-box; }
body { margin: 0; color: var(--ink); background: #ffffff;
       font: 16px/1.5 "DejaVu Sans", "Segoe UI", Helvetica, Arial, sans-serif; }
main { max-width: 980px; margin: 0 auto; padding: 24px 28px 48px; }
header.title-block { border-bottom: 3px solid var(--accent); padding-bottom: 12px; margin-bottom: 20px; }
.kicker { margin: 0; color: var(--accent); font-weight: bold; letter-spacing: 0.04em;
          text-transform: uppercase; font-size: 13px; }
h1 { margin: 4px 0 8px; font-size: 30px; line-height: 1.2; }
h2 { margin: 36px 0 10px; font-size: 22px; color: var(--accent);
     border-bottom: 1px solid var(--rule); padding-bottom: 4px; }
h3 { margin: 24px 0 8px; font-size: 18px; }
dl.meta { display: grid; grid-template-columns: max-content 1fr; gap: 2px 14px; margin: 0;
          font-size: 14px; color: var(--muted); }
dl.meta dt { font-weight: bold; }
dl.meta dd { margin: 0; }
p.lead { font-size: 17px; }
.note { font-size: 14px; border-left: 4px solid var(--warn); padding: 6px 12px;
        background: var(--warn-bg); margin: 14px 0 0; }
nav.contents ol { margin: 4px 0; padding-left: 24px; columns: 2; font-size: 15px; }
a { color: var(--accent); }
table { border-collapse: collapse; margin: 12px 0 22px; font-size: 14px; min-width: 50%; }
caption { caption-side: top; text-align: left; font-size: 14px; color: var(--muted);
          padding-bottom: 6px; }
caption b { color: var(--ink); }
th, td { border-bottom: 1px solid var(--rule); padding: 5px 12px; text-align: left;
         vertical-align: top; }
thead th { background: var(--head); border-bottom: 2px solid var(--ink); }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
figure { margin: 16px 0 26px; }
figure svg { display: block; max-width: 100%; height: auto; border: 1px solid var(--rule); }
figcaption { font-size: 14px; color: var(--muted); margin-top: 6px; max-width: 720px; }
figcaption b { color: var(--ink); }
ol.references li { margin-bottom: 8px; }
cite { font-style: normal; color: var(--muted); }
section.cautions { border: 2px solid var(--warn); background: var(--warn-bg); border-radius: 6px;
                   padding: 4px 20px 12px; margin-top: 36px; }
section.cautions h2 { color: var(--warn); border-bottom-color: var(--warn); }
footer { margin-top: 30px; font-size: 13px; color: var(--muted); }
@media print { main { max-width: none; padding: 0; } figure, table { break-inside: avoid; } }
)css";

bool looks_numeric(const std::string& s) {
  if (s.empty()) return false;
  // A bound such as "< 1" or "> 0.999999" aligns with the numbers of its column.
  if (s.size() > 2 && (s[0] == '<' || s[0] == '>') && s[1] == ' ') return looks_numeric(s.substr(2));
  const auto c = static_cast<unsigned char>(s[0]);
  return std::isdigit(c) || ((c == '-' || c == '+' || c == '.') && s.size() > 1) ||
         s.rfind("\u2212", 0) == 0 || s == "\u2014";
}

void check_name(const std::string& kind, const std::string& name, std::set<std::string>& seen) {
  const bool ok = !name.empty() && name.find_first_not_of(
                                       "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ"
                                       "0123456789-_") == std::string::npos;
  if (!ok) {
    throw InputError("report " + kind + " '" + name + "'", "the name is not a plain file stem",
                     "use letters, digits, '-' and '_' only");
  }
  if (!seen.insert(name).second) {
    throw InputError("report " + kind + " '" + name + "'", "two " + kind + "s have this name",
                     "give every " + kind + " its own name");
  }
}

std::vector<std::string_view> all_cautions(const ReportDocument& doc) {
  std::vector<std::string_view> out(safety_cautions().begin(), safety_cautions().end());
  for (const auto& c : doc.extra_cautions) out.emplace_back(c);
  return out;
}

std::string md_escape(std::string_view text) {
  std::string out;
  for (char c : text) {
    if (std::string_view("\\`*_[]<>|#").find(c) != std::string_view::npos) out += '\\';
    out += c;
  }
  return out;
}

// Every block of type T in document order.
template <class T>
std::vector<const T*> blocks_of(const ReportDocument& doc) {
  std::vector<const T*> out;
  for (const auto& s : doc.sections) {
    for (const auto& b : s.blocks) {
      if (const auto* t = std::get_if<T>(&b)) out.push_back(t);
    }
  }
  return out;
}

}  // namespace

std::string TableColumn::header() const { return unit.empty() ? title : title + " (" + unit + ")"; }

namespace {
void append_row(std::vector<std::vector<std::string>>& rows, std::vector<std::string> cells, std::size_t width,
                const std::string& table, const char* kind) {
  if (cells.size() != width) {
    throw InputError("report table '" + table + "'",
                     std::string("a ") + kind + "row has " + std::to_string(cells.size()) + " cells for " +
                         std::to_string(width) + " " + kind + "columns",
                     std::string("give one cell per ") + kind + "column");
  }
  rows.push_back(std::move(cells));
}
}  // namespace

void Table::add_row(std::vector<std::string> cells) { append_row(rows, std::move(cells), columns.size(), name, ""); }

void Table::add_csv_row(std::vector<std::string> cells) {
  append_row(csv_rows, std::move(cells), csv_columns.size(), name, "CSV ");
}

std::string html_escape(std::string_view text) { return xml_escape(text); }

std::vector<const Table*> tables_of(const ReportDocument& doc) { return blocks_of<Table>(doc); }
std::vector<const Figure*> figures_of(const ReportDocument& doc) { return blocks_of<Figure>(doc); }

std::string render_html(const ReportDocument& doc) {
  const auto e = [](std::string_view s) { return html_escape(s); };
  std::string o;
  o += "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n";
  o += "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n";
  o += "<title>" + e(doc.title) + (doc.site_name.empty() ? "" : " \u2014 " + e(doc.site_name)) +
       "</title>\n";
  o += "<style>" + std::string(style_sheet) + "</style>\n</head>\n<body>\n<main>\n";
  o += "<header class=\"title-block\">\n<p class=\"kicker\">" + e(doc.title) + "</p>\n";
  o += "<h1>" + e(doc.site_name.empty() ? doc.title : doc.site_name) + "</h1>\n<dl class=\"meta\">";
  if (!doc.date.empty()) o += "<dt>Date</dt><dd>" + e(doc.date) + "</dd>";
  if (!doc.tool_version.empty()) o += "<dt>Produced with</dt><dd>" + e(doc.tool_version) + "</dd>";
  o +=
      "</dl>\n<p class=\"note\">Planning estimates, not design certificates: read the "
      "<a href=\"#cautions\">cautions</a> before using any number in this report.</p>\n</header>\n";
  if (!doc.summary.empty()) o += "<p class=\"lead\">" + e(doc.summary) + "</p>\n";

  o += "<nav class=\"contents\"><h2>Contents</h2><ol>\n";
  for (std::size_t i = 0; i < doc.sections.size(); ++i) {
    o += "<li><a href=\"#section-" + std::to_string(i + 1) + "\">" + e(doc.sections[i].heading) +
         "</a></li>\n";
  }
  o += "<li><a href=\"#inputs\">Inputs and assumptions</a></li>\n";
  o += "<li><a href=\"#methods\">Methods and references</a></li>\n";
  o += "<li><a href=\"#cautions\">Cautions</a></li>\n</ol></nav>\n";

  int table_no = 0, figure_no = 0;
  for (std::size_t i = 0; i < doc.sections.size(); ++i) {
    const Section& s = doc.sections[i];
    o += "<section id=\"section-" + std::to_string(i + 1) + "\">\n<h2>" + e(s.heading) + "</h2>\n";
    for (const auto& b : s.blocks) {
      if (const auto* p = std::get_if<Paragraph>(&b)) {
        o += "<p>" + e(p->text) + "</p>\n";
      } else if (const auto* l = std::get_if<BulletList>(&b)) {
        o += "<ul>\n";
        for (const auto& item : l->items) o += "<li>" + e(item) + "</li>\n";
        o += "</ul>\n";
      } else if (const auto* h = std::get_if<Subheading>(&b)) {
        o += "<h3>" + e(h->text) + "</h3>\n";
      } else if (const auto* t = std::get_if<Table>(&b)) {
        ++table_no;
        o += "<table id=\"table-" + e(t->name) + "\">\n<caption><b>Table " +
             std::to_string(table_no) + ".</b> " + e(t->caption) + "</caption>\n<thead><tr>";
        for (const auto& c : t->columns) o += "<th scope=\"col\">" + e(c.header()) + "</th>";
        o += "</tr></thead>\n<tbody>\n";
        for (const auto& row : t->rows) {
          o += "<tr>";
          for (const auto& cell : row) {
            o += std::string(looks_numeric(cell) ? "<td class=\"num\">" : "<td>") + e(cell) +
                 "</td>";
          }
          o += "</tr>\n";
        }
        o += "</tbody>\n</table>\n";
      } else if (const auto* f = std::get_if<Figure>(&b)) {
        ++figure_no;
        o += "<figure id=\"figure-" + e(f->name) + "\">\n";
        o += f->canvas.to_svg("fig" + std::to_string(figure_no), false);
        o += "<figcaption><b>Figure " + std::to_string(figure_no) + ".</b> " + e(f->caption) +
             "</figcaption>\n</figure>\n";
      }
    }
    o += "</section>\n";
  }

  o += "<section id=\"inputs\">\n<h2>Inputs and assumptions</h2>\n";
  if (!doc.inputs.empty()) {
    o += "<table>\n<thead><tr><th scope=\"col\">Input</th><th "
         "scope=\"col\">Value</th></tr></thead>\n<tbody>\n";
    for (const auto& in : doc.inputs)
      o += "<tr><td>" + e(in.name) + "</td><td>" + e(in.value) + "</td></tr>\n";
    o += "</tbody>\n</table>\n";
  }
  if (!doc.assumptions.empty()) {
    o += "<h3>Assumptions</h3>\n<ul>\n";
    for (const auto& a : doc.assumptions) o += "<li>" + e(a) + "</li>\n";
    o += "</ul>\n";
  }
  o += "</section>\n";

  o += "<section id=\"methods\">\n<h2>Methods and references</h2>\n<ol class=\"references\">\n";
  for (const auto& m : doc.methods) {
    o += "<li><b>" + e(m.method) + ".</b> " + e(m.description);
    if (!m.reference.empty()) o += " <cite>" + e(m.reference) + "</cite>";
    o += "</li>\n";
  }
  o += "</ol>\n</section>\n";

  o += "<section id=\"cautions\" class=\"cautions\">\n<h2>Cautions</h2>\n<ul>\n";
  for (const auto& c : all_cautions(doc)) o += "<li>" + e(c) + "</li>\n";
  o += "</ul>\n</section>\n";
  o += "<footer>" + e(doc.tool_version.empty() ? std::string("tidewright") : doc.tool_version);
  if (!doc.date.empty()) o += ", " + e(doc.date);
  o += ".</footer>\n</main>\n</body>\n</html>\n";
  return o;
}

std::string render_markdown(const ReportDocument& doc, std::string_view figure_dir) {
  std::string o = "# " +
                  md_escape(doc.site_name.empty() ? doc.title : doc.title + ": " + doc.site_name) +
                  "\n\n";
  if (!doc.date.empty()) o += "- Date: " + md_escape(doc.date) + "\n";
  if (!doc.tool_version.empty()) o += "- Produced with: " + md_escape(doc.tool_version) + "\n";
  o += "\n> Planning estimates, not design certificates: read the cautions at the end before "
       "using any number in this report.\n\n";
  if (!doc.summary.empty()) o += md_escape(doc.summary) + "\n\n";
  int table_no = 0, figure_no = 0;
  for (const auto& s : doc.sections) {
    o += "## " + md_escape(s.heading) + "\n\n";
    for (const auto& b : s.blocks) {
      if (const auto* p = std::get_if<Paragraph>(&b)) {
        o += md_escape(p->text) + "\n\n";
      } else if (const auto* l = std::get_if<BulletList>(&b)) {
        for (const auto& item : l->items) o += "- " + md_escape(item) + "\n";
        o += "\n";
      } else if (const auto* h = std::get_if<Subheading>(&b)) {
        o += "### " + md_escape(h->text) + "\n\n";
      } else if (const auto* t = std::get_if<Table>(&b)) {
        o += "**Table " + std::to_string(++table_no) + ".** " + md_escape(t->caption) + "\n\n|";
        for (const auto& c : t->columns) o += " " + md_escape(c.header()) + " |";
        o += "\n|";
        for (std::size_t c = 0; c < t->columns.size(); ++c) o += " --- |";
        o += "\n";
        for (const auto& row : t->rows) {
          o += "|";
          for (const auto& cell : row) o += " " + md_escape(cell) + " |";
          o += "\n";
        }
        o += "\n";
      } else if (const auto* f = std::get_if<Figure>(&b)) {
        const std::string label = "Figure " + std::to_string(++figure_no) + ".";
        const std::string caption = md_escape(f->caption);
        o.append("![").append(label).append(" ").append(caption).append("](");
        o.append(figure_dir).append("/").append(f->name).append(".svg)\n\n*");
        o.append(label).append("* ").append(caption).append("\n\n");
      }
    }
  }
  o += "## Inputs and assumptions\n\n";
  for (const auto& in : doc.inputs)
    o += "- " + md_escape(in.name) + ": " + md_escape(in.value) + "\n";
  if (!doc.assumptions.empty()) {
    o += "\n### Assumptions\n\n";
    for (const auto& a : doc.assumptions) o += "- " + md_escape(a) + "\n";
  }
  o += "\n## Methods and references\n\n";
  int n = 0;
  for (const auto& m : doc.methods) {
    o += std::to_string(++n) + ". **" + md_escape(m.method) + ".** " + md_escape(m.description);
    if (!m.reference.empty()) o += " " + md_escape(m.reference);
    o += "\n";
  }
  o += "\n## Cautions\n\n";
  for (const auto& c : all_cautions(doc)) o += "> - " + md_escape(c) + "\n";
  return o;
}

std::string table_csv(const Table& table) {
  std::string o;
  const bool numeric = !table.csv_columns.empty();
  if (numeric) {
    for (std::size_t i = 0; i < table.csv_columns.size(); ++i) o += (i ? "," : "") + csv_field(table.csv_columns[i]);
  } else {
    for (std::size_t i = 0; i < table.columns.size(); ++i) {
      o += (i ? "," : "") + csv_field(table.columns[i].header());
    }
  }
  o += "\n";
  for (const auto& row : numeric ? table.csv_rows : table.rows) {
    for (std::size_t i = 0; i < row.size(); ++i) o += (i ? "," : "") + csv_field(row[i]);
    o += "\n";
  }
  return o;
}

void write_html(const ReportDocument& doc, const std::filesystem::path& file, bool force) {
  write_text_file(file, render_html(doc), force);
}

void write_markdown(const ReportDocument& doc, const std::filesystem::path& file, bool force,
                    std::string_view figure_dir) {
  write_text_file(file, render_markdown(doc, figure_dir), force);
}

std::vector<std::filesystem::path> write_tables_csv(const ReportDocument& doc,
                                                    const std::filesystem::path& dir, bool force) {
  const auto tables = tables_of(doc);
  std::set<std::string> seen;
  for (const auto* t : tables) check_name("table", t->name, seen);
  std::vector<std::filesystem::path> out;
  for (const auto* t : tables) {
    out.push_back(dir / (t->name + ".csv"));
    write_text_file(out.back(), table_csv(*t), force);
  }
  return out;
}

std::vector<std::filesystem::path> write_figures(const ReportDocument& doc,
                                                 const std::filesystem::path& dir, bool force) {
  const auto figures = figures_of(doc);
  std::set<std::string> seen;
  for (const auto* f : figures) check_name("figure", f->name, seen);
  std::vector<std::filesystem::path> out;
  for (const auto* f : figures) {
    f->canvas.write_files(dir / f->name, force);
    out.push_back(dir / (f->name + ".svg"));
    out.push_back(dir / (f->name + ".png"));
  }
  return out;
}

}  // namespace tidewright::report
