// Reads what one pack of a product holds from its description as dispensed ("200 dose",
// "120 actuations", "10ml", "3ml cartridge", "100units/ml"), knows the usual doses in a
// device of a form, and tells a quantity counted in packs from one counted in doses. It
// does not resolve products (formulary/resolver.h) and reads no strengths in mg.
#pragma once

#include <cstddef>
#include <optional>
#include <string_view>

namespace medload {

struct PackContent {
  std::optional<double> doses;         // metered doses, sprays or puffs in one pack
  std::optional<double> ml;            // ml in one pack or container ("10ml", "3ml pen")
  std::optional<double> units_per_ml;  // units of activity per ml ("100units/ml", "U-100")
};

// What the description says; empty fields where it says nothing. A number counts only
// when it is not a strength's denominator ("5mg/5ml" holds no 5 ml pack). Pure,
// locale-independent; never fails.
PackContent ReadPackContent(std::string_view description);

// The usual number of doses in one device when the description does not give it, from
// the device named in the description (Ellipta 30; Accuhaler, Genuair, Respimat 60;
// Spiromax, NEXThaler 120) or else the resolved form: a pressurised inhaler 200 (120 when
// it holds two or more ingredients), an inhalation powder 60, a nasal spray 120.
// nullopt for other forms. Values from memory (common pack sizes of UK products).
std::optional<double> UsualDosesPerDevice(std::string_view form, std::string_view description,
                                          size_t ingredient_count);

// What one pack holds for the supply: ReadPackContent(description), with the doses of a
// device that does not state them from UsualDosesPerDevice. Pure.
PackContent SupplyPackContent(std::string_view description, std::string_view form, size_t ingredient_count);

// True when a quantity's unit names a container rather than a dose unit: inhaler, pen,
// cartridge, bottle, pack, device, canister, container, vial, pre-filled pen, pre-filled
// disposable injection, injection (singular or plural, any case). Pure.
bool IsContainerUnit(std::string_view unit);

// True when a quantity given without a unit, of a product whose one container holds
// `content` of its dose unit, is better read as containers: a whole number from 1 to 10
// that is not a whole multiple of `content` (>= 1). "1" of a 200-dose inhaler is one
// inhaler; "5" of a 3 ml pen is five pens; "15" is 15 ml; "3" is 3 ml (one pen). Pure.
bool LooksLikeContainers(double quantity, double content);

}  // namespace medload
