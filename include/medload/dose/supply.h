// Days of supply of one dispensing, by the first rule that applies (docs/dosage-text.md):
// the record's days supply, the dosage's units per day (walked through the stages of a
// changing dose; quantities in packs, drops, units of insulin converted), the product
// default, the default; then the cap. It does not build coverages or episodes.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "medload/core/records.h"
#include "medload/dose/dosage_cache.h"
#include "medload/dose/dosage_text.h"
#include "medload/dose/pack_content.h"

namespace medload {

enum class SupplyRule { kRecordDaysSupply, kDosageText, kProductDefault, kDefaultDays };

// "days_supply", "dosage", "product_default", "default".
std::string_view SupplyRuleName(SupplyRule rule);

struct SupplyOptions {
  int default_supply_days = 28;  // --default-supply-days: days when nothing else says
  int max_supply_days = 180;     // --max-supply-days: no dispensing covers more days
};

// What one unit of the dispensed quantity is, so that a dosage in another unit can be
// divided into it. Every field is optional: an empty unit means "the dosage's unit".
struct QuantityUnit {
  // "tablet", "tablets", "mL", "5ml spoonful", "inhaler", "pen", ...: the record's unit
  // when it states one, else the product's dose unit (and from_product set).
  std::string unit;
  std::optional<double> mg_per_unit;  // strength per dose unit, for a dosage written in mg
  bool from_product = false;          // the record stated no unit: `unit` is the product's
  // The product as dispensed, for what one pack holds (pack_content.h): its description
  // ("Salbutamol 100micrograms/dose inhaler 200 dose"), resolved form ("inhaler") and
  // number of active ingredients.
  std::string description;
  std::string form;
  size_t ingredient_count = 0;
  // SupplyPackContent(description, form, ingredient_count) when the caller has it already
  // (DosageTextCache::Pack); read from the three fields above when null.
  const PackContent* pack = nullptr;
};

// 20 drops make 1 ml (common practice for eye and ear drops; real drop sizes vary).
inline constexpr double kDropsPerMl = 20;

struct Supply {
  int days = 1;                          // >= 1 and <= max(1, max_supply_days)
  SupplyRule rule = SupplyRule::kDefaultDays;
  bool capped = false;                   // the rule gave more than max_supply_days
  // The dosage's daily amount in the unit the quantity counts (the doses or ml in a pack
  // when the quantity was in packs), whenever it can be worked out, whichever rule set
  // `days` (the burden measures use it for mg per day). Empty for a staged dosage: see
  // `stages` and UnitsPerDayOnDay.
  std::optional<double> units_per_day;
  // A staged dosage's stages in the same unit (two or more, the last open-ended).
  std::vector<DoseStage> stages;
  // The quantity in that unit (a quantity of 1 inhaler holding 200 doses: 200), when the
  // dosage could be related to it.
  std::optional<double> units_dispensed;
  std::string note;                      // why the dosage could not be used, or empty
};

// The dosage's units per day in units of the quantity: the same unit (or one side not
// stated): as is; units that convert (5ml spoonful -> ml, g -> mg, tablet ~ capsule,
// drops -> ml at kDropsPerMl, units -> ml at the description's units per ml): converted;
// a dosage in mg (or g, micrograms) with mg_per_unit: mg per day / mg_per_unit; a unit
// that names a container (an inhaler, a pen): per container, from what one holds;
// administrations a day (kAdministrationUnit, a frequency without a dose): one unit each
// when the quantity's unit is a single-unit form (IsSingleUnitForm). Otherwise, or when
// the dosage has no units per day > 0, nullopt, with the reason in `*why` if given. For a
// staged dosage, the first stage's.
std::optional<double> UnitsPerDayOfQuantity(const DosageReading& dosage,
                                            const QuantityUnit& quantity_unit,
                                            std::string* why = nullptr);

// docs/dosage-text.md, first rule that applies: the record's days supply (> 0);
// ceil(quantity / units per day) where the dosage gives units per day > 0 in a unit
// that relates to the quantity's (see UnitsPerDayOfQuantity) and quantity > 0 (for a
// staged dosage, the days the quantity lasts taken through the stages in order, the
// last stage continuing while quantity remains, none after "then stop"); the product
// default (> 0); options.default_supply_days. Then min(days, max_supply_days). A
// quantity without a unit that LooksLikeContainers of what one pack holds is read in
// packs. Days are at least 1 always (options below 1 are read as 1). Pure; never fails.
Supply ComputeSupply(double quantity, std::optional<int> record_days_supply,
                     const DosageReading& dosage, std::optional<int> product_default_days,
                     const SupplyOptions& options, const QuantityUnit& quantity_unit = {});

// The units per day of `supply`'s dosage in force on day `day` (0 = the day of
// dispensing), in the unit of Supply::units_per_day: the stage that covers the day for a
// staged dosage, else units_per_day. nullopt when unknown or day < 0. Pure.
std::optional<double> UnitsPerDayOnDay(const Supply& supply, int day);

// The dosage of a dispensing record: its structured FHIR amount a day when the reader
// kept one (unit: structured_unit, empty meaning the record's own unit), else
// ReadDosageText of its text (through `cache` when given); as-needed when either says so.
DosageReading ReadRecordDosage(const DispensingRecord& record, DosageTextCache* cache = nullptr);

}  // namespace medload
