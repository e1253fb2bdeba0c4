// How cohort rows are grouped: by practice, care network, age band, sex or not at all,
// with the fixed labels of each (age bands 0-17, 18-49, 50-64, 65-74, 75-84, 85+ and
// "unknown"). It does not decide who is registered; it labels a registered patient.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <string_view>

namespace medload {

// `--by`: what a cohort row is a count of (default practice).
enum class GroupBy { kPractice, kNetwork, kAgeBand, kSex, kNone };

// "practice", "network", "age-band", "sex", "none"; nullopt otherwise.
std::optional<GroupBy> ParseGroupBy(std::string_view text);
std::string_view GroupByName(GroupBy group_by);

// The label of the single group of `--by none`.
inline constexpr std::string_view kAllGroup = "all";
// The label used when a practice, network, age or sex is not known.
inline constexpr std::string_view kUnknownGroup = "unknown";

// "0-17", "18-49", "50-64", "65-74", "75-84", "85+", or "unknown" without an age.
std::string AgeBandGroup(std::optional<int> age);
// "female", "male", "other" as recorded (any case); anything else "unknown".
std::string SexGroup(std::string_view sex);

// What a patient is known by on a census date, for grouping.
struct GroupFacts {
  std::string practice;        // the practice registered at that day (may be empty)
  std::optional<int> age;      // completed years that day
  std::string_view sex;
};

// The group label of a patient. `networks` maps practice code to network (Store::
// Practices); a practice missing from it, or with an empty network, is "unknown".
std::string GroupOf(GroupBy group_by, const GroupFacts& facts,
                    const std::map<std::string, std::string>& networks);

}  // namespace medload
