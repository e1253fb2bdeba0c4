#include "formulary/table_files.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <memory>
#include <sstream>

#include "formulary/longitudinal_tables.h"
#include "medload/core/text.h"
#include "formulary/table_reader.h"
#include "formulary/unit_dose_table.h"
#include "medload/core/hash.h"
#include "medload/formulary/resolver.h"
#include "medload/formulary/route_policy.h"
#include "medload/formulary/rules.h"

namespace medload::formulary_internal {
namespace {

namespace fs = std::filesystem;

// The files read, for the checksum: relative name and contents.
using FileContents = std::vector<std::pair<std::string, std::string>>;

std::optional<std::string> ReadWhole(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) return std::nullopt;
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) return std::nullopt;
  return text.str();
}

// Reads `relative` in `dir` into `files`; a missing required file is a fault.
std::optional<std::string> ReadFile(const fs::path& dir, const std::string& relative, bool required,
                                    FileContents& files, std::vector<std::string>& faults) {
  const fs::path path = dir / relative;
  std::error_code error;
  if (!fs::is_regular_file(path, error)) {
    if (required) faults.push_back(relative + ": missing (required)");
    return std::nullopt;
  }
  auto content = ReadWhole(path);
  if (!content) {
    faults.push_back(relative + ": cannot be read");
    return std::nullopt;
  }
  files.emplace_back(relative, *content);
  return content;
}

// ATC codes at level 3 to 5: A01, A01A, A01AB, A01AB01.
bool IsAtcCode(std::string_view code) {
  auto letter = [](char c) { return c >= 'A' && c <= 'Z'; };
  auto digit = [](char c) { return c >= '0' && c <= '9'; };
  if (code.size() != 3 && code.size() != 4 && code.size() != 5 && code.size() != 7) return false;
  if (!letter(code[0]) || !digit(code[1]) || !digit(code[2])) return false;
  if (code.size() >= 4 && !letter(code[3])) return false;
  if (code.size() >= 5 && !letter(code[4])) return false;
  return code.size() != 7 || (digit(code[5]) && digit(code[6]));
}

std::string Upper(std::string text) {
  for (char& c : text) {
    if (c >= 'a' && c <= 'z') c = static_cast<char>(c - 32);
  }
  return text;
}

// Checks the fields every table has: a non-empty first column and a source.
bool NameAndSource(const Table& table, const TableRow& row, std::string_view column,
                   std::vector<std::string>& faults) {
  bool ok = true;
  if (row.fields.front().empty()) {
    faults.push_back(Fault(table.name, row.line, std::string(column) + ": empty"));
    ok = false;
  }
  if (row.fields.back().empty()) {
    faults.push_back(Fault(table.name, row.line, "source: empty (every row cites its source)"));
    ok = false;
  }
  return ok;
}

void ReadIngredients(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "ingredient", faults)) continue;
    Ingredient ingredient;
    ingredient.name = row.fields[0];
    ingredient.synonyms = SplitList(row.fields[1]);
    for (std::string& code : SplitList(row.fields[2])) {
      code = Upper(code);
      if (!IsAtcCode(code)) {
        faults.push_back(Fault(table.name, row.line, "atc: \"" + code + "\" is not an ATC code"));
        continue;
      }
      ingredient.atc.push_back(code);
    }
    for (std::string& class_name : SplitList(row.fields[3])) {
      if (!IsLowerHyphenated(class_name)) {
        faults.push_back(Fault(table.name, row.line,
                               "classes: \"" + class_name + "\" is not lower-case-hyphenated"));
        continue;
      }
      ingredient.classes.push_back(std::move(class_name));
    }
    ingredient.source = row.fields[4];
    ingredient.line = row.line;
    tables.ingredients.push_back(std::move(ingredient));
  }
}

// Bounds of a minimum daily dose (DBI delta), in mg: below a microgram a day or above ten
// grams a day no medicine in a Drug Burden Index table has one (Hilmer et al. 2007 list
// doses from micrograms to a few grams); a value outside is a typing slip, and would make
// dose / (dose + delta) read 0 or 1 whatever the dose.
constexpr double kMinDbiDoseMg = 0.001;
constexpr double kMaxDbiDoseMg = 10000;

std::optional<int> ParseWhole(std::string_view text) {
  int value = 0;
  const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (ec != std::errc() || ptr != text.data() + text.size() || text.empty()) return std::nullopt;
  return value;
}

// The optional `routes` column of a scale or dbi.csv row: empty, or route names.
std::optional<std::vector<Route>> EntryRoutes(const Table& table, const TableRow& row,
                                              std::vector<std::string>& faults) {
  auto routes = ParseRouteList(row.optional.empty() ? std::string() : row.optional[0]);
  if (!routes.ok()) {
    faults.push_back(Fault(table.name, row.line, "routes: " + routes.status().message()));
    return std::nullopt;
  }
  return std::move(routes).value();
}

void ReadScale(const Table& table, Scale& scale, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "ingredient", faults)) continue;
    const auto score = ParseWhole(row.fields[1]);
    if (!score) {
      faults.push_back(Fault(table.name, row.line, "score: \"" + row.fields[1] + "\" is not a whole number"));
      continue;
    }
    if (*score < 0 || *score > 3) {
      faults.push_back(Fault(table.name, row.line, "score: " + row.fields[1] + " is out of range 0..3"));
      continue;
    }
    auto routes = EntryRoutes(table, row, faults);
    if (!routes) continue;
    scale.rows.push_back(ScaleRow{row.fields[0], *score, row.fields[2], row.line, std::move(*routes)});
  }
}

std::optional<DbiEffect> EffectFromName(std::string_view name) {
  if (name == "anticholinergic") return DbiEffect::kAnticholinergic;
  if (name == "sedative") return DbiEffect::kSedative;
  if (name == "both") return DbiEffect::kBoth;
  return std::nullopt;
}

void ReadDbi(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "ingredient", faults)) continue;
    const auto dose = ParseDecimal(row.fields[1]);
    if (!dose) {
      faults.push_back(Fault(table.name, row.line, "min_daily_dose_mg: \"" + row.fields[1] + "\" is not a number"));
      continue;
    }
    if (!(*dose > 0)) {
      faults.push_back(Fault(table.name, row.line, "min_daily_dose_mg: " + row.fields[1] + " must be greater than 0"));
      continue;
    }
    if (!std::isfinite(*dose) || *dose < kMinDbiDoseMg || *dose > kMaxDbiDoseMg) {
      faults.push_back(Fault(table.name, row.line,
                             "min_daily_dose_mg: " + row.fields[1] + " is outside 0.001 to 10000 mg a day"));
      continue;
    }
    const auto effect = EffectFromName(row.fields[2]);
    if (!effect) {
      faults.push_back(Fault(table.name, row.line,
                             "effect: \"" + row.fields[2] + "\" is not anticholinergic, sedative or both"));
      continue;
    }
    auto routes = EntryRoutes(table, row, faults);
    if (!routes) continue;
    tables.dbi.push_back(DbiDose{row.fields[0], *dose, *effect, row.fields[3], row.line, std::move(*routes)});
  }
}

void ReadDbiClasses(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "class", faults)) continue;
    const auto effect = EffectFromName(row.fields[1]);
    if (!effect) {
      faults.push_back(Fault(table.name, row.line,
                             "effect: \"" + row.fields[1] + "\" is not anticholinergic, sedative or both"));
      continue;
    }
    tables.dbi_classes.push_back(DbiClass{row.fields[0], *effect, row.fields[2], row.line});
  }
}

void ReadProducts(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "product", faults)) continue;
    NamedProduct product;
    product.name = row.fields[0];
    product.requires_words = SplitList(row.fields[1]);
    product.ingredients = SplitList(row.fields[2]);
    product.form = row.fields[3];
    product.dose_unit = row.fields[5];
    product.source = row.fields[7];
    product.line = row.line;
    bool ok = true;
    if (product.ingredients.empty()) {
      faults.push_back(Fault(table.name, row.line, "ingredients: empty"));
      ok = false;
    }
    if (!row.fields[4].empty()) {
      product.route = RouteFromName(row.fields[4]);
      if (!product.route) {
        faults.push_back(Fault(table.name, row.line, "route: \"" + row.fields[4] + "\" is not a route name"));
        ok = false;
      }
    }
    if (!row.fields[6].empty()) {
      product.supply_days_per_unit = ParseWhole(row.fields[6]);
      if (!product.supply_days_per_unit || *product.supply_days_per_unit <= 0) {
        faults.push_back(Fault(table.name, row.line,
                               "supply_days_per_unit: \"" + row.fields[6] + "\" is not a whole number > 0"));
        ok = false;
      }
    }
    if (ok) tables.products.push_back(std::move(product));
  }
}

void ReadCodes(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "code_system", faults)) continue;
    if (row.fields[1].empty() || row.fields[2].empty()) {
      faults.push_back(Fault(table.name, row.line, row.fields[1].empty() ? "code: empty" : "product_or_ingredient: empty"));
      continue;
    }
    tables.codes.push_back(ProductCode{row.fields[0], row.fields[1], row.fields[2], row.fields[3], row.line});
  }
}

void ReadBrands(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "brand", faults)) continue;
    NamedProduct brand;
    brand.name = row.fields[0];
    brand.ingredients = SplitList(row.fields[1]);
    brand.source = row.fields[2];
    brand.line = row.line;
    brand.table = table.name;
    if (brand.ingredients.empty()) {
      faults.push_back(Fault(table.name, row.line, "ingredients: empty (ingredients or a products.csv name)"));
      continue;
    }
    tables.brands.push_back(std::move(brand));
  }
}

// "name=strength": the strength must read as exactly one strength ("30mg", "5mg/5ml").
bool StrengthReads(std::string_view element) {
  const size_t equals = element.find('=');
  if (equals == std::string_view::npos || equals + 1 == element.size()) return true;
  return ParseStrengths(NormaliseText(element.substr(equals + 1))).size() == 1;
}

void ReadDictionary(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "code_system", faults)) continue;
    DictionaryEntry entry{row.fields[0], row.fields[1], row.fields[2], row.fields[3],
                          SplitList(row.fields[4]), row.fields[5], row.line};
    if (entry.code.empty() && entry.name.empty()) {
      faults.push_back(Fault(table.name, row.line, "code and name: both empty (a row needs one)"));
      continue;
    }
    if (entry.ingredients.empty()) {
      faults.push_back(Fault(table.name, row.line, "ingredients: empty"));
      continue;
    }
    const auto bad = std::find_if(entry.ingredients.begin(), entry.ingredients.end(),
                                  [](const std::string& element) { return !StrengthReads(element); });
    if (bad != entry.ingredients.end()) {
      faults.push_back(Fault(table.name, row.line, "ingredients: \"" + *bad + "\" has a strength that does not read"));
      continue;
    }
    tables.dictionary.push_back(std::move(entry));
  }
}

void ReadNonMedicines(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "term", faults)) continue;
    tables.non_medicines.push_back(NonMedicineTerm{row.fields[0], row.fields[1], row.fields[2], row.line});
  }
}

// routes.csv: `route,systemic,source`, each route at most once.
void ReadRoutes(const Table& table, FormularyTables& tables, std::vector<std::string>& faults) {
  std::vector<std::pair<Route, int>> seen;
  for (const TableRow& row : table.rows) {
    if (!NameAndSource(table, row, "route", faults)) continue;
    const std::optional<Route> route = RouteFromName(row.fields[0]);
    if (!route || *route == Route::kUnknown) {
      faults.push_back(Fault(table.name, row.line, "route: \"" + row.fields[0] + "\" is not a route name"));
      continue;
    }
    if (row.fields[1] != "yes" && row.fields[1] != "no") {
      faults.push_back(Fault(table.name, row.line, "systemic: \"" + row.fields[1] + "\" is not yes or no"));
      continue;
    }
    const auto first = std::find_if(seen.begin(), seen.end(), [&](const auto& s) { return s.first == *route; });
    if (first != seen.end()) {
      faults.push_back(Fault(table.name, row.line, "duplicate route \"" + std::string(RouteName(*route)) +
                                                       "\" (first on line " + std::to_string(first->second) + ")"));
      continue;
    }
    seen.emplace_back(*route, row.line);
    tables.routes.push_back(RouteRow{*route, row.fields[1] == "yes", row.fields[2], row.line});
  }
}

// Reads the table `relative` with `columns` (and `optional_columns`) and hands it to `read`.
template <typename ReadFn>
void ReadTableFile(const fs::path& dir, const std::string& relative, bool required,
                   const std::vector<std::string_view>& columns, FileContents& files,
                   std::vector<std::string>& faults, ReadFn read,
                   const std::vector<std::string_view>& optional_columns = {}) {
  const auto content = ReadFile(dir, relative, required, files, faults);
  if (!content) return;
  const auto table = ParseTable(relative, *content, columns, faults, optional_columns);
  if (table) read(*table);
}

std::vector<std::string> ScaleFiles(const fs::path& dir) {
  std::vector<std::string> names;
  std::error_code error;
  for (fs::directory_iterator it(dir / "anticholinergic", error), end; !error && it != end; it.increment(error)) {
    const fs::path& path = it->path();
    // tsdd.csv sits beside the scales but is not one (longitudinal_tables.h reads it).
    if (path.extension() == ".csv" && path.stem() != "tsdd" && it->is_regular_file(error)) {
      names.push_back(path.stem().string());
    }
  }
  std::sort(names.begin(), names.end());
  return names;
}

std::string Checksum(FileContents files) {
  std::sort(files.begin(), files.end());
  std::string all;
  for (const auto& [name, content] : files) {
    all += name + '\0' + std::to_string(content.size()) + '\0' + content;
  }
  return Sha256Hex(all);
}

}  // namespace

const std::vector<std::string_view>& RequiredTableFiles() {
  static const std::vector<std::string_view> kRequired = {
      "ingredients.csv", "anticholinergic/acb.csv", "dbi.csv",           "dbi_classes.csv",
      "products.csv",    "brands.csv",              "codes.csv",         "non_medicines.csv",
      "rules.json"};
  return kRequired;
}

FormularyTables ReadTableFiles(const std::string& dir_name, std::vector<std::string>& faults) {
  // Every table is required (RequiredTableFiles) but routes.csv (the built-in route policy
  // otherwise) and dictionary.csv: a missing one would make its measure read 0, or its
  // products unresolved, without a word.
  constexpr bool kRequired = true;
  FormularyTables tables;
  const fs::path dir(dir_name);
  std::error_code error;
  if (!fs::is_directory(dir, error)) {
    faults.push_back(dir_name + ": not a folder");
    return tables;
  }
  FileContents files;
  ReadTableFile(dir, "ingredients.csv", true, {"ingredient", "synonyms", "atc", "classes", "source"}, files,
                faults, [&](const Table& t) { ReadIngredients(t, tables, faults); });
  std::vector<std::string> scale_names = ScaleFiles(dir);
  if (std::find(scale_names.begin(), scale_names.end(), "acb") == scale_names.end()) {
    faults.push_back("anticholinergic/acb.csv: missing (required: the default scale)");
  }
  for (const std::string& name : scale_names) {
    Scale scale;
    scale.name = name;
    ReadTableFile(dir, "anticholinergic/" + name + ".csv", true, {"ingredient", "score", "source"}, files,
                  faults, [&](const Table& t) { ReadScale(t, scale, faults); }, {"routes"});
    tables.scales.push_back(std::move(scale));
  }
  ReadTableFile(dir, "dbi.csv", kRequired, {"ingredient", "min_daily_dose_mg", "effect", "source"}, files, faults,
                [&](const Table& t) { ReadDbi(t, tables, faults); }, {"routes"});
  ReadTableFile(dir, "dbi_classes.csv", kRequired, {"class", "effect", "source"}, files, faults,
                [&](const Table& t) { ReadDbiClasses(t, tables, faults); });
  ReadTableFile(dir, "routes.csv", false, {"route", "systemic", "source"}, files, faults,
                [&](const Table& t) { ReadRoutes(t, tables, faults); });
  ReadTableFile(dir, "products.csv", kRequired,
                {"product", "requires", "ingredients", "form", "route", "dose_unit", "supply_days_per_unit",
                 "source"},
                files, faults, [&](const Table& t) { ReadProducts(t, tables, faults); });
  ReadTableFile(dir, "codes.csv", kRequired, {"code_system", "code", "product_or_ingredient", "source"}, files,
                faults, [&](const Table& t) { ReadCodes(t, tables, faults); });
  ReadTableFile(dir, "non_medicines.csv", kRequired, {"term", "category", "source"}, files, faults,
                [&](const Table& t) { ReadNonMedicines(t, tables, faults); });
  ReadTableFile(dir, "brands.csv", kRequired, {"brand", "ingredients", "source"}, files, faults,
                [&](const Table& t) { ReadBrands(t, tables, faults); });
  // Optional: a national dictionary is a site's choice.
  ReadTableFile(dir, "dictionary.csv", false, {"code_system", "code", "name", "brand", "ingredients", "source"},
                files, faults, [&](const Table& t) { ReadDictionary(t, tables, faults); });
  if (const auto rules = ReadFile(dir, "rules.json", kRequired, files, faults)) {
    tables.rules = ParseRules(*rules, "rules.json", faults);
  }
  ReadTableFile(dir, kTsddFile, false, {"ingredient", "min_effective_daily_dose_mg", "source"}, files, faults,
                [&](const Table& t) { ReadTsdd(t, tables, faults); });
  ReadTableFile(dir, kFallsRiskFile, false, {"category", "class", "ingredient", "source"}, files, faults,
                [&](const Table& t) { ReadFallsRisk(t, tables, faults); });
  ReadTableFile(dir, kUnitDosesFile, false,
                {"ingredient", "form", "strength_mg", "release_mg_per_day", "interval_days", "source"}, files, faults,
                [&](const Table& t) { ReadUnitDoses(t, tables, faults); });
  tables.checksum = Checksum(std::move(files));
  return tables;
}

}  // namespace medload::formulary_internal
