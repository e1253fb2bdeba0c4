// The products the synthetic-data generator dispenses: British generic descriptions,
// their usual quantities and the dosage instructions written for them, in one list so
// that the formulary's tests can check that every medicine description resolves. It does
// not say which ingredients a product holds; that is the formulary's job.
#pragma once

#include <optional>
#include <string_view>
#include <vector>

namespace medload {

enum class CatalogueKind { kMedicine, kNonMedicine };

// How a product is supplied over time.
enum class CatalogueUse {
  kRegular,    // a repeat taken every day (or every week) as written
  kAsNeeded,   // a repeat taken when required; refilled irregularly
  kCourse,     // a short course (antibiotics, steroid bursts, a tube of cream)
  kAppliance,  // a non-medicine item on repeat (test strips, dressings, stockings)
};

enum class PeriodUnit { kHour, kDay, kWeek };

// One regimen as the prescriber wrote it: structured (as a FHIR R4 Dosage would carry
// it) and as the instruction texts that express it. A dose of 0 or a frequency of 0
// means the regimen has no structured form ("use as directed").
struct CatalogueDosage {
  double dose_low = 0;       // units per administration (the low end of a range)
  double dose_high = 0;      // units per administration (the high end; = dose_low if none)
  int frequency = 0;         // administrations per period
  int period = 1;            // the period's length in `period_unit`s
  PeriodUnit period_unit = PeriodUnit::kDay;
  bool as_needed = false;    // "when required"
  std::string_view dose_unit;              // "tablet", "puff", "ml", ... (FHIR doseQuantity)
  std::vector<std::string_view> texts;     // ways of writing it; texts[0] the plainest
};

struct CatalogueProduct {
  std::string_view key;          // stable short key used by the care plans, unique
  std::string_view description;  // as dispensed: "Amlodipine 5mg tablets"
  CatalogueKind kind = CatalogueKind::kMedicine;
  CatalogueUse use = CatalogueUse::kRegular;
  std::string_view unit;         // the unit of `quantity`: "tablet", "ml", "dose", ...
  double quantity = 0;           // a usual quantity for one dispensing (> 0)
  const CatalogueDosage* dosage = nullptr;  // never null
  // Days one usual quantity lasts when the dosage cannot say (insulin "as directed",
  // eye drops); 0 = derive from the dosage; -1 = unknown, never recorded as days supply.
  int stated_days = 0;
  // Days between repeats when that is not the days the quantity lasts (as-needed items,
  // appliances); 0 = the days the quantity lasts.
  int repeat_days = 0;
  // The medicine a patient should not be given twice through two care plans
  // ("amlodipine"); also groups strengths of one medicine for dose changes.
  std::string_view medicine;
  // A typical target of a structured medication review (anticholinergic, sedative,
  // NSAID, long-term PPI ...): may be stopped after a review.
  bool review_target = false;
  // A controlled drug (Schedules 2-4): supplies are kept to 30 days or less (common
  // practice), so it is never issued two or three months at a time.
  bool controlled = false;
};

// Every product, in a fixed order. The reference stays valid for the whole program.
const std::vector<CatalogueProduct>& SynthCatalogue();

// The index in SynthCatalogue() of the product with this key, or nullopt.
std::optional<size_t> FindCatalogueProduct(std::string_view key);

// Units used per day by the regimen at its highest (upper end of a range, the stated
// maximum of an as-needed regimen), or nullopt when it has no structured form.
std::optional<double> UnitsPerDay(const CatalogueDosage& dosage);

// Days that `quantity` of `product` lasts: stated_days scaled to the quantity, else
// ceil(quantity / UnitsPerDay), else nullopt (stated_days -1, or no structured dosage).
// Always >= 1 when set.
std::optional<int> DaysCovered(const CatalogueProduct& product, double quantity);

}  // namespace medload
