// A patient's medication history made ready for any number of census dates: dispensings
// resolved, days of supply worked out, grouped into medicines and merged into episodes.
// Built once per patient; evaluating a date (burden.h) reads it and never changes it.
#pragma once

#include <functional>
#include <memory>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "medload/burden/measure_options.h"
#include "medload/core/records.h"
#include "medload/dose/dosage_text.h"
#include "medload/dose/supply.h"
#include "medload/episode/episodes.h"
#include "medload/formulary/product.h"

namespace medload {

// One dispensing as it counts for one medicine.
struct DispensingUse {
  size_t record = 0;          // index into the patient's dispensing records
  Date dispensed_on;
  double quantity = 0;
  Supply supply;              // days, and which rule gave them
  DosageReading dosage;       // how the instruction was read
  Route route = Route::kUnknown;
  // This medicine's ingredients, with strengths; shared by the uses of one product in a
  // timeline (a history repeats a few products many times).
  std::shared_ptr<const std::vector<ResolvedIngredient>> ingredients;
  // For an injection: units of the quantity in one ampoule, syringe or vial (the ml one
  // holds when the strength is per ml: "40mg/2ml" or "2ml ampoule" -> 2; else 1); empty
  // when not known or not an injection. Depot doses and supplies count whole units.
  std::optional<double> units_per_container;
};

// The text of field `field` of the record `use` came from ("" when `records` does not
// reach that far: they are not the records the timeline was built from).
inline std::string RecordText(std::span<const DispensingRecord> records, const DispensingUse& use,
                              std::string DispensingRecord::*field) {
  return use.record < records.size() ? records[use.record].*field : std::string();
}

struct Medicine {
  std::string key;                       // canonical ingredient names joined by "+"
  std::vector<std::string> ingredients;  // canonical names, sorted
  std::vector<DispensingUse> uses;       // by dispensed_on, then record
  std::vector<Episode> episodes;         // Coverage::source indexes `uses`
};

// A product that nothing in the formulary recognised (it may be a medicine the measures
// cannot see), or one recognised only in part or from a close spelling (it counts with
// the ingredients read): outputs list it.
struct UnmatchedProduct {
  std::string product;
  std::string code;
  std::vector<Date> dispensed;  // the day of each of its dispensings, oldest first
  MatchKind match = MatchKind::kUnmatched;  // kUnmatched, kPartial or kApproximate
  std::string detail;                       // what was not known, or how it was read

  // Its dispensings on or before `on` (what was known then), and the latest of them.
  int ItemsBy(Date on) const;
  std::optional<Date> LastBy(Date on) const;
};

struct Timeline {
  std::vector<Medicine> medicines;         // sorted by key
  std::vector<UnmatchedProduct> unmatched; // by product text
  std::vector<UnmatchedProduct> flagged;   // partial or approximate matches, by product text
  int non_medicine_items = 0;              // dressings, appliances...: stored, never counted
  int excluded_items = 0;                  // left out by --exclude-prn or --exclude-route
  int not_dispensed_items = 0;             // records whose status does not count
};

// Resolves one record's product; the reference must stay valid, and unchanged, while
// BuildTimeline runs (it works out each product's groups once, by address).
using ResolveFn = std::function<const ResolvedProduct&(const DispensingRecord&)>;

// Builds the timeline of one patient from all of their dispensing records (any order).
// Pure apart from calling `resolve` and filling `dosages` (may be null: no cache).
Timeline BuildTimeline(std::span<const DispensingRecord> records, const ResolveFn& resolve,
                       const MeasureOptions& options, DosageTextCache* dosages = nullptr);

}  // namespace medload
