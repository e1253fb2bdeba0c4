#include "medload/burden/timeline.h"

#include "medload/core/data_coverage.h"
#include "medload/dose/dose_unit.h"
#include "medload/dose/pack_content.h"
#include "medload/formulary/resolver.h"

#include <algorithm>
#include <cmath>
#include <iterator>
#include <map>

namespace medload {

std::string_view MeasureName(Measure measure) {
  return measure == Measure::kConcurrent ? "concurrent" : "lookback";
}

std::string_view CountByName(CountBy count_by) {
  return count_by == CountBy::kMedicine ? "medicine" : "ingredient";
}

int HistoryDays(const MeasureOptions& options) {
  return options.history_days.value_or(DefaultHistoryDays(options.episodes.grace_days));
}

int UnmatchedProduct::ItemsBy(Date on) const {
  return static_cast<int>(std::upper_bound(dispensed.begin(), dispensed.end(), on) - dispensed.begin());
}

std::optional<Date> UnmatchedProduct::LastBy(Date on) const {
  const auto it = std::upper_bound(dispensed.begin(), dispensed.end(), on);
  if (it == dispensed.begin()) return std::nullopt;
  return *std::prev(it);
}

namespace {

bool Counts(const DispensingRecord& record) {
  return record.status.empty() || record.status == "completed";
}

bool RouteExcluded(Route route, const MeasureOptions& options) {
  return std::find(options.exclude_routes.begin(), options.exclude_routes.end(), route) !=
         options.exclude_routes.end();
}

void NoteUnmatched(std::map<std::string, UnmatchedProduct>& unmatched, const DispensingRecord& r,
                   const ResolvedProduct& product) {
  UnmatchedProduct& entry = unmatched[r.product + '\x1f' + r.code];
  entry.product = r.product;
  entry.code = r.code;
  entry.match = product.match;
  entry.detail = product.flagged() ? FlagDescription(product) : product.match_detail;
  entry.dispensed.push_back(r.dispensed_on);
}

// Moves the noted products into `into`, by product text, each with its dispensings in date order.
void MoveNoted(std::map<std::string, UnmatchedProduct>& noted, std::vector<UnmatchedProduct>& into) {
  for (auto& [key, entry] : noted) {
    std::sort(entry.dispensed.begin(), entry.dispensed.end());
    into.push_back(std::move(entry));
  }
}

// The groups a product's ingredients count as: one medicine, or one per ingredient.
std::vector<std::vector<ResolvedIngredient>> Groups(const ResolvedProduct& product,
                                                    CountBy count_by) {
  std::vector<ResolvedIngredient> sorted = product.ingredients;
  std::sort(sorted.begin(), sorted.end(),
            [](const auto& a, const auto& b) { return a.ingredient < b.ingredient; });
  sorted.erase(std::unique(sorted.begin(), sorted.end(),
                           [](const auto& a, const auto& b) { return a.ingredient == b.ingredient; }),
               sorted.end());
  if (count_by == CountBy::kMedicine) return {sorted};
  std::vector<std::vector<ResolvedIngredient>> groups;
  for (const auto& ingredient : sorted) groups.push_back({ingredient});
  return groups;
}

std::string KeyOf(const std::vector<ResolvedIngredient>& group) {
  std::string key;
  for (const auto& ingredient : group) {
    if (!key.empty()) key += '+';
    key += ingredient.ingredient;
  }
  return key;
}

// A product's groups with their medicine keys, worked out once per product per timeline
// (a patient's history repeats a few products many times).
struct ProductGroups {
  const ResolvedProduct* product = nullptr;
  // key, ingredients
  std::vector<std::pair<std::string, std::shared_ptr<const std::vector<ResolvedIngredient>>>> groups;
  std::optional<double> units_per_container;  // DispensingUse::units_per_container
};

// Units of the quantity in one ampoule, syringe or vial of an injection: the ml of one
// ("40mg/2ml", "20mg/ml 2ml ampoules") when the dose unit is ml, else 1; empty when an
// ml product does not say how much one holds, and for anything but an injection.
std::optional<double> UnitsPerContainer(const ResolvedProduct& product, std::string_view description) {
  if (product.route != Route::kInjection) return std::nullopt;
  if (product.dose_unit != "ml") return 1.0;
  for (const Strength& strength : ParseStrengths(NormaliseText(description))) {
    if (strength.per == "ml" && strength.per_amount != 1 && strength.per_amount > 0) return strength.per_amount;
  }
  const PackContent pack = ReadPackContent(description);
  if (pack.ml && *pack.ml > 0) return pack.ml;
  return std::nullopt;
}

// A depot's quantity in whole ampoules or syringes for its supply per unit, whatever
// volume is recorded: a quantity in ml (or without a unit that does not look like a count
// of containers, LooksLikeContainers) is divided by the ml one holds.
double ContainersOf(double quantity, const DispensingRecord& record, std::optional<double> per_container) {
  if (!per_container || *per_container == 1 || !(quantity > 0)) return quantity;
  const bool ml = record.unit.empty() ? !LooksLikeContainers(quantity, *per_container)
                                      : ReadDoseUnit(record.unit) && ReadDoseUnit(record.unit)->name == "ml";
  return ml ? std::ceil(quantity / *per_container - 1e-9) : quantity;
}

const ProductGroups& GroupsOf(std::vector<ProductGroups>& seen, const ResolvedProduct& product,
                              std::string_view description, CountBy count_by) {
  for (const ProductGroups& entry : seen) {
    if (entry.product == &product) return entry;
  }
  ProductGroups& entry = seen.emplace_back();
  entry.product = &product;
  entry.units_per_container = UnitsPerContainer(product, description);
  for (auto& group : Groups(product, count_by)) {
    std::string key = KeyOf(group);
    entry.groups.emplace_back(std::move(key),
                              std::make_shared<const std::vector<ResolvedIngredient>>(std::move(group)));
  }
  return entry;
}

void FinishMedicine(Medicine& medicine, const MeasureOptions& options) {
  std::stable_sort(medicine.uses.begin(), medicine.uses.end(), [](const auto& a, const auto& b) {
    return a.dispensed_on != b.dispensed_on ? a.dispensed_on < b.dispensed_on : a.record < b.record;
  });
  std::vector<Coverage> coverages;
  coverages.reserve(medicine.uses.size());
  for (size_t i = 0; i < medicine.uses.size(); ++i) {
    coverages.push_back(Coverage{medicine.uses[i].dispensed_on, medicine.uses[i].supply.days, i});
  }
  medicine.episodes = BuildEpisodes(coverages, options.episodes);
}

}  // namespace

Timeline BuildTimeline(std::span<const DispensingRecord> records, const ResolveFn& resolve,
                       const MeasureOptions& options, DosageTextCache* dosages) {
  Timeline timeline;
  std::map<std::string, Medicine> medicines;
  std::map<std::string, UnmatchedProduct> unmatched, flagged;
  std::vector<ProductGroups> product_groups;
  for (size_t i = 0; i < records.size(); ++i) {
    const DispensingRecord& record = records[i];
    if (!Counts(record)) {
      ++timeline.not_dispensed_items;
      continue;
    }
    const ResolvedProduct& product = resolve(record);
    if (!product.matched()) {
      NoteUnmatched(unmatched, record, product);
      continue;
    }
    if (product.flagged()) NoteUnmatched(flagged, record, product);  // counts, and is said
    if (!product.is_medicine()) {
      ++timeline.non_medicine_items;
      continue;
    }
    DosageReading dosage = ReadRecordDosage(record, dosages);
    if ((options.exclude_prn && dosage.as_needed) || RouteExcluded(product.route, options)) {
      ++timeline.excluded_items;
      continue;
    }
    QuantityUnit quantity_unit{record.unit.empty() ? product.dose_unit : record.unit, std::nullopt,
                               record.unit.empty(), record.product, product.form,
                               product.ingredients.size()};
    if (product.ingredients.size() == 1) quantity_unit.mg_per_unit = product.ingredients[0].mg_per_unit;
    if (dosages != nullptr) quantity_unit.pack = &dosages->Pack(record.product, product.form, product.ingredients.size());
    const ProductGroups& grouped = GroupsOf(product_groups, product, record.product, options.count_by);
    const double units = ContainersOf(record.quantity, record, grouped.units_per_container);
    const Supply supply = ComputeSupply(record.quantity, record.days_supply, dosage,
                                        ProductDefaultSupplyDays(product, units), options.supply, quantity_unit);
    const auto& groups = grouped.groups;
    for (size_t g = 0; g < groups.size(); ++g) {
      const auto& [key, ingredients] = groups[g];
      Medicine& medicine = medicines[key];
      if (medicine.key.empty()) {
        medicine.key = key;
        for (const auto& ingredient : *ingredients) medicine.ingredients.push_back(ingredient.ingredient);
      }
      // The reading is moved into the last group's use (most products have one group).
      medicine.uses.push_back(DispensingUse{i, record.dispensed_on, record.quantity, supply,
                                            g + 1 == groups.size() ? std::move(dosage) : dosage,
                                            product.route, ingredients, grouped.units_per_container});
    }
  }
  for (auto& [key, medicine] : medicines) {
    FinishMedicine(medicine, options);
    timeline.medicines.push_back(std::move(medicine));
  }
  MoveNoted(unmatched, timeline.unmatched);
  MoveNoted(flagged, timeline.flagged);
  return timeline;
}

}  // namespace medload
