#include "medload/dose/supply.h"

#include <algorithm>
#include <cmath>

#include "medload/dose/dose_unit.h"
#include "medload/dose/pack_content.h"

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

bool DoseLike(std::string_view name) { return name == "puff" || name == "dose" || name == "spray"; }

std::string Number(double value) {
  std::string text = std::to_string(value);
  text.erase(text.find_last_not_of('0') + 1);
  if (!text.empty() && text.back() == '.') text.pop_back();
  return text;
}

// How the dispensed quantity is counted: one unit of it holds `content` of `unit`.
struct Basis {
  double content = 1;
  std::optional<DoseUnit> unit;  // nullopt: the dosage's unit
  PackContent pack;              // what the description says one pack holds
  std::string note;              // how packs were read, for explanations
};

// What one pack holds, in doses for a metered device, else in ml.
std::optional<DoseUnit> HeldIn(const PackContent& pack, bool wants_doses, double& amount) {
  if (pack.doses && (wants_doses || !pack.ml)) {
    amount = *pack.doses;
    return ReadDoseUnit("dose");
  }
  if (pack.ml) {
    amount = *pack.ml;
    return ReadDoseUnit("ml");
  }
  return std::nullopt;
}

// The basis of the quantity. `quantity` is given when the count itself may tell packs
// from doses (LooksLikeContainers); `dose` is the dosage's canonical unit, if any.
std::optional<Basis> BasisOf(std::optional<double> quantity, const QuantityUnit& quantity_unit,
                             const std::optional<DoseUnit>& dose, std::string* why) {
  Basis basis;
  basis.pack = quantity_unit.pack != nullptr
                   ? *quantity_unit.pack
                   : SupplyPackContent(quantity_unit.description, quantity_unit.form, quantity_unit.ingredient_count);
  bool ok = true;
  basis.unit = Canonical(quantity_unit.unit, ok);
  bool packs = IsContainerUnit(quantity_unit.unit);
  if (!packs && ok && basis.unit && quantity && quantity_unit.from_product) {
    const auto& pack = basis.pack;
    const std::string_view name = basis.unit->name;
    packs = (DoseLike(name) && pack.doses && LooksLikeContainers(*quantity, *pack.doses)) ||
            (name == "ml" && pack.ml && LooksLikeContainers(*quantity, *pack.ml));
  }
  if (packs) {
    const bool wants_doses = dose ? DoseLike(dose->name) : basis.unit && DoseLike(basis.unit->name);
    double amount = 0;
    basis.unit = HeldIn(basis.pack, wants_doses, amount);
    if (!basis.unit) {
      Explain(why, "the quantity is in packs (\"" + quantity_unit.unit +
                       "\") and what one holds is not known");
      return std::nullopt;
    }
    basis.content = amount;
    basis.note = "the quantity is read in packs of " + Number(amount) + " " +
                 std::string(basis.unit->name);
    return basis;
  }
  if (!ok) {
    Explain(why, "unit \"" + quantity_unit.unit + "\" is not known");
    return std::nullopt;
  }
  return basis;
}

// What one dosage unit is in the basis unit, or nullopt with the reason.
std::optional<double> DoseFactor(const std::optional<DoseUnit>& dose, const Basis& basis,
                                 const QuantityUnit& quantity_unit, std::string* why) {
  const double dose_factor = dose ? dose->factor : 1;
  const double basis_factor = basis.unit ? basis.unit->factor : 1;
  const bool strength = quantity_unit.mg_per_unit && *quantity_unit.mg_per_unit > 0;
  if (dose && dose->name == "mg" && (!basis.unit || basis.unit->name != "mg")) {
    if (!strength) {
      Explain(why, "the dosage is in mg and the strength per unit is not known");
      return std::nullopt;
    }
    return dose_factor / *quantity_unit.mg_per_unit / basis_factor;
  }
  if (dose && dose->name == "application" && (!basis.unit || basis.unit->name != "application")) {
    // "apply twice daily": how much one application uses is never written.
    Explain(why, "the amount of one application is not known");
    return std::nullopt;
  }
  if (!dose || !basis.unit || SameDoseUnit(dose->name, basis.unit->name)) {
    return dose_factor / basis_factor;
  }
  if (dose->name == "drop" && basis.unit->name == "ml") {
    return dose_factor / kDropsPerMl / basis_factor;  // common practice: 20 drops a ml
  }
  if (dose->name == "unit" && basis.unit->name == "ml") {
    if (basis.pack.units_per_ml && *basis.pack.units_per_ml > 0) {
      return dose_factor / *basis.pack.units_per_ml / basis_factor;
    }
    Explain(why, "the dosage is in units and the units per ml are not known");
    return std::nullopt;
  }
  Explain(why, "the dosage is in " + std::string(dose->name) + " and the quantity in " +
                   std::string(basis.unit->name));
  return std::nullopt;
}

// The dosage's daily amount in the quantity's basis: factor and basis, or nullopt.
struct Related {
  Basis basis;
  double factor = 1;
};

std::optional<Related> Relate(const DosageReading& dosage, std::optional<double> quantity,
                              const QuantityUnit& quantity_unit, std::string* why) {
  if (!dosage.units_per_day || !(*dosage.units_per_day > 0) ||
      !std::isfinite(*dosage.units_per_day)) {
    return std::nullopt;
  }
  if (dosage.unit == kAdministrationUnit) {
    if (!AdministrationsAsUnits(dosage, quantity_unit, why)) return std::nullopt;
    return Related{Basis{}, 1};
  }
  bool dose_ok = true;
  const auto dose = Canonical(dosage.unit, dose_ok);
  if (!dose_ok) {
    Explain(why, "unit \"" + dosage.unit + "\" is not known");
    return std::nullopt;
  }
  auto basis = BasisOf(quantity, quantity_unit, dose, why);
  if (!basis) return std::nullopt;
  const auto factor = DoseFactor(dose, *basis, quantity_unit, why);
  if (!factor || !(*factor > 0) || !std::isfinite(*factor)) return std::nullopt;
  return Related{std::move(*basis), *factor};
}

// The days `quantity` lasts through `stages` in order; the last stage continues while
// quantity remains, and a stage of 0 a day ("then stop") ends the supply.
double StagedDays(const std::vector<DoseStage>& stages, double quantity) {
  double left = quantity;
  double day = 0;
  for (size_t k = 0; k < stages.size(); ++k) {
    const DoseStage& stage = stages[k];
    if (!(stage.units_per_day > 0)) return std::max(day, 1.0);
    const bool last = k + 1 == stages.size() || !stage.days;
    const double need = last ? left : stage.units_per_day * *stage.days;
    if (last || left <= need * (1 + 1e-9)) {
      return day + std::ceil(left / stage.units_per_day - 1e-9);
    }
    left -= need;
    day += *stage.days;
  }
  return std::max(day, 1.0);
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
  const auto related = Relate(dosage, std::nullopt, quantity_unit, why);
  if (!related) return std::nullopt;
  return *dosage.units_per_day * related->factor / related->basis.content;
}

Supply ComputeSupply(double quantity, std::optional<int> record_days_supply,
                     const DosageReading& dosage, std::optional<int> product_default_days,
                     const SupplyOptions& options, const QuantityUnit& quantity_unit) {
  Supply supply;
  const bool has_quantity = quantity > 0 && std::isfinite(quantity);
  auto related = Relate(dosage, has_quantity ? std::optional(quantity) : std::nullopt,
                        quantity_unit, &supply.note);
  // Extreme factors can overflow: such a dosage relates to nothing.
  if (related && (!std::isfinite(*dosage.units_per_day * related->factor) ||
                  !std::isfinite(quantity * related->basis.content))) {
    related.reset();
    supply.note = "the amounts are too large to relate";
  }
  if (related) {
    if (dosage.stages.empty()) {
      supply.units_per_day = *dosage.units_per_day * related->factor;
    } else {
      for (const DoseStage& stage : dosage.stages) {
        supply.stages.push_back(DoseStage{stage.units_per_day * related->factor, stage.days});
      }
    }
    if (has_quantity) supply.units_dispensed = quantity * related->basis.content;
    supply.note = related->basis.note;
  }
  const int max_days = std::max(1, options.max_supply_days);
  double days = 0;
  if (record_days_supply && *record_days_supply > 0) {
    supply.rule = SupplyRule::kRecordDaysSupply;
    days = *record_days_supply;
  } else if (related && supply.units_dispensed) {
    supply.rule = SupplyRule::kDosageText;
    // A small tolerance so that 450 / 15 is 30 days even after rounding in the divisions.
    days = supply.stages.empty()
               ? std::ceil(*supply.units_dispensed / *supply.units_per_day - 1e-9)
               : StagedDays(supply.stages, *supply.units_dispensed);
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

std::optional<double> UnitsPerDayOnDay(const Supply& supply, int day) {
  if (day < 0) return std::nullopt;
  if (!supply.stages.empty()) return UnitsPerDayOnDay(supply.stages, day);
  return supply.units_per_day;
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
