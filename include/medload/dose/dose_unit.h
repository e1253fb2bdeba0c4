// Dose units as prescribers, FHIR and dispensing systems spell them ("tabs", "mL",
// "5ml spoonful", "micrograms") reduced to one canonical name and a factor. It knows
// nothing about products or strengths: it never turns tablets into mg or ml into mg.
#pragma once

#include <optional>
#include <string_view>

namespace medload {

// One amount in the spelled unit equals `factor` amounts of the canonical unit `name`.
// Canonical names: tablet, capsule, ml, puff, dose, drop, sachet, patch, application,
// suppository, pessary, lozenge, pastille, spray, unit, mg, ampoule, vial, enema.
struct DoseUnit {
  std::string_view name;  // points to static storage: valid for the whole program
  double factor = 1;      // "5ml spoonful" -> ml x 5; "g" -> mg x 1000; "mcg" -> mg x 0.001
};

// The canonical unit of a unit word or short phrase: ASCII case-insensitive, singular
// or plural, with or without a trailing "(s)", UCUM curly-brace annotations ("{tbl}")
// and a leading "N ml" before a spoon ("5ml spoonful", "2.5 ml spoon").
// Returns nullopt when the text is not a unit this table knows (including empty text).
std::optional<DoseUnit> ReadDoseUnit(std::string_view text);

// The unit of an amount a day that counts administrations (a frequency without a dose),
// not dose units. ReadDoseUnit does not read it: only supply.h converts it.
inline constexpr std::string_view kAdministrationUnit = "administration";

// True for canonical units that are one whole dose unit each, given one at a time
// (tablet, capsule, patch, suppository, pessary, sachet, lozenge, pastille, enema):
// "take twice a day" without a dose means one of them each time. Common practice.
bool IsSingleUnitForm(std::string_view canonical);

// True when amounts in the two canonical units can be divided one by the other: equal
// names, or the pairs treated as one dose unit in practice (tablet/capsule, puff/dose,
// spray/dose). Common practice: a prescriber's "tablet" for a capsule product means one
// dose unit, and one spray of a metered nasal or oromucosal spray is one of its doses.
bool SameDoseUnit(std::string_view canonical_a, std::string_view canonical_b);

}  // namespace medload
