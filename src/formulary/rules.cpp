// rules.json: read with contains()/at() and type checks so that no nlohmann exception
// escapes; every fault names its JSON pointer.
#include <nlohmann/json.hpp>

#include <algorithm>
#include <set>
#include <string>
#include <vector>

#include "medload/formulary/rules.h"

namespace medload {
namespace {

using nlohmann::json;

// The characters a criterion accepts in a rule id (ParseRuleCriterion).
bool IdCharactersOk(std::string_view id) {
  return std::all_of(id.begin(), id.end(), [](char c) {
    return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || (c >= '0' && c <= '9') || c == '-' || c == '_' ||
           c == '.';
  });
}

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
    UnknownKeys(value, pointer, {"classes", "ingredients", "scale_score_at_least", "scale", "at_least"});
    requirement.classes = Strings(value, pointer, "classes");
    requirement.ingredients = Strings(value, pointer, "ingredients");
    requirement.scale_score_at_least = Whole(value, pointer, "scale_score_at_least", 1, 3);
    if (value.contains("scale")) requirement.scale = Text(value, pointer, "scale");
    requirement.at_least = Whole(value, pointer, "at_least", 1, 1000).value_or(1);
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

  Rule ReadRule(const json& value, const std::string& pointer) {
    Rule rule;
    if (!value.is_object()) {
      Fault(pointer, "not an object");
      return rule;
    }
    UnknownKeys(value, pointer, {"id", "title", "explanation", "source", "age_min", "measures", "require"});
    rule.id = Text(value, pointer, "id");
    if (!IdCharactersOk(rule.id)) {
      Fault(pointer + "/id", "\"" + rule.id + "\" may hold only letters, digits, '-', '_' and '.' (--rule names it)");
    }
    rule.title = Text(value, pointer, "title");
    rule.explanation = Text(value, pointer, "explanation");
    rule.source = Text(value, pointer, "source");
    rule.age_min = Whole(value, pointer, "age_min", 0, 150);
    if (value.contains("measures")) Measures(value.at("measures"), pointer + "/measures", rule.measures);
    if (!value.contains("require") || !value.at("require").is_array() || value.at("require").empty()) {
      Fault(pointer + "/require", "missing or not a non-empty array");
      return rule;
    }
    const json& require = value.at("require");
    for (size_t i = 0; i < require.size(); ++i) {
      rule.require.push_back(Requirement(require.at(i), pointer + "/require/" + std::to_string(i)));
    }
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
