// The measures of a patient's history up to a census date, kept beside the burden on it:
// falls-risk medicines active on D (falls), cumulative anticholinergic exposure in total
// standardised daily doses (tsdd) and adherence as the proportion of days covered (pdc).
// Each uses only dispensings on or before D (docs/measures.md). No table of its own.
#pragma once

#include <cstddef>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "medload/burden/measure_options.h"
#include "medload/burden/tables.h"
#include "medload/burden/timeline.h"
#include "medload/core/date.h"

namespace medload {

class Formulary;
struct Burden;

// The measurement period of the PDC: the 365 days ending on D (pharmacy quality measures,
// from memory), and the usual threshold of adherence, 80% or more.
inline constexpr int kPdcPeriodDays = 365;
inline constexpr double kAdherentPdc = 0.8;

// An active ingredient in a falls-risk category on D, on a systemic route.
struct FallsRiskIngredient {
  std::string ingredient;
  std::vector<std::string> categories;  // sorted
  size_t medicine = 0;                  // index into Timeline::medicines
};

// One ingredient's share of the cumulative exposure.
struct TsddContribution {
  std::string ingredient;
  double tsdd = 0;
  int dispensings = 0;                      // dispensings counted (strength known)
  double min_effective_daily_dose_mg = 0;
};

// The proportion of days covered of one medicine, or of a group of classes, on D.
struct PdcFigure {
  double pdc = 0;        // days_covered / days, 0..1
  int dispensings = 0;   // in the period (at least 2)
  int days_covered = 0;  // days from `first` to D covered by the period's supplies
  int days = 0;          // days from `first` to D, both included
  Date first;            // the first dispensing in the period
};

struct MedicineAdherence {
  size_t medicine = 0;  // index into Timeline::medicines
  PdcFigure figure;
};

// The combined PDC of every medicine holding an ingredient of `classes`.
struct GroupAdherence {
  std::vector<std::string> classes;
  std::vector<size_t> medicines;  // indexes into Timeline::medicines with a dispensing in the period
  PdcFigure figure;
};

struct LongitudinalMeasures {
  int falls = 0;                                     // distinct ingredients
  std::vector<FallsRiskIngredient> falls_ingredients;  // by ingredient
  double tsdd = 0;
  std::optional<Date> tsdd_from;  // the first day counted; nullopt: all data (--exposure-years)
  std::vector<TsddContribution> tsdd_contributions;  // by ingredient
  std::vector<std::string> tsdd_incomplete;          // dispensed with no known strength: not counted
  std::vector<MedicineAdherence> adherence;          // medicines with a PDC, by medicine key
  std::vector<GroupAdherence> adherence_groups;      // groups with a PDC, in pdc_groups order
};

// One supply for the PDC: the day dispensed and its days of supply (>= 1).
struct PdcSupply {
  Date dispensed;
  int days = 1;
};

// The PDC on `on` of supplies of one or more medicines (`medicines[m]`: one medicine's
// supplies in dispensing order). Within a medicine, a supply dispensed before the previous
// one ends starts the day after it ends; across medicines a day counts once. Supplies
// dispensed outside the kPdcPeriodDays days ending on `on` are left out. nullopt with
// fewer than two dispensings in the period. Pure.
std::optional<PdcFigure> ProportionOfDaysCovered(std::span<const std::vector<PdcSupply>> medicines, Date on);

// The band of a TSDD as published by Gray et al. 2015: "0", "1-90", "91-365",
// "366-1095", ">1095" (a fraction above a band's upper whole number is in the next band).
std::string_view TsddBand(double tsdd);

// The first day of the `years` years ending on `on` (the same calendar day `years` years
// earlier, plus one day; 29 February counts from 28 February).
Date YearsBefore(Date on, int years);

// Fills burden.longitudinal for burden.on from the timeline, its active medicines and the
// tables. REQUIRES: `burden` was evaluated on `timeline` with the same options.
void AddLongitudinalMeasures(const Timeline& timeline, const BurdenTables& tables,
                             const MeasureOptions& options, Burden& burden);

// Fills tables.tsdd_doses and tables.falls_categories from the formulary.
void AddLongitudinalTables(const Formulary& formulary, BurdenTables& tables);

}  // namespace medload
