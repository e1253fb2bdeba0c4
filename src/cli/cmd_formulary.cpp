// `medload formulary check|lookup|unmatched`: validate the tables, show how one product
// resolves, and list the stored products that nothing in the tables recognises.
#include <algorithm>
#include <ostream>

#include <nlohmann/json.hpp>

#include "cli/options.h"
#include "medload/core/caution.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/resolver.h"
#include "medload/io/json_text.h"
#include "medload/io/output.h"
#include "medload/store/store.h"

namespace medload::cli {
namespace {

using nlohmann::json;

int Fail(Context& context, const Status& status) {
  *context.err << "medload: " << status.message() << "\n";
  return status.exit_code();
}

std::string Optional(const std::optional<double>& value) {
  return value ? FormatNumber(*value, 4) : std::string();
}

std::string Join(const std::vector<std::string>& parts, std::string_view separator) {
  std::string out;
  for (const std::string& part : parts) out += (out.empty() ? "" : std::string(separator)) + part;
  return out;
}

// ---- formulary check ----

std::vector<std::pair<std::string, std::string>> CheckCounts(const FormularyCheck& check) {
  return {{"ingredients", std::to_string(check.ingredients)},
          {"synonyms", std::to_string(check.synonyms)},
          {"scales", std::to_string(check.scales)},
          {"scale rows", std::to_string(check.scale_rows)},
          {"dbi rows", std::to_string(check.dbi_rows)},
          {"products", std::to_string(check.products)},
          {"codes", std::to_string(check.codes)},
          {"non-medicine terms", std::to_string(check.non_medicine_terms)},
          {"rules", std::to_string(check.rules)},
          {"checksum", check.checksum}};
}

void WriteCheck(Context& context, const std::string& dir, const FormularyCheck& check) {
  std::ostream& out = *context.out;
  const auto counts = CheckCounts(check);
  const std::string verdict = check.ok()                  ? "no faults"
                              : check.faults.size() == 1 ? "1 fault"
                                                         : std::to_string(check.faults.size()) + " faults";
  switch (context.format) {
    case Format::kJson: {
      json counts_json = json::object();
      for (const auto& [name, value] : counts) counts_json[name] = value;
      out << JsonText(json{{"formulary", dir}, {"ok", check.ok()}, {"faults", check.faults},
                           {"counts", counts_json}, {"caution", std::string(kCaution)}})
          << "\n";
      return;
    }
    case Format::kCsv:
      WriteCsvCaution(out);
      out << CsvRow({"what", "value"});
      for (const std::string& fault : check.faults) out << CsvRow({"fault", fault});
      for (const auto& [name, value] : counts) out << CsvRow({name, value});
      return;
    case Format::kHtml: {
      WriteHtmlStart(out, "Formulary check");
      out << "<h1>Formulary check: " << EscapeHtml(verdict) << "</h1>\n<p>" << EscapeHtml(dir) << "</p>\n";
      std::vector<std::vector<std::string>> rows;
      for (const std::string& fault : check.faults) rows.push_back({fault});
      if (!rows.empty()) WriteHtmlTable(out, {"fault"}, rows);
      rows.clear();
      for (const auto& [name, value] : counts) rows.push_back({name, value});
      WriteHtmlTable(out, {"table", "rows"}, rows);
      WriteHtmlEnd(out);
      return;
    }
    default: break;
  }
  for (const std::string& fault : check.faults) out << fault << "\n";
  out << "formulary " << dir << ": " << verdict << "\n";
  if (check.ok()) {
    std::vector<std::vector<std::string>> rows;
    for (const auto& [name, value] : counts) rows.push_back({name, value});
    WriteTextTable(out, {"table", "rows"}, rows);
  }
  WriteTextCaution(out);
}

int CheckCommand(Context& context, const std::vector<std::string>& args) {
  po::options_description options("formulary check options");
  int exit_code = 0;
  if (!ParseOptions(context, "medload formulary check [--formulary DIR]", options, {}, args, exit_code)) {
    return exit_code;
  }
  if (context.format == Format::kSvg) return Fail(context, Status::Usage("formulary check writes text, csv, json or html"));
  const FormularyCheck check = CheckFormulary(context.formulary_dir);
  WriteCheck(context, context.formulary_dir, check);
  if (!check.ok() && !context.quiet) {
    *context.err << "medload: formulary " << context.formulary_dir << " has " << check.faults.size()
                 << (check.faults.size() == 1 ? " fault\n" : " faults\n");
  }
  return check.ok() ? 0 : 2;
}

// ---- formulary lookup ----

struct LookupModel {
  std::string description, code, code_system;
  ResolvedProduct product;
  const Formulary* formulary = nullptr;
};

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
                              product.default_supply_days ? std::to_string(*product.default_supply_days) : ""}});
  return facts;
}

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

void WriteLookup(Context& context, const LookupModel& model) {
  std::ostream& out = *context.out;
  const Formulary& formulary = *model.formulary;
  std::vector<std::vector<std::string>> rows;
  for (const ResolvedIngredient& ingredient : model.product.ingredients) rows.push_back(IngredientCells(formulary, ingredient));
  const auto facts = ProductFacts(model);
  if (context.format == Format::kJson) {
    // The description and code are echoed as given: bytes that are not UTF-8 become U+FFFD.
    out << JsonText(LookupJson(model)) << "\n";
  } else if (context.format == Format::kCsv) {
    WriteCsvCaution(out);
    std::vector<std::string> header;
    for (const auto& [name, value] : facts) header.push_back(name);
    const std::vector<std::string> ingredient_header = IngredientHeader(formulary);
    header.insert(header.end(), ingredient_header.begin(), ingredient_header.end());
    out << CsvRow(header);
    if (rows.empty()) rows.push_back(std::vector<std::string>(ingredient_header.size()));
    for (const auto& row : rows) {
      std::vector<std::string> cells;
      for (const auto& [name, value] : facts) cells.push_back(value);
      cells.insert(cells.end(), row.begin(), row.end());
      out << CsvRow(cells);
    }
  } else if (context.format == Format::kHtml) {
    WriteHtmlStart(out, "Formulary lookup");
    out << "<h1>How the formulary resolves a product</h1>\n";
    std::vector<std::vector<std::string>> fact_rows;
    for (const auto& [name, value] : facts) fact_rows.push_back({name, value});
    WriteHtmlTable(out, {"field", "value"}, fact_rows);
    if (!rows.empty()) WriteHtmlTable(out, IngredientHeader(formulary), rows);
    WriteHtmlEnd(out);
  } else {
    std::vector<std::vector<std::string>> fact_rows;
    for (const auto& [name, value] : facts) fact_rows.push_back({name, value});
    WriteTextTable(out, {"field", "value"}, fact_rows);
    if (!rows.empty()) {
      out << "\n";
      WriteTextTable(out, IngredientHeader(formulary), rows);
    }
    WriteTextCaution(out);
  }
}

int LookupCommand(Context& context, const std::vector<std::string>& args) {
  po::options_description options("formulary lookup options");
  options.add_options()("code", po::value<std::string>()->default_value(""), "a product code to resolve")(
      "code-system", po::value<std::string>()->default_value(""), "the code's system, e.g. ATC");
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload formulary lookup TEXT [--code CODE --code-system SYSTEM]", options,
                         {{"text", -1}}, args, exit_code);
  if (!vm) return exit_code;
  if (context.format == Format::kSvg) return Fail(context, Status::Usage("formulary lookup writes text, csv, json or html"));
  LookupModel model;
  if (vm->count("text") != 0U) model.description = Join((*vm)["text"].as<std::vector<std::string>>(), " ");
  model.code = (*vm)["code"].as<std::string>();
  model.code_system = (*vm)["code-system"].as<std::string>();
  if (model.description.empty() && model.code.empty()) {
    return Fail(context, Status::Usage("formulary lookup needs a product description TEXT or --code"));
  }
  auto formulary = LoadFormulary(context.formulary_dir);
  if (!formulary.ok()) return Fail(context, formulary.status());
  model.formulary = &*formulary;
  model.product = Resolve(*formulary, model.description, model.code, model.code_system);
  WriteLookup(context, model);
  return 0;
}

// ---- formulary unmatched ----

void WriteUnmatched(Context& context, const std::vector<ProductCount>& products, const std::string& checksum) {
  std::ostream& out = *context.out;
  const std::vector<std::string> header = {"product", "code", "code_system", "items", "patients"};
  std::vector<std::vector<std::string>> rows;
  long items = 0;
  for (const ProductCount& product : products) {
    rows.push_back({product.product, product.code, product.code_system, std::to_string(product.items),
                    std::to_string(product.patients)});
    items += product.items;
  }
  switch (context.format) {
    case Format::kJson: {
      json list = json::array();
      for (const ProductCount& p : products) {
        list.push_back({{"product", p.product}, {"code", p.code}, {"code_system", p.code_system},
                        {"items", p.items}, {"patients", p.patients}});
      }
      out << JsonText(json{{"products", list}, {"unmatched_products", products.size()},
                           {"unmatched_items", items}, {"formulary_checksum", checksum},
                           {"caution", std::string(kCaution)}})
          << "\n";
      return;
    }
    case Format::kCsv:
      WriteCsvCaution(out);
      out << CsvRow(header);
      for (const auto& row : rows) out << CsvRow(row);
      return;
    case Format::kHtml:
      WriteHtmlStart(out, "Unmatched products");
      out << "<h1>Products the formulary does not recognise</h1>\n<p>" << products.size() << " products, " << items
          << " items</p>\n";
      WriteHtmlTable(out, header, rows);
      WriteHtmlEnd(out);
      return;
    default: break;
  }
  out << products.size() << " unmatched products, " << items << " items\n";
  if (!rows.empty()) WriteTextTable(out, header, rows);
  WriteTextCaution(out);
}

int UnmatchedCommand(Context& context, const std::vector<std::string>& args) {
  po::options_description options("formulary unmatched options");
  options.add_options()("limit", po::value<long>()->default_value(0), "show at most N products (0: all)");
  int exit_code = 0;
  auto vm = ParseOptions(context, "medload formulary unmatched [--limit N]", options, {}, args, exit_code);
  if (!vm) return exit_code;
  if (context.format == Format::kSvg) return Fail(context, Status::Usage("formulary unmatched writes text, csv, json or html"));
  const long limit = (*vm)["limit"].as<long>();
  if (limit < 0) return Fail(context, Status::Usage("--limit must be 0 or more"));
  auto formulary = LoadFormulary(context.formulary_dir);
  if (!formulary.ok()) return Fail(context, formulary.status());
  auto store = Store::Open(context.db_path, StoreOptions{30000, true, true});
  if (!store.ok()) return Fail(context, store.status());
  auto counts = store->ProductCounts();
  if (!counts.ok()) return Fail(context, counts.status());
  std::vector<ProductCount> unmatched;
  for (const ProductCount& product : *counts) {
    if (!Resolve(*formulary, product.product, product.code, product.code_system).matched()) unmatched.push_back(product);
  }
  std::stable_sort(unmatched.begin(), unmatched.end(), [](const ProductCount& a, const ProductCount& b) {
    return a.items != b.items ? a.items > b.items : a.patients > b.patients;
  });
  if (limit > 0 && unmatched.size() > static_cast<size_t>(limit)) unmatched.resize(static_cast<size_t>(limit));
  WriteUnmatched(context, unmatched, formulary->checksum());
  return 0;
}

}  // namespace

int RunFormularyCheck(Context& context, const std::vector<std::string>& args) {
  return CheckCommand(context, args);
}
int RunFormularyLookup(Context& context, const std::vector<std::string>& args) {
  return LookupCommand(context, args);
}
int RunFormularyUnmatched(Context& context, const std::vector<std::string>& args) {
  return UnmatchedCommand(context, args);
}

}  // namespace medload::cli
