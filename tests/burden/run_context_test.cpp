#include "medload/burden/run_context.h"

#include <doctest/doctest.h>

#include "medload/formulary/resolver.h"
#include "medload/store/store.h"

namespace medload {

TEST_SUITE("burden/run_context") {

TEST_CASE("each distinct product is resolved once and the store remembers it under the formulary checksum and versions") {
  auto store = Store::Open(":memory:");
  REQUIRE(store.ok());
  auto analysis = RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, &*store);
  REQUIRE(analysis.ok());
  DispensingRecord record;
  record.product = "Amitriptyline 10mg tablets";
  const ResolvedProduct& first = analysis->Resolve(record);
  CHECK(&analysis->Resolve(record) == &first);
  CHECK(analysis->resolved_products() == 1);
  REQUIRE(first.is_medicine());
  CHECK(first.ingredients[0].ingredient == "amitriptyline");

  const std::string checksum = analysis->ResolutionKey();
  CHECK(checksum == analysis->formulary().checksum() + " medload " MEDLOAD_VERSION " resolver " +
                        std::to_string(kResolverVersion));
  auto saved = store->CachedResolution(record.product, "", "", checksum);
  REQUIRE(saved.ok());
  REQUIRE(saved->has_value());
  // Another checksum (a changed table) has nothing saved, so it would re-resolve.
  auto other = store->CachedResolution(record.product, "", "", std::string(64, '0'));
  REQUIRE(other.ok());
  CHECK_FALSE(other->has_value());
  // Nor has the same tables' checksum under another medload version (an upgrade).
  auto older = store->CachedResolution(record.product, "", "", analysis->formulary().checksum() + " medload 0.0.1");
  REQUIRE(older.ok());
  CHECK_FALSE(older->has_value());

  // Nor under the same tables and medload version with the resolver before this one.
  auto stale = store->CachedResolution(record.product, "", "", analysis->formulary().checksum() + " medload " MEDLOAD_VERSION);
  REQUIRE(stale.ok());
  CHECK_FALSE(stale->has_value());

  // A second run reads the saved resolution back: prove it by saving a marked one.
  ResolvedProduct marked = first;
  marked.match_detail = "saved earlier";
  REQUIRE(store->SaveResolution(record.product, "", "", checksum, SerialiseResolution(marked)).ok());
  auto again = RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, &*store);
  REQUIRE(again.ok());
  CHECK(again->Resolve(record).match_detail == "saved earlier");
}

TEST_CASE("an unknown scale is a usage error naming the known scales") {
  MeasureOptions options;
  options.scale = "nosuch";
  auto analysis = RunContext::Open(MEDLOAD_SOURCE_FORMULARY, options, nullptr);
  REQUIRE_FALSE(analysis.ok());
  CHECK(analysis.status().code() == StatusCode::kUsage);
  CHECK(analysis.status().message() == "scale \"nosuch\" is not a scale in " MEDLOAD_SOURCE_FORMULARY
                                       "/anticholinergic/ (known: acb, ars)");
}

TEST_CASE("a resolution saved by an earlier resolver with the same tables and version is not reused") {
  auto store = Store::Open(":memory:");
  REQUIRE(store.ok());
  auto analysis = RunContext::Open(MEDLOAD_SOURCE_FORMULARY, MeasureOptions{}, &*store);
  REQUIRE(analysis.ok());
  DispensingRecord record;
  record.product = "Detrusitol 2mg tablets (Pfizer Ltd)";
  // What the resolver before brands and abbreviations saved: unmatched.
  const std::string earlier_key = analysis->formulary().checksum() + " medload " MEDLOAD_VERSION;
  REQUIRE(store->SaveResolution(record.product, "", "", earlier_key, SerialiseResolution(ResolvedProduct{})).ok());
  const ResolvedProduct& product = analysis->Resolve(record);
  CHECK(product.match == MatchKind::kProduct);
  REQUIRE(product.ingredients.size() == 1);
  CHECK(product.ingredients[0].ingredient == "tolterodine");
}

}  // TEST_SUITE

}  // namespace medload
