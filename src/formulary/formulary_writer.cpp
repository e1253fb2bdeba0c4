#include "medload/formulary/formulary_writer.h"

#include <algorithm>
#include <optional>
#include <ostream>
#include <utility>

#include "medload/core/caution.h"
#include "medload/core/text.h"
#include "medload/format/json_text.h"
#include "medload/format/output.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

using nlohmann::json;

std::string Optional(const std::optional<double>& value) {
  return value ? FormatNumber(*value, 4) : std::string();
}

std::vector<std::pair<std::string, std::string>> CheckCounts(const FormularyCheck& check) {
  return {{"ingredients", std::to_string(check.ingredients)},
          {"synonyms", std::to_string(check.synonyms)},
          {"scales", std::to_string(check.scales)},
          {"scale rows", std::to_string(check.scale_rows)},
          {"dbi rows", std::to_string(check.dbi_rows)},
          {"products", std::to_string(check.products)},
          {"brands", std::to_string(check.brands)},
          {"dictionary rows", std::to_string(check.dictionary_rows)},
          {"codes", std::to_string(check.codes)},
          {"non-medicine terms", std::to_string(check.non_medicine_terms)},
          {"rules", std::to_string(check.rules)},
          {"routes", std::to_string(check.routes)},
          {"tsdd rows", std::to_string(check.tsdd_rows)},
          {"unit dose rows", std::to_string(check.unit_dose_rows)},
          {"falls-risk rows", std::to_string(check.falls_risk_rows)},
          {"checksum", check.checksum}};
}

// The spellings read as ingredients ("oxybutinin read as oxybutynin").
std::string SpellingText(const ResolvedProduct& product) {
  std::vector<std::string> parts;
  for (const SpellingReading& reading : product.spellings) parts.push_back(reading.written + " read as " + reading.read_as);
  return Join(parts, "; ");
}

std::string CheckVerdict(const FormularyCheck& check) {
  return check.ok()                  ? "no faults"
         : check.faults.size() == 1 ? "1 fault"
                                    : std::to_string(check.faults.size()) + " faults";
}

// One ingredient's facts from the tables: classes, a score per scale, DBI dose.
std::vector<std::string> IngredientCells(const Formulary& formulary, const ResolvedIngredient& ingredient) {
  std::vector<std::string> cells = {ingredient.ingredient, Optional(ingredient.mg_per_unit),
                                    Optional(ingredient.mg_per_day), Join(formulary.ClassesOf(ingredient.ingredient), "|")};
  for (const std::string& scale : formulary.ScaleNames()) {
    const auto score = formulary.ScoreOn(scale, ingredient.ingredient);
    cells.push_back(score ? std::to_string(*score) : "");
  }
  const DbiDose* dbi = formulary.DbiOf(ingredient.ingredient);
  cells.push_back(dbi != nullptr ? FormatNumber(dbi->min_daily_dose_mg, 4) : "");
  cells.push_back(dbi != nullptr ? std::string(DbiEffectName(dbi->effect)) : "");
  return cells;
}

std::vector<std::string> IngredientHeader(const Formulary& formulary) {
  std::vector<std::string> header = {"ingredient", "mg_per_unit", "mg_per_day", "classes"};
  for (const std::string& scale : formulary.ScaleNames()) header.push_back(scale);
  header.push_back("dbi_min_daily_dose_mg");
  header.push_back("dbi_effect");
  return header;
}

std::vector<std::vector<std::string>> IngredientRows(const LookupModel& model) {
  std::vector<std::vector<std::string>> rows;
  for (const ResolvedIngredient& ingredient : model.product.ingredients) {
    rows.push_back(IngredientCells(*model.formulary, ingredient));
  }
  return rows;
}

std::vector<std::pair<std::string, std::string>> ProductFacts(const LookupModel& model) {
  const ResolvedProduct& product = model.product;
  std::vector<std::pair<std::string, std::string>> facts = {{"description", model.description}};
  if (!model.code.empty()) facts.emplace_back("code", model.code_system + " " + model.code);
  facts.insert(facts.end(), {{"match", std::string(MatchKindName(product.match))},
                             {"how", product.match_detail},
                             {"non_medicine", product.non_medicine ? "yes" : "no"},
                             {"form", product.form},
                             {"route", std::string(RouteName(product.route))},
                             {"dose_unit", product.dose_unit},
                             {"supply_days_per_unit",
                              product.default_supply_days ? std::to_string(*product.default_supply_days) : ""},
                             {"not_in_formulary", Join(product.unknown, "|")},
                             {"close_spelling", SpellingText(product)}});
  return facts;
}

std::vector<std::vector<std::string>> FactRows(const LookupModel& model) {
  std::vector<std::vector<std::string>> fact_rows;
  for (const auto& [name, value] : ProductFacts(model)) fact_rows.push_back({name, value});
  return fact_rows;
}

const std::vector<std::string>& UnmatchedHeader() {
  static const std::vector<std::string> kHeader = {"product", "code",        "code_system", "match",
                                                   "detail",  "suggestions", "items",       "patients"};
  return kHeader;
}

std::vector<std::vector<std::string>> UnmatchedRows(const std::vector<UnresolvedProduct>& products) {
  std::vector<std::vector<std::string>> rows;
  for (const UnresolvedProduct& p : products) {
    rows.push_back({p.count.product, p.count.code, p.count.code_system, std::string(MatchKindName(p.match)), p.detail,
                    Join(p.suggestions, "|"), std::to_string(p.count.items), std::to_string(p.count.patients)});
  }
  return rows;
}

struct Totals {
  long products = 0, items = 0;
};

// The products and items of `products` whose match is `match`.
Totals TotalsOf(const std::vector<UnresolvedProduct>& products, MatchKind match) {
  Totals totals;
  for (const UnresolvedProduct& p : products) {
    if (p.match != match) continue;
    totals.products += 1;
    totals.items += p.count.items;
  }
  return totals;
}

// "N unmatched products, N items; N recognised only in part, N items; N read from a close
// spelling, N items".
std::string UnmatchedSentence(const std::vector<UnresolvedProduct>& products) {
  const Totals unmatched = TotalsOf(products, MatchKind::kUnmatched);
  const Totals partial = TotalsOf(products, MatchKind::kPartial);
  const Totals approximate = TotalsOf(products, MatchKind::kApproximate);
  return std::to_string(unmatched.products) + " unmatched products, " + std::to_string(unmatched.items) + " items; " +
         std::to_string(partial.products) + " recognised only in part, " + std::to_string(partial.items) +
         " items; " + std::to_string(approximate.products) + " read from a close spelling, " +
         std::to_string(approximate.items) + " items";
}

}  // namespace

// ---- formulary check ----

json FormularyCheckJson(const std::string& dir, const FormularyCheck& check) {
  json counts_json = json::object();
  for (const auto& [name, value] : CheckCounts(check)) counts_json[name] = value;
  return json{{"formulary", dir}, {"ok", check.ok()}, {"faults", check.faults},
              {"counts", counts_json}, {"caution", std::string(kCaution)}};
}

void WriteFormularyCheckCsv(std::ostream& out, const FormularyCheck& check) {
  WriteCsvCaution(out);
  out << CsvRow({"what", "value"});
  for (const std::string& fault : check.faults) out << CsvRow({"fault", fault});
  for (const auto& [name, value] : CheckCounts(check)) out << CsvRow({name, value});
}

void WriteFormularyCheckHtml(std::ostream& out, const std::string& dir, const FormularyCheck& check) {
  WriteHtmlStart(out, "Formulary check");
  out << "<h1>Formulary check: " << EscapeHtml(CheckVerdict(check)) << "</h1>\n<p>" << EscapeHtml(dir) << "</p>\n";
  std::vector<std::vector<std::string>> rows;
  for (const std::string& fault : check.faults) rows.push_back({fault});
  if (!rows.empty()) WriteHtmlTable(out, {"fault"}, rows);
  rows.clear();
  for (const auto& [name, value] : CheckCounts(check)) rows.push_back({name, value});
  WriteHtmlTable(out, {"table", "rows"}, rows);
  WriteHtmlEnd(out);
}

void WriteFormularyCheckText(std::ostream& out, const std::string& dir, const FormularyCheck& check) {
  for (const std::string& fault : check.faults) out << fault << "\n";
  out << "formulary " << dir << ": " << CheckVerdict(check) << "\n";
  if (check.ok()) {
    std::vector<std::vector<std::string>> rows;
    for (const auto& [name, value] : CheckCounts(check)) rows.push_back({name, value});
    WriteTextTable(out, {"table", "rows"}, rows);
  }
  WriteTextCaution(out);
}

// ---- formulary lookup ----

json LookupJson(const LookupModel& model) {
  json result = ResolvedProductToJson(model.product);
  for (json& ingredient : result["ingredients"]) {
    const std::string name = ingredient["ingredient"].get<std::string>();
    ingredient["classes"] = model.formulary->ClassesOf(name);
    json scores = json::object();
    for (const std::string& scale : model.formulary->ScaleNames()) {
      const auto score = model.formulary->ScoreOn(scale, name);
      scores[scale] = score ? json(*score) : json(nullptr);
    }
    ingredient["scores"] = scores;
    const DbiDose* dbi = model.formulary->DbiOf(name);
    ingredient["dbi"] = dbi == nullptr ? json(nullptr)
                                       : json{{"min_daily_dose_mg", dbi->min_daily_dose_mg},
                                              {"effect", std::string(DbiEffectName(dbi->effect))}};
  }
  result["description"] = model.description;
  result["code"] = model.code;
  result["code_system"] = model.code_system;
  result["formulary_checksum"] = model.formulary->checksum();
  result["caution"] = std::string(kCaution);
  return result;
}

void WriteLookupCsv(std::ostream& out, const LookupModel& model) {
  const auto facts = ProductFacts(model);
  std::vector<std::vector<std::string>> rows = IngredientRows(model);
  WriteCsvCaution(out);
  std::vector<std::string> header;
  for (const auto& [name, value] : facts) header.push_back(name);
  const std::vector<std::string> ingredient_header = IngredientHeader(*model.formulary);
  header.insert(header.end(), ingredient_header.begin(), ingredient_header.end());
  out << CsvRow(header);
  if (rows.empty()) rows.push_back(std::vector<std::string>(ingredient_header.size()));
  for (const auto& row : rows) {
    std::vector<std::string> cells;
    for (const auto& [name, value] : facts) cells.push_back(value);
    cells.insert(cells.end(), row.begin(), row.end());
    out << CsvRow(cells);
  }
}

void WriteLookupHtml(std::ostream& out, const LookupModel& model) {
  const std::vector<std::vector<std::string>> rows = IngredientRows(model);
  WriteHtmlStart(out, "Formulary lookup");
  out << "<h1>How the formulary resolves a product</h1>\n";
  WriteHtmlTable(out, {"field", "value"}, FactRows(model));
  if (!rows.empty()) WriteHtmlTable(out, IngredientHeader(*model.formulary), rows);
  WriteHtmlEnd(out);
}

void WriteLookupText(std::ostream& out, const LookupModel& model) {
  const std::vector<std::vector<std::string>> rows = IngredientRows(model);
  WriteTextTable(out, {"field", "value"}, FactRows(model));
  if (!rows.empty()) {
    out << "\n";
    WriteTextTable(out, IngredientHeader(*model.formulary), rows);
  }
  WriteTextCaution(out);
}

// ---- formulary unmatched ----

std::vector<UnresolvedProduct> UnmatchedProducts(const Formulary& formulary, const std::vector<ProductCount>& counts,
                                                 size_t limit) {
  std::vector<UnresolvedProduct> unresolved;
  for (const ProductCount& product : counts) {
    const ResolvedProduct resolved = Resolve(formulary, product.product, product.code, product.code_system);
    if (resolved.matched() && !resolved.flagged()) continue;
    UnresolvedProduct entry{product, resolved.match, FlagDescription(resolved), {}};
    if (!resolved.matched()) entry.suggestions = SuggestNames(formulary, product.product);
    unresolved.push_back(std::move(entry));
  }
  std::stable_sort(unresolved.begin(), unresolved.end(), [](const UnresolvedProduct& a, const UnresolvedProduct& b) {
    return a.count.items != b.count.items ? a.count.items > b.count.items : a.count.patients > b.count.patients;
  });
  if (limit > 0 && unresolved.size() > limit) unresolved.resize(limit);
  return unresolved;
}

json UnmatchedJson(const std::vector<UnresolvedProduct>& products, const std::string& checksum) {
  json list = json::array();
  for (const UnresolvedProduct& p : products) {
    list.push_back({{"product", p.count.product}, {"code", p.count.code}, {"code_system", p.count.code_system},
                    {"match", std::string(MatchKindName(p.match))}, {"detail", p.detail},
                    {"suggestions", p.suggestions}, {"items", p.count.items}, {"patients", p.count.patients}});
  }
  const Totals unmatched = TotalsOf(products, MatchKind::kUnmatched);
  const Totals partial = TotalsOf(products, MatchKind::kPartial);
  const Totals approximate = TotalsOf(products, MatchKind::kApproximate);
  return json{{"products", list},
              {"unmatched_products", unmatched.products},
              {"unmatched_items", unmatched.items},
              {"partial_products", partial.products},
              {"partial_items", partial.items},
              {"approximate_products", approximate.products},
              {"approximate_items", approximate.items},
              {"formulary_checksum", checksum},
              {"caution", std::string(kCaution)}};
}

void WriteUnmatchedCsv(std::ostream& out, const std::vector<UnresolvedProduct>& products) {
  WriteCsvCaution(out);
  out << CsvRow(UnmatchedHeader());
  for (const auto& row : UnmatchedRows(products)) out << CsvRow(row);
}

void WriteUnmatchedHtml(std::ostream& out, const std::vector<UnresolvedProduct>& products) {
  WriteHtmlStart(out, "Unmatched products");
  out << "<h1>Products the formulary does not fully recognise</h1>\n<p>" << EscapeHtml(UnmatchedSentence(products))
      << "</p>\n";
  WriteHtmlTable(out, UnmatchedHeader(), UnmatchedRows(products));
  WriteHtmlEnd(out);
}

void WriteUnmatchedText(std::ostream& out, const std::vector<UnresolvedProduct>& products) {
  const std::vector<std::vector<std::string>> rows = UnmatchedRows(products);
  out << UnmatchedSentence(products) << "\n";
  if (!rows.empty()) WriteTextTable(out, UnmatchedHeader(), rows);
  WriteTextCaution(out);
}

// ---- formulary load-dictionary ----

json DictionaryLoadJson(const std::string& dictionary, const DictionaryLoad& load, size_t rows_in_file) {
  return json{{"dictionary", dictionary},
              {"code_system", load.code_system},
              {"rows_loaded", load.entries.size()},
              {"rows_in_file", rows_in_file},
              {"products_skipped", load.skipped},
              {"unknown_substances", load.unknown_substances},
              {"caution", std::string(kCaution)}};
}

void WriteDictionaryLoadText(std::ostream& out, const std::string& dictionary, const DictionaryLoad& load,
                             size_t rows_in_file) {
  out << dictionary << ": " << load.entries.size() << " " << load.code_system << " rows loaded, " << rows_in_file
      << " rows in the file\n";
  if (load.skipped > 0) out << load.skipped << " products left out: no ingredient\n";
  if (!load.unknown_substances.empty()) {
    out << load.unknown_substances.size()
        << " substances are not in ingredients.csv; products naming them resolve as partial until they are added:\n";
    for (const std::string& name : load.unknown_substances) out << "  " << name << "\n";
  }
  WriteTextCaution(out);
}

}  // namespace medload
