#include "medload/cohort/groups.h"

#include <cctype>

namespace medload {

std::optional<GroupBy> ParseGroupBy(std::string_view text) {
  if (text == "practice") return GroupBy::kPractice;
  if (text == "network") return GroupBy::kNetwork;
  if (text == "age-band") return GroupBy::kAgeBand;
  if (text == "sex") return GroupBy::kSex;
  if (text == "none") return GroupBy::kNone;
  return std::nullopt;
}

std::string_view GroupByName(GroupBy group_by) {
  switch (group_by) {
    case GroupBy::kPractice: return "practice";
    case GroupBy::kNetwork: return "network";
    case GroupBy::kAgeBand: return "age-band";
    case GroupBy::kSex: return "sex";
    case GroupBy::kNone: return "none";
  }
  return "practice";
}

std::string AgeBandGroup(std::optional<int> age) {
  if (!age || *age < 0) return std::string(kUnknownGroup);
  if (*age < 18) return "0-17";
  if (*age < 50) return "18-49";
  if (*age < 65) return "50-64";
  if (*age < 75) return "65-74";
  if (*age < 85) return "75-84";
  return "85+";
}

std::string SexGroup(std::string_view sex) {
  std::string lower;
  for (const char c : sex) lower += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  if (lower == "female" || lower == "male" || lower == "other") return lower;
  return std::string(kUnknownGroup);
}

std::string GroupOf(GroupBy group_by, const GroupFacts& facts,
                    const std::map<std::string, std::string>& networks) {
  switch (group_by) {
    case GroupBy::kPractice:
      return facts.practice.empty() ? std::string(kUnknownGroup) : facts.practice;
    case GroupBy::kNetwork: {
      const auto found = networks.find(facts.practice);
      if (found == networks.end() || found->second.empty()) return std::string(kUnknownGroup);
      return found->second;
    }
    case GroupBy::kAgeBand: return AgeBandGroup(facts.age);
    case GroupBy::kSex: return SexGroup(facts.sex);
    case GroupBy::kNone: return std::string(kAllGroup);
  }
  return std::string(kAllGroup);
}

}  // namespace medload
