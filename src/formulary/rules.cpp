// rules.json: read with contains()/at() and type checks so that no nlohmann exception
// escapes; every fault names its JSON pointer.
#include <nlohmann/json.hpp>

#include <algorithm>
#include <set>
#include <string>
#include <vector>

#include "medload/formulary/route_policy.h"
#include "medload/formulary/rules.h"

namespace medload {
namespace {

using nlohmann::json;

class RuleReader {
 public:
  RuleReader(std::string_view file, std::vector<std::string>& faults) : file_(file), faults_(faults) {}

  void Fault(const std::string& pointer, const std::string& fault) {
    faults_.push_back(std::string(file_) + ": " + pointer + ": " + fault);
    ok_ = false;
  }
  bool ok() const { return ok_; }
  void Reset() { ok_ = true; }

  // A non-empty string at `key`.
  std::string Text(const json& object, const std::string& pointer, const char* key) {
    if (!object.contains(key) || !object.at(key).is_string() || object.at(key).get<std::string>().empty()) {
      Fault(pointer + "/" + key, "missing or not a non-empty string");
      return {};
    }
    return object.at(key).get<std::string>();
  }

  // An optional whole number >= minimum (and <= maximum) at `key`.
  std::optional<int> Whole(const json& object, const std::string& pointer, const char* key, int minimum,
                           int maximum) {
    if (!object.contains(key)) return std::nullopt;
    const json& value = object.at(key);
    if (!value.is_number_integer() || value.get<long long>() < minimum || value.get<long long>() > maximum) {
      Fault(pointer + "/" + key, "not a whole number from " + std::to_string(minimum) + " to " +
                                      std::to_string(maximum));
      return std::nullopt;
    }
    return static_cast<int>(value.get<long long>());
  }

  std::vector<std::string> Strings(const json& object, const std::string& pointer, const char* key) {
    std::vector<std::string> out;
    if (!object.contains(key)) return out;
    const json& value = object.at(key);
    if (!value.is_array()) {
      Fault(pointer + "/" + key, "not an array of strings");
      return out;
    }
    for (size_t i = 0; i < value.size(); ++i) {
      if (!value.at(i).is_string() || value.at(i).get<std::string>().empty()) {
        Fault(pointer + "/" + key + "/" + std::to_string(i), "not a non-empty string");
        continue;
      }
      out.push_back(value.at(i).get<std::string>());
    }
    return out;
  }

  void UnknownKeys(const json& object, const std::string& pointer, const std::set<std::string>& known) {
    for (const auto& [key, value] : object.items()) {
      if (known.count(key) == 0) Fault(pointer + "/" + key, "unknown key");
    }
  }

  RuleRequirement Requirement(const json& value, const std::string& pointer) {
    RuleRequirement requirement;
    if (!value.is_object()) {
      Fault(pointer, "not an object");
      return requirement;
    }
    UnknownKeys(value, pointer, {"classes", "ingredients", "scale_score_at_least", "scale", "at_least", "count"});
    requirement.classes = Strings(value, pointer, "classes");
    requirement.ingredients = Strings(value, pointer, "ingredients");
    requirement.scale_score_at_least = Whole(value, pointer, "scale_score_at_least", 1, 3);
    if (value.contains("scale")) requirement.scale = Text(value, pointer, "scale");
    requirement.at_least = Whole(value, pointer, "at_least", 1, 1000).value_or(1);
    if (value.contains("count")) {
      const std::string count = Text(value, pointer, "count");
      if (count == "medicines") {
        requirement.count = RuleCount::kMedicines;
      } else if (!count.empty() && count != "ingredients") {
        Fault(pointer + "/count", "\"" + count + "\" is not \"ingredients\" or \"medicines\"");
      }
    }
    if (requirement.classes.empty() && requirement.ingredients.empty() && !requirement.scale_score_at_least) {
      Fault(pointer, "needs classes, ingredients or scale_score_at_least");
    }
    return requirement;
  }

  void Measures(const json& value, const std::string& pointer, RuleMeasures& measures) {
    if (!value.is_object()) {
      Fault(pointer, "not an object");
      return;
    }
    UnknownKeys(value, pointer, {"items", "acb", "dbi"});
    measures.items = Whole(value, pointer, "items", 0, 1000);
    measures.acb = Whole(value, pointer, "acb", 0, 1000);
    if (value.contains("dbi")) {
      if (!value.at("dbi").is_number() || value.at("dbi").get<double>() < 0) {
        Fault(pointer + "/dbi", "not a number >= 0");
      } else {
        measures.dbi = value.at("dbi").get<double>();
      }
    }
  }

  // The list of requirements at `key`: required and non-empty for "require".
  std::vector<RuleRequirement> Requirements(const json& rule, const std::string& pointer, const char* key,
                                            bool required) {
    std::vector<RuleRequirement> requirements;
    if (!rule.contains(key) && !required) return requirements;
    if (!rule.contains(key) || !rule.at(key).is_array() || (required && rule.at(key).empty())) {
      Fault(pointer + "/" + key, required ? "missing or not a non-empty array" : "not an array");
      return requirements;
    }
    const json& list = rule.at(key);
    for (size_t i = 0; i < list.size(); ++i) {
      requirements.push_back(Requirement(list.at(i), pointer + "/" + key + "/" + std::to_string(i)));
    }
    return requirements;
  }

  std::vector<Route> Routes(const json& rule, const std::string& pointer) {
    const std::vector<std::string> names = Strings(rule, pointer, "routes");
    if (rule.contains("routes") && rule.at("routes").is_array() && rule.at("routes").empty()) {
      Fault(pointer + "/routes", "empty: leave the key out for the systemic routes");
    }
    std::vector<Route> routes;
    for (size_t i = 0; i < names.size(); ++i) {
      auto parsed = ParseRouteList(names[i]);
      if (!parsed.ok() || parsed->size() != 1) {
        Fault(pointer + "/routes/" + std::to_string(i), "\"" + names[i] + "\" is not a route name");
        continue;
      }
      routes.push_back(parsed->front());
    }
    SortRoutes(routes);
    return routes;
  }

  // The citation. Tables written before source_checked marked an unchecked citation
  // "(from memory)": that mark is taken off the citation and the rule read as unchecked;
  // "from memory" anywhere else is a fault, so that no screen shows it.
  std::string Source(const json& rule, const std::string& pointer, bool& unchecked_mark) {
    std::string source = Text(rule, pointer, "source");
    unchecked_mark = false;
    const auto lower = [](std::string text) {
      for (char& c : text) c = (c >= 'A' && c <= 'Z') ? static_cast<char>(c + 32) : c;
      return text;
    };
    static constexpr std::string_view kMark = "(from memory)";
    if (const size_t at = lower(source).find(kMark); at != std::string::npos) {
      const size_t start = at > 0 && source[at - 1] == ' ' ? at - 1 : at;
      source.erase(start, kMark.size() + (at - start));
      unchecked_mark = true;
    }
    if (lower(source).find("from memory") != std::string::npos) {
      Fault(pointer + "/source", "cites \"from memory\": give the citation and \"source_checked\": false");
    }
    if (rule.contains("source_checked") && !rule.at("source_checked").is_boolean()) {
      Fault(pointer + "/source_checked", "not true or false");
    }
    return source;
  }

  Rule ReadRule(const json& value, const std::string& pointer) {
    Rule rule;
    if (!value.is_object()) {
      Fault(pointer, "not an object");
      return rule;
    }
    UnknownKeys(value, pointer, {"id", "title", "explanation", "source", "source_checked", "age_min", "measures",
                                 "require", "forbid", "routes"});
    rule.id = Text(value, pointer, "id");
    rule.title = Text(value, pointer, "title");
    rule.explanation = Text(value, pointer, "explanation");
    bool unchecked_mark = false;
    rule.source = Source(value, pointer, unchecked_mark);
    rule.source_checked = value.contains("source_checked") && value.at("source_checked").is_boolean() &&
                          value.at("source_checked").get<bool>();
    if (unchecked_mark && rule.source_checked) {
      Fault(pointer + "/source_checked", "true, but the source says \"(from memory)\"");
    }
    rule.age_min = Whole(value, pointer, "age_min", 0, 150);
    if (value.contains("measures")) Measures(value.at("measures"), pointer + "/measures", rule.measures);
    rule.routes = Routes(value, pointer);
    rule.require = Requirements(value, pointer, "require", true);
    rule.forbid = Requirements(value, pointer, "forbid", false);
    return rule;
  }

 private:
  std::string_view file_;
  std::vector<std::string>& faults_;
  bool ok_ = true;
};

int LineOf(std::string_view text, size_t byte) {
  byte = std::min(byte, text.size());
  return 1 + static_cast<int>(std::count(text.begin(), text.begin() + static_cast<long>(byte), '\n'));
}

}  // namespace

std::string RuleSourceText(const Rule& rule) {
  if (rule.source_checked) return rule.source;
  return rule.source + "; not yet checked against the publication: check against the current edition before "
                       "local use";
}

std::vector<Rule> ParseRules(std::string_view json_text, std::string_view file_name,
                             std::vector<std::string>& faults) {
  std::vector<Rule> rules;
  json document;
  try {
    document = json::parse(json_text.begin(), json_text.end());
  } catch (const json::parse_error& error) {
    const size_t byte = error.byte > 0 ? error.byte - 1 : 0;
    faults.push_back(std::string(file_name) + ":" + std::to_string(LineOf(json_text, byte)) +
                     ": not valid JSON (byte " + std::to_string(error.byte) + ")");
    return rules;
  }
  RuleReader reader(file_name, faults);
  if (!document.is_object() || !document.contains("rules") || !document.at("rules").is_array()) {
    reader.Fault("/rules", "missing or not an array");
    return rules;
  }
  reader.UnknownKeys(document, "", {"rules"});
  const json& array = document.at("rules");
  std::set<std::string> ids;
  for (size_t i = 0; i < array.size(); ++i) {
    reader.Reset();
    const std::string pointer = "/rules/" + std::to_string(i);
    Rule rule = reader.ReadRule(array.at(i), pointer);
    if (!rule.id.empty() && !ids.insert(rule.id).second) {
      reader.Fault(pointer + "/id", "duplicate rule id \"" + rule.id + "\"");
    }
    if (!reader.ok()) continue;
    rule.position = i;
    rules.push_back(std::move(rule));
  }
  return rules;
}

}  // namespace medload
