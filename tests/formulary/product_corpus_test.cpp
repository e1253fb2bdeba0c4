// The product corpus (tests/data/formulary/product_corpus.csv): descriptions as
// dispensing data writes them, each with the ingredients a pharmacist would read in it,
// resolved against the bundled formulary. The figures it prints are the ones reported in
// docs/formulary.md.
#include <doctest/doctest.h>

#include <algorithm>
#include <fstream>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"
#include "formulary/table_reader.h"
#include "medload/formulary/resolver.h"

namespace medload {
namespace {

using testing::BundledFormulary;

struct CorpusRow {
  int line = 0;
  std::string category, description, expected, route;
  std::vector<std::string> ingredients;
};

std::vector<CorpusRow> ReadCorpus() {
  const std::string path = std::string(MEDLOAD_TEST_DATA) + "/formulary/product_corpus.csv";
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  std::vector<std::string> faults;
  const auto table = formulary_internal::ParseTable(
      "product_corpus.csv", text.str(), {"category", "description", "expected", "ingredients", "route"}, faults);
  for (const std::string& fault : faults) FAIL_CHECK(fault);
  std::vector<CorpusRow> rows;
  if (!table) return rows;
  for (const auto& row : table->rows) {
    rows.push_back(CorpusRow{row.line, row.fields[0], row.fields[1], row.fields[2], row.fields[4],
                             formulary_internal::SplitList(row.fields[3])});
  }
  return rows;
}

// The canonical name of an expected ingredient (the corpus writes British names).
std::string Canonical(const Formulary& formulary, const std::string& name) {
  const Ingredient* ingredient = formulary.FindIngredient(name);
  return ingredient != nullptr ? ingredient->name : "?" + name;
}

bool IsCleanMatch(MatchKind kind) {
  return kind == MatchKind::kCode || kind == MatchKind::kProduct || kind == MatchKind::kIngredient;
}

enum class Verdict { kRight, kWrong, kConfidentlyWrong };

Verdict Judge(const Formulary& formulary, const CorpusRow& row, const ResolvedProduct& product) {
  std::set<std::string> expected, found;
  for (const std::string& name : row.ingredients) expected.insert(Canonical(formulary, name));
  for (const ResolvedIngredient& ingredient : product.ingredients) found.insert(ingredient.ingredient);
  const bool same_set = expected == found;
  const bool route_right = row.route.empty() || RouteName(product.route) == row.route;
  // A clean match (code, product, ingredient) presents its ingredients as certain.
  if (IsCleanMatch(product.match)) {
    if (row.expected != "resolved" || !same_set) return Verdict::kConfidentlyWrong;
    return route_right ? Verdict::kRight : Verdict::kWrong;
  }
  const bool kind_right = row.expected == MatchKindName(product.match);
  return kind_right && same_set && route_right ? Verdict::kRight : Verdict::kWrong;
}

std::string Describe(const ResolvedProduct& product) {
  std::string text = std::string(MatchKindName(product.match)) + " [";
  for (const ResolvedIngredient& ingredient : product.ingredients) text += ingredient.ingredient + ";";
  return text + "] " + std::string(RouteName(product.route)) + " (" + product.match_detail + ")";
}

struct Tally {
  int rows = 0, right = 0, confidently_wrong = 0;
};

TEST_SUITE("formulary/product_corpus") {

// Expected ingredients are the author's reading of each description (common practice).
TEST_CASE("the product corpus resolves at least 97% right, 90% of brand lines, none confidently wrong") {
  const Formulary& formulary = BundledFormulary();
  const std::vector<CorpusRow> rows = ReadCorpus();
  REQUIRE(rows.size() >= 300);
  std::map<std::string, Tally> by_category;
  Tally all;
  for (const CorpusRow& row : rows) {
    const ResolvedProduct product = Resolve(formulary, row.description);
    const Verdict verdict = Judge(formulary, row, product);
    Tally& category = by_category[row.category];
    for (Tally* tally : {&category, &all}) {
      ++tally->rows;
      tally->right += verdict == Verdict::kRight ? 1 : 0;
      tally->confidently_wrong += verdict == Verdict::kConfidentlyWrong ? 1 : 0;
    }
    if (verdict != Verdict::kRight) {
      const std::string how = verdict == Verdict::kConfidentlyWrong ? " CONFIDENTLY WRONG" : " wrong";
      MESSAGE("line " << row.line << how
                      << ": \"" << row.description << "\" expected " << row.expected << " ["
                      << (row.ingredients.empty() ? "" : row.ingredients.front()) << "...] " << row.route
                      << ", got " << Describe(product));
    }
  }
  for (const auto& [name, tally] : by_category) {
    MESSAGE(name << ": " << tally.right << "/" << tally.rows << " right, " << tally.confidently_wrong
                 << " confidently wrong");
  }
  MESSAGE("all: " << all.right << "/" << all.rows << " right, " << all.confidently_wrong << " confidently wrong");
  CHECK(all.confidently_wrong == 0);
  CHECK(all.right * 100 >= all.rows * 97);
  const Tally& brands = by_category["brand"];
  CHECK(brands.right * 100 >= brands.rows * 90);
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
