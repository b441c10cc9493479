#include "toml_reader.hpp"

#include <algorithm>
#include <cmath>

#include "tidewright/common/error.hpp"

namespace tidewright::study {
namespace {
std::string join(const std::vector<std::string>& v) {
  std::string out;
  for (const auto& s : v) out += (out.empty() ? "" : ", ") + s;
  return out;
}
std::size_t line_of(const toml::node& n) { return n.source().begin.line; }
}  // namespace

toml::table parse_toml_file(const std::filesystem::path& file) {
  std::error_code ec;
  if (!std::filesystem::is_regular_file(file, ec)) {
    throw InputError(file.string(), "site file not found", "give the path of a TOML site file");
  }
  try {
    return toml::parse_file(file.string());
  } catch (const toml::parse_error& e) {
    throw InputError(location(file.string(), e.source().begin.line),
                     "not valid TOML: " + std::string(e.description()),
                     "correct the syntax (see docs/site-file.md)");
  }
}

TomlReader::TomlReader(const toml::table& table, std::filesystem::path file, std::string prefix)
    : table_(&table), file_(std::move(file)), prefix_(std::move(prefix)) {}

std::string TomlReader::where(std::string_view key) const {
  const std::string dotted = prefix_.empty() ? std::string(key) : prefix_ + "." + std::string(key);
  const toml::node* n = table_->get(key);
  const std::size_t line = n ? line_of(*n) : (table_->source().begin.line);
  return location(file_.string(), line) + ": " + dotted;
}

bool TomlReader::has(std::string_view key) const { return table_->contains(key); }

const toml::node* TomlReader::get(std::string_view key) {
  const toml::node* n = table_->get(key);
  if (n) read_.emplace_back(key);
  return n;
}

void TomlReader::wrong_type(std::string_view key, std::string_view wanted) const {
  throw InputError(where(key), "must be " + std::string(wanted), "correct the value (see docs/site-file.md)");
}

void TomlReader::missing(std::string_view key) const {
  const std::string dotted = prefix_.empty() ? std::string(key) : prefix_ + "." + std::string(key);
  const std::size_t line = table_->source().begin.line;
  throw InputError(location(file_.string(), line) + ": " + dotted, "required key is missing",
                   "add it (see docs/site-file.md)");
}

std::optional<std::string> TomlReader::optional_string(std::string_view key) {
  const toml::node* n = get(key);
  if (!n) return std::nullopt;
  if (!n->is_string()) wrong_type(key, "a string");
  return n->as_string()->get();
}

std::string TomlReader::string(std::string_view key) {
  auto v = optional_string(key);
  if (!v) missing(key);
  return *v;
}

std::optional<double> TomlReader::optional_number(std::string_view key) {
  const toml::node* n = get(key);
  if (!n) return std::nullopt;
  double v = 0.0;
  if (n->is_floating_point()) v = n->as_floating_point()->get();
  else if (n->is_integer()) v = static_cast<double>(n->as_integer()->get());
  else wrong_type(key, "a number");
  if (!std::isfinite(v)) wrong_type(key, "a finite number");
  return v;
}

double TomlReader::number(std::string_view key) {
  auto v = optional_number(key);
  if (!v) missing(key);
  return *v;
}

std::optional<long long> TomlReader::optional_integer(std::string_view key) {
  const toml::node* n = get(key);
  if (!n) return std::nullopt;
  if (!n->is_integer()) wrong_type(key, "a whole number");
  return n->as_integer()->get();
}

long long TomlReader::integer(std::string_view key) {
  auto v = optional_integer(key);
  if (!v) missing(key);
  return *v;
}

std::optional<bool> TomlReader::optional_boolean(std::string_view key) {
  const toml::node* n = get(key);
  if (!n) return std::nullopt;
  if (!n->is_boolean()) wrong_type(key, "true or false");
  return n->as_boolean()->get();
}

std::vector<double> TomlReader::numbers(std::string_view key) {
  const toml::node* n = get(key);
  std::vector<double> out;
  if (!n) return out;
  const toml::array* a = n->as_array();
  if (!a) wrong_type(key, "an array of numbers, e.g. [10, 100]");
  for (const auto& e : *a) {
    if (e.is_floating_point()) out.push_back(e.as_floating_point()->get());
    else if (e.is_integer()) out.push_back(static_cast<double>(e.as_integer()->get()));
    else wrong_type(key, "an array of numbers, e.g. [10, 100]");
    if (!std::isfinite(out.back())) wrong_type(key, "an array of finite numbers");
  }
  return out;
}

std::vector<long long> TomlReader::integers(std::string_view key) {
  const toml::node* n = get(key);
  std::vector<long long> out;
  if (!n) return out;
  const toml::array* a = n->as_array();
  if (!a) wrong_type(key, "an array of whole numbers, e.g. [2050, 2100]");
  for (const auto& e : *a) {
    if (!e.is_integer()) wrong_type(key, "an array of whole numbers, e.g. [2050, 2100]");
    out.push_back(e.as_integer()->get());
  }
  return out;
}

std::vector<std::string> TomlReader::strings(std::string_view key) {
  const toml::node* n = get(key);
  std::vector<std::string> out;
  if (!n) return out;
  const toml::array* a = n->as_array();
  if (!a) wrong_type(key, "an array of strings");
  for (const auto& e : *a) {
    if (!e.is_string()) wrong_type(key, "an array of strings");
    out.push_back(e.as_string()->get());
  }
  return out;
}

std::optional<std::filesystem::path> TomlReader::optional_path(std::string_view key) {
  auto s = optional_string(key);
  if (!s) return std::nullopt;
  if (s->empty()) wrong_type(key, "a non-empty path");
  std::filesystem::path p(*s);
  if (p.is_relative()) p = file_.parent_path() / p;
  return p.lexically_normal();
}

std::filesystem::path TomlReader::path(std::string_view key) {
  auto p = optional_path(key);
  if (!p) missing(key);
  return *p;
}

std::string TomlReader::choice(std::string_view key, const std::vector<std::string>& choices,
                               std::optional<std::string> default_value) {
  auto v = optional_string(key);
  if (!v) {
    if (default_value) return *default_value;
    missing(key);
  }
  if (std::find(choices.begin(), choices.end(), *v) == choices.end()) {
    throw InputError(where(key), "is '" + *v + "'", "use one of: " + join(choices));
  }
  return *v;
}

std::optional<TomlReader> TomlReader::table(std::string_view key) {
  const toml::node* n = get(key);
  if (!n) return std::nullopt;
  if (!n->is_table()) wrong_type(key, "a table ([" + std::string(key) + "])");
  const std::string dotted = prefix_.empty() ? std::string(key) : prefix_ + "." + std::string(key);
  return TomlReader(*n->as_table(), file_, dotted);
}

std::vector<TomlReader> TomlReader::array_of_tables(std::string_view key) {
  const toml::node* n = get(key);
  std::vector<TomlReader> out;
  if (!n) return out;
  const toml::array* a = n->as_array();
  if (!a || !a->is_array_of_tables()) wrong_type(key, "an array of tables ([[" + std::string(key) + "]])");
  std::size_t i = 0;
  const std::string dotted = prefix_.empty() ? std::string(key) : prefix_ + "." + std::string(key);
  for (const auto& e : *a) {
    out.emplace_back(*e.as_table(), file_, dotted + "[" + std::to_string(i++) + "]");
  }
  return out;
}

std::vector<std::string> TomlReader::keys() {
  std::vector<std::string> out;
  for (const auto& [k, v] : *table_) {
    out.emplace_back(k.str());
    read_.emplace_back(k.str());
  }
  return out;
}

void TomlReader::finish() const {
  for (const auto& [k, v] : *table_) {
    if (std::find(read_.begin(), read_.end(), k.str()) == read_.end()) {
      const std::string dotted = prefix_.empty() ? std::string(k.str()) : prefix_ + "." + std::string(k.str());
      throw InputError(location(file_.string(), v.source().begin.line) + ": " + dotted,
                       "unknown key", "check the spelling against docs/site-file.md");
    }
  }
}

}  // namespace tidewright::study
