#include "medload/dose/supply.h"

#include <algorithm>
#include <cmath>

#include "medload/dose/dose_unit.h"

namespace medload {
namespace {

// A unit as stated: empty -> nullopt with ok = true; unknown -> nullopt with ok = false.
std::optional<DoseUnit> Canonical(std::string_view unit, bool& ok) {
  ok = true;
  if (unit.empty()) return std::nullopt;
  auto canonical = ReadDoseUnit(unit);
  ok = canonical.has_value();
  return canonical;
}

void Explain(std::string* why, std::string text) {
  if (why != nullptr) *why = std::move(text);
}

// Administrations a day without a dose: one unit each when the quantity is counted in a
// single-unit form (tablets, capsules, patches...); for anything else (ml, puffs, an
// unknown unit) the amount is not known.
std::optional<double> AdministrationsAsUnits(const DosageReading& dosage, const QuantityUnit& quantity_unit,
                                             std::string* why) {
  const auto quantity = ReadDoseUnit(quantity_unit.unit);
  if (quantity && IsSingleUnitForm(quantity->name) && quantity->factor == 1) return dosage.units_per_day;
  Explain(why, "the dosage gives a frequency without a dose, and the quantity is not counted in "
               "tablets, capsules or other single units" +
                   (quantity_unit.unit.empty() ? std::string() : " (it is in \"" + quantity_unit.unit + "\")"));
  return std::nullopt;
}

}  // namespace

std::string_view SupplyRuleName(SupplyRule rule) {
  switch (rule) {
    case SupplyRule::kRecordDaysSupply: return "days_supply";
    case SupplyRule::kDosageText: return "dosage";
    case SupplyRule::kProductDefault: return "product_default";
    case SupplyRule::kDefaultDays: return "default";
  }
  return "default";
}

std::optional<double> UnitsPerDayOfQuantity(const DosageReading& dosage,
                                            const QuantityUnit& quantity_unit,
                                            std::string* why) {
  if (!dosage.units_per_day || !(*dosage.units_per_day > 0) ||
      !std::isfinite(*dosage.units_per_day)) {
    return std::nullopt;
  }
  if (dosage.unit == kAdministrationUnit) return AdministrationsAsUnits(dosage, quantity_unit, why);
  bool dose_ok = true;
  bool quantity_ok = true;
  const auto dose = Canonical(dosage.unit, dose_ok);
  const auto quantity = Canonical(quantity_unit.unit, quantity_ok);
  if (!dose_ok || !quantity_ok) {
    Explain(why, "unit \"" + (dose_ok ? quantity_unit.unit : dosage.unit) + "\" is not known");
    return std::nullopt;
  }
  const double per_day = *dosage.units_per_day * (dose ? dose->factor : 1);
  const double quantity_factor = quantity ? quantity->factor : 1;
  const bool strength = quantity_unit.mg_per_unit && *quantity_unit.mg_per_unit > 0;
  if (dose && dose->name == "mg" && (!quantity || quantity->name != "mg")) {
    if (!strength) {
      Explain(why, "the dosage is in mg and the strength per unit is not known");
      return std::nullopt;
    }
    return per_day / *quantity_unit.mg_per_unit / quantity_factor;
  }
  if (!dose || !quantity || SameDoseUnit(dose->name, quantity->name)) {
    return per_day / quantity_factor;
  }
  Explain(why, "the dosage is in " + std::string(dose->name) + " and the quantity in " +
                   std::string(quantity->name));
  return std::nullopt;
}

Supply ComputeSupply(double quantity, std::optional<int> record_days_supply,
                     const DosageReading& dosage, std::optional<int> product_default_days,
                     const SupplyOptions& options, const QuantityUnit& quantity_unit) {
  Supply supply;
  supply.units_per_day = UnitsPerDayOfQuantity(dosage, quantity_unit, &supply.note);
  const int max_days = std::max(1, options.max_supply_days);
  double days = 0;
  if (record_days_supply && *record_days_supply > 0) {
    supply.rule = SupplyRule::kRecordDaysSupply;
    days = *record_days_supply;
  } else if (supply.units_per_day && quantity > 0 && std::isfinite(quantity)) {
    supply.rule = SupplyRule::kDosageText;
    // A small tolerance so that 450 / 15 is 30 days even after rounding in the divisions.
    days = std::ceil(quantity / *supply.units_per_day - 1e-9);
  } else if (product_default_days && *product_default_days > 0) {
    supply.rule = SupplyRule::kProductDefault;
    days = *product_default_days;
  } else {
    supply.rule = SupplyRule::kDefaultDays;
    days = options.default_supply_days;
  }
  if (days > max_days) {
    supply.capped = true;
    days = max_days;
  }
  supply.days = std::max(1, static_cast<int>(days));
  return supply;
}

DosageReading ReadRecordDosage(const DispensingRecord& record, DosageTextCache* cache) {
  if (record.structured_units_per_day && *record.structured_units_per_day > 0) {
    DosageReading reading;
    reading.units_per_day = record.structured_units_per_day;
    reading.unit = record.structured_unit;
    reading.as_needed = record.structured_as_needed;
    const bool administrations = record.structured_unit == kAdministrationUnit;
    reading.understanding = administrations ? Understanding::kPartial : Understanding::kFull;
    reading.note = administrations ? "from the structured dosage: a frequency without a dose"
                                   : "from the structured dosage";
    return reading;
  }
  DosageReading reading = cache != nullptr ? cache->Read(record.dosage) : ReadDosageText(record.dosage);
  reading.as_needed = reading.as_needed || record.structured_as_needed;
  return reading;
}

}  // namespace medload
