// The JSON form of a ResolvedProduct. Read with contains()/at() and type checks so that
// a damaged cache entry is a Status, never an exception.
#include <nlohmann/json.hpp>

#include "medload/formulary/resolver.h"

namespace medload {
namespace {

using nlohmann::json;

json Optional(const std::optional<double>& value) { return value ? json(*value) : json(nullptr); }

std::optional<MatchKind> MatchKindFromName(std::string_view name) {
  for (const MatchKind kind : {MatchKind::kUnmatched, MatchKind::kCode, MatchKind::kProduct, MatchKind::kIngredient,
                               MatchKind::kNonMedicine, MatchKind::kApproximate, MatchKind::kPartial}) {
    if (MatchKindName(kind) == name) return kind;
  }
  return std::nullopt;
}

Status Bad(const std::string& pointer, const std::string& fault) {
  return Status::Input("resolution JSON: " + pointer + ": " + fault);
}

// Reads an optional number (null or absent = empty) at `key`.
bool ReadOptional(const json& object, const char* key, std::optional<double>& out) {
  if (!object.contains(key) || object.at(key).is_null()) return true;
  if (!object.at(key).is_number()) return false;
  out = object.at(key).get<double>();
  return true;
}

bool ReadString(const json& object, const char* key, std::string& out) {
  if (!object.contains(key)) return true;
  if (!object.at(key).is_string()) return false;
  out = object.at(key).get<std::string>();
  return true;
}

// Reads "unknown" (an array of strings) and "spellings" (objects with "written" and
// "read_as"); absent means none. The JSON pointer of the first bad element, or "".
std::string ReadFlags(const json& value, ResolvedProduct& product) {
  if (value.contains("unknown")) {
    const json& unknown = value.at("unknown");
    if (!unknown.is_array()) return "/unknown";
    for (size_t i = 0; i < unknown.size(); ++i) {
      if (!unknown.at(i).is_string()) return "/unknown/" + std::to_string(i);
      product.unknown.push_back(unknown.at(i).get<std::string>());
    }
  }
  if (!value.contains("spellings")) return "";
  const json& spellings = value.at("spellings");
  if (!spellings.is_array()) return "/spellings";
  for (size_t i = 0; i < spellings.size(); ++i) {
    SpellingReading reading;
    const json& item = spellings.at(i);
    if (!item.is_object() || !ReadString(item, "written", reading.written) || !ReadString(item, "read_as", reading.read_as) ||
        reading.read_as.empty()) {
      return "/spellings/" + std::to_string(i);
    }
    product.spellings.push_back(std::move(reading));
  }
  return "";
}

}  // namespace

nlohmann::json ResolvedProductToJson(const ResolvedProduct& product) {
  json ingredients = json::array();
  for (const ResolvedIngredient& ingredient : product.ingredients) {
    ingredients.push_back({{"ingredient", ingredient.ingredient},
                           {"mg_per_unit", Optional(ingredient.mg_per_unit)},
                           {"mg_per_day", Optional(ingredient.mg_per_day)}});
  }
  json spellings = json::array();
  for (const SpellingReading& reading : product.spellings) {
    spellings.push_back({{"written", reading.written}, {"read_as", reading.read_as}});
  }
  return json{{"ingredients", std::move(ingredients)},
              {"unknown", product.unknown},
              {"spellings", std::move(spellings)},
              {"form", product.form},
              {"dose_unit", product.dose_unit},
              {"route", std::string(RouteName(product.route))},
              {"non_medicine", product.non_medicine},
              {"match", std::string(MatchKindName(product.match))},
              {"match_detail", product.match_detail},
              {"default_supply_days", product.default_supply_days ? json(*product.default_supply_days) : json(nullptr)}};
}

Result<ResolvedProduct> ResolvedProductFromJson(const nlohmann::json& value) {
  ResolvedProduct product;
  if (!value.is_object()) return Bad("", "not an object");
  if (!value.contains("ingredients") || !value.at("ingredients").is_array()) {
    return Bad("/ingredients", "missing or not an array");
  }
  const json& ingredients = value.at("ingredients");
  for (size_t i = 0; i < ingredients.size(); ++i) {
    const std::string pointer = "/ingredients/" + std::to_string(i);
    const json& item = ingredients.at(i);
    ResolvedIngredient ingredient;
    if (!item.is_object() || !item.contains("ingredient") || !item.at("ingredient").is_string()) {
      return Bad(pointer + "/ingredient", "missing or not a string");
    }
    ingredient.ingredient = item.at("ingredient").get<std::string>();
    if (!ReadOptional(item, "mg_per_unit", ingredient.mg_per_unit)) return Bad(pointer + "/mg_per_unit", "not a number");
    if (!ReadOptional(item, "mg_per_day", ingredient.mg_per_day)) return Bad(pointer + "/mg_per_day", "not a number");
    product.ingredients.push_back(std::move(ingredient));
  }
  if (!ReadString(value, "form", product.form)) return Bad("/form", "not a string");
  if (!ReadString(value, "dose_unit", product.dose_unit)) return Bad("/dose_unit", "not a string");
  if (!ReadString(value, "match_detail", product.match_detail)) return Bad("/match_detail", "not a string");
  std::string route = "unknown";
  std::string match = "unmatched";
  if (!ReadString(value, "route", route) || !RouteFromName(route)) return Bad("/route", "not a route name");
  product.route = *RouteFromName(route);
  if (!ReadString(value, "match", match) || !MatchKindFromName(match)) return Bad("/match", "not a match kind");
  product.match = *MatchKindFromName(match);
  if (value.contains("non_medicine")) {
    if (!value.at("non_medicine").is_boolean()) return Bad("/non_medicine", "not true or false");
    product.non_medicine = value.at("non_medicine").get<bool>();
  }
  if (const std::string pointer = ReadFlags(value, product); !pointer.empty()) {
    return Bad(pointer, pointer.find("spellings") != std::string::npos ? "not an object with written and read_as"
                                                                       : "not a string or an array of strings");
  }
  if (value.contains("default_supply_days") && !value.at("default_supply_days").is_null()) {
    if (!value.at("default_supply_days").is_number_integer()) return Bad("/default_supply_days", "not a whole number");
    product.default_supply_days = value.at("default_supply_days").get<int>();
  }
  return product;
}

std::string SerialiseResolution(const ResolvedProduct& product) {
  // A code or code system that is not UTF-8 reaches match_detail as written: its bad bytes
  // become U+FFFD rather than an exception out of the measures.
  return ResolvedProductToJson(product).dump(-1, ' ', false, json::error_handler_t::replace);
}

Result<ResolvedProduct> ParseResolution(std::string_view text) {
  const json value = json::parse(text.begin(), text.end(), nullptr, false);
  if (value.is_discarded()) return Status::Input("resolution JSON: not valid JSON");
  return ResolvedProductFromJson(value);
}

}  // namespace medload
