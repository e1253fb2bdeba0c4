// The formulary: the editable tables in formulary/ (ingredients, anticholinergic scales,
// Drug Burden Index doses, named products, codes, non-medicine terms, combination rules)
// read into one immutable value with name lookups and a checksum of their contents.
// It does not resolve product descriptions (resolver.h) nor compute any measure.
#pragma once

#include <cstddef>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "medload/core/status.h"
#include "medload/formulary/longitudinal_tables.h"
#include "medload/formulary/product.h"
#include "medload/formulary/route_policy.h"
#include "medload/formulary/rules.h"
#include "medload/formulary/unit_doses.h"

namespace medload {

// One row of ingredients.csv. `name` is the canonical name (British approved name).
struct Ingredient {
  std::string name;
  std::vector<std::string> synonyms;  // US and former British names, other spellings
  std::vector<std::string> atc;       // ATC codes (WHO), upper case
  std::vector<std::string> classes;   // lower-case hyphenated class names
  std::string source;
  int line = 0;                       // line in ingredients.csv (0 when built in memory)
};

// One row of a scale file anticholinergic/NAME.csv.
struct ScaleRow {
  std::string ingredient;  // canonical after loading
  int score = 0;           // 0..3
  std::string source;
  int line = 0;
  // The routes on which the score counts (the optional `routes` column); empty: the
  // formulary's systemic routes (Formulary::SystemicRoutes).
  std::vector<Route> routes = {};
};

struct Scale {
  std::string name;        // the file name without .csv, lower case ("acb", "ars")
  std::vector<ScaleRow> rows;
};

enum class DbiEffect { kAnticholinergic, kSedative, kBoth };
std::string_view DbiEffectName(DbiEffect effect);  // "anticholinergic", "sedative", "both"

// One row of dbi.csv: the minimum recommended daily dose (delta in Hilmer et al. 2007).
struct DbiDose {
  std::string ingredient;          // canonical after loading
  double min_daily_dose_mg = 0;    // > 0
  DbiEffect effect = DbiEffect::kBoth;
  std::string source;
  int line = 0;
  // The routes on which the ingredient counts (the optional `routes` column); empty: the
  // formulary's systemic routes.
  std::vector<Route> routes = {};
};

// One row of dbi_classes.csv: a class whose members have the sedative or anticholinergic
// effects the Drug Burden Index counts, so that a member without a dbi.csv row is listed
// as incomplete rather than adding a silent 0.
struct DbiClass {
  std::string class_name;
  DbiEffect effect = DbiEffect::kBoth;
  std::string source;
  int line = 0;
};

// One row of products.csv or brands.csv: a named product the ingredient words cannot
// resolve alone (British compound names, brands, packs that imply a supply).
struct NamedProduct {
  std::string name;                         // the words that name it ("co-codamol")
  std::vector<std::string> requires_words;  // further words that must all appear ("patch")
  std::vector<std::string> ingredients;     // canonical, in the order strengths are written
  std::string form;                         // overrides the form words when set
  std::optional<Route> route;               // overrides the route from the form words
  std::string dose_unit;                    // overrides the dose unit when set
  std::optional<int> supply_days_per_unit;  // days one unit lasts (patch, depot)
  std::string source;
  int line = 0;
  std::string table = "products.csv";       // the file the row came from
  // False for a combination brand read from a dictionary, whose ingredient order need not
  // be the order its strengths are written in: it then takes no strengths from the text.
  bool strengths_in_order = true;
};

// One row of dictionary.csv: a product of a national dictionary (dm+d, RxNorm) or of a
// user's own list, written by `medload formulary load-dictionary` or by hand.
struct DictionaryEntry {
  std::string code_system;  // "dmd", "rxnorm", or as the records carry it
  std::string code;         // may be empty for a row that only names a product
  std::string name;         // the dictionary's description; an exact match resolves
  std::string brand;        // brand words that name it in other descriptions; may be empty
  // Canonical names in the order strengths are written, each optionally "=STRENGTH"
  // ("codeine=30mg"; "codeine=" when its strength is not known). "?name" is a substance
  // ingredients.csv does not know: a product naming one resolves as partial.
  std::vector<std::string> ingredients;
  std::string source;
  int line = 0;
};

// One row of codes.csv: a code in a code system naming a product or an ingredient.
struct ProductCode {
  std::string code_system;  // as written; compared case-insensitively ("ATC", a URI, ...)
  std::string code;
  std::string target;       // a products.csv name or an ingredient name
  std::string source;
  int line = 0;
};

// One row of non_medicines.csv: words that mark an item as not a medicine.
struct NonMedicineTerm {
  std::string term;
  std::string category;     // "dressing", "appliance", "testing", ...
  std::string source;
  int line = 0;
};

// One row of routes.csv: whether a route counts as systemic for the measures by default.
struct RouteRow {
  Route route = Route::kOther;
  bool systemic = false;
  std::string source;
  int line = 0;
};

// Everything read from the folder, before cross-checking. Plain data so that tests can
// build a formulary in memory.
struct FormularyTables {
  std::vector<Ingredient> ingredients;
  std::vector<Scale> scales;               // sorted by name
  std::vector<DbiDose> dbi;
  std::vector<DbiClass> dbi_classes;
  std::vector<NamedProduct> products;
  std::vector<ProductCode> codes;
  std::vector<NonMedicineTerm> non_medicines;
  std::vector<NamedProduct> brands;        // brands.csv (table "brands.csv")
  std::vector<DictionaryEntry> dictionary; // dictionary.csv
  std::vector<Rule> rules;
  std::vector<RouteRow> routes;            // routes.csv; routes it does not list keep the default
  std::vector<TsddDose> tsdd;              // anticholinergic/tsdd.csv (optional file)
  std::vector<FallsRiskRow> falls_risk;    // falls_risk.csv (optional file)
  std::vector<UnitDoseRow> unit_doses;     // unit_doses.csv (optional file)
  std::string checksum;                    // SHA-256 (hex) of all files read; may be empty
};

class NameIndex;  // the resolver's word index, private to src/formulary/

// The loaded formulary. Immutable; cheap to copy (shares its indexes).
class Formulary {
 public:
  Formulary();
  // Builds the lookups over `tables`. Names in scales, dbi, products, codes and rules are
  // mapped to canonical ingredient names where they resolve; unknown names stay as
  // written (CheckTables reports them). Never fails.
  static Formulary FromTables(FormularyTables tables);

  // The ingredient with `name` as its canonical name or a synonym, compared without case,
  // accents or punctuation ("Chlorpheniramine" -> chlorphenamine); nullptr if none.
  const Ingredient* FindIngredient(std::string_view name) const;
  // The ingredient carrying ATC code `code` (case-insensitive); nullptr if none.
  const Ingredient* FindByAtc(std::string_view code) const;
  // The classes of the ingredient (any name); empty if unknown.
  const std::vector<std::string>& ClassesOf(std::string_view ingredient) const;
  bool HasClass(std::string_view ingredient, std::string_view class_name) const;
  // True if some ingredient carries the class.
  bool IsKnownClass(std::string_view class_name) const;
  // Canonical names of the ingredients in a class, in table order.
  std::vector<std::string> IngredientsInClass(std::string_view class_name) const;

  // The scale names (file names without .csv), sorted.
  std::vector<std::string> ScaleNames() const;
  bool HasScale(std::string_view scale) const;
  // The ingredient's score on `scale`; nullopt when the scale does not list it or the
  // scale does not exist (measures count that as 0).
  std::optional<int> ScoreOn(std::string_view scale, std::string_view ingredient) const;
  // The Drug Burden Index row of the ingredient, or nullptr.
  const DbiDose* DbiOf(std::string_view ingredient) const;

  // The named product (products.csv, then brands.csv) with this name, or nullptr (first
  // row if several).
  const NamedProduct* FindProduct(std::string_view name) const;
  // The named product behind a target of name_index().products: products.csv rows, then
  // brands.csv rows, then the brands of dictionary.csv.
  const NamedProduct& NamedProductAt(size_t target) const;
  // The dictionary row for (code_system, code), or nullptr.
  const DictionaryEntry* FindDictionaryCode(std::string_view code_system, std::string_view code) const;
  // The dictionary row whose name is `description` (compared as NameKey after abbreviations
  // are written out), or nullptr.
  const DictionaryEntry* FindDictionaryName(std::string_view description) const;
  // The target of a code, or nullptr. `code_system` "ATC" also matches the WHO ATC URI.
  const ProductCode* FindCode(std::string_view code_system, std::string_view code) const;
  // The rule with this id, or nullptr.
  const Rule* FindRule(std::string_view id) const;
  // The routes that count as systemic by default: DefaultSystemicRoutes() changed by the
  // rows of routes.csv, in the specification's order.
  std::vector<Route> SystemicRoutes() const;

  const FormularyTables& tables() const { return *tables_; }
  const std::vector<Ingredient>& ingredients() const { return tables_->ingredients; }
  const std::vector<Rule>& rules() const { return tables_->rules; }
  // SHA-256 (64 hex digits) of the contents of every table file, for cache keys.
  const std::string& checksum() const { return tables_->checksum; }
  // The resolver's index (see resolver.h).
  const NameIndex& name_index() const { return *index_; }

  struct Lookups;  // opaque: the name and code maps, private to src/formulary/

 private:
  struct Private {};
  explicit Formulary(Private) {}
  std::shared_ptr<const FormularyTables> tables_;
  std::shared_ptr<const Lookups> lookups_;
  std::shared_ptr<const NameIndex> index_;
};

// What `formulary check` reports.
struct FormularyCheck {
  std::vector<std::string> faults;  // each "file:line: fault", in file order
  size_t ingredients = 0, synonyms = 0, scales = 0, scale_rows = 0, dbi_rows = 0,
         products = 0, brands = 0, dictionary_rows = 0, codes = 0, non_medicine_terms = 0,
         rules = 0, routes = 0;
  size_t tsdd_rows = 0, falls_risk_rows = 0, unit_dose_rows = 0;
  std::string checksum;
  bool ok() const { return faults.empty(); }
};

// Reads every table in `dir` and collects every fault: malformed rows (field count, empty
// name, bad number), duplicate names, a synonym claimed by two ingredients, a score out of
// 0..3, a DBI dose <= 0, a scale, dbi, product, code or rule naming an unknown ingredient,
// a rule naming an unknown class or scale, bad JSON (with its JSON pointer). A missing
// folder or a missing required file is a fault too. Never fails otherwise.
FormularyCheck CheckFormulary(const std::string& dir);

// Cross-checks tables already read (the part of CheckFormulary after parsing); appends
// to `faults`.
void CheckTables(const FormularyTables& tables, std::vector<std::string>& faults);

// Reads and checks `dir`. On any fault: Status::Input whose message lists every fault,
// one per line. On success the formulary, with its checksum.
Result<Formulary> LoadFormulary(const std::string& dir);

// The same name key the lookups use: case-folded, accents removed, every run of
// characters other than letters and digits turned into one space, trimmed.
std::string NameKey(std::string_view name);

// A code system as compared everywhere (codes.csv, dictionary.csv, the records): the
// NameKey with no spaces, so case and punctuation do not count ("dm+d" = "DMD"), and the
// FHIR URIs of the systems the formulary names read as those names ("atc" for
// http://www.whocc.no/atc, "dmd" for https://dmd.nhs.uk, "rxnorm" for the NLM RxNorm URI).
std::string CodeSystemKey(std::string_view system);

}  // namespace medload
