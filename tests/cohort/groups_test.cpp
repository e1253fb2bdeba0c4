#include "medload/cohort/groups.h"

#include <doctest/doctest.h>

#include <vector>

namespace medload {
namespace {

TEST_SUITE("cohort/groups") {

TEST_CASE("age bands have their documented edges") {
  const std::vector<std::pair<int, const char*>> cases = {
      {0, "0-17"},   {17, "0-17"},  {18, "18-49"}, {49, "18-49"}, {50, "50-64"},
      {64, "50-64"}, {65, "65-74"}, {74, "65-74"}, {75, "75-84"}, {84, "75-84"},
      {85, "85+"},   {104, "85+"}};
  for (const auto& [age, band] : cases) {
    const auto age_years = age;  // clang 14 cannot capture a structured binding
    CAPTURE(age_years);
    CHECK(AgeBandGroup(age) == band);
  }
  CHECK(AgeBandGroup(std::nullopt) == "unknown");
}

TEST_CASE("sex groups keep female, male and other and call anything else unknown") {
  CHECK(SexGroup("female") == "female");
  CHECK(SexGroup("Male") == "male");
  CHECK(SexGroup("other") == "other");
  CHECK(SexGroup("") == "unknown");
  CHECK(SexGroup("x") == "unknown");
}

TEST_CASE("a patient's group follows --by") {
  const std::map<std::string, std::string> networks = {{"A01", "North"}, {"B02", ""}};
  const GroupFacts facts{"A01", 70, "female"};
  CHECK(GroupOf(GroupBy::kPractice, facts, networks) == "A01");
  CHECK(GroupOf(GroupBy::kNetwork, facts, networks) == "North");
  CHECK(GroupOf(GroupBy::kAgeBand, facts, networks) == "65-74");
  CHECK(GroupOf(GroupBy::kSex, facts, networks) == "female");
  CHECK(GroupOf(GroupBy::kNone, facts, networks) == "all");
}

TEST_CASE("an unknown practice or network is grouped as unknown") {
  const std::map<std::string, std::string> networks = {{"B02", ""}};
  CHECK(GroupOf(GroupBy::kPractice, GroupFacts{"", 40, ""}, networks) == "unknown");
  CHECK(GroupOf(GroupBy::kNetwork, GroupFacts{"B02", 40, ""}, networks) == "unknown");
  CHECK(GroupOf(GroupBy::kNetwork, GroupFacts{"Z99", 40, ""}, networks) == "unknown");
}

TEST_CASE("grouping names parse and print the same") {
  for (const char* name : {"practice", "network", "age-band", "sex", "none"}) {
    CAPTURE(name);
    auto group_by = ParseGroupBy(name);
    REQUIRE(group_by.has_value());
    CHECK(GroupByName(*group_by) == name);
  }
  CHECK_FALSE(ParseGroupBy("age").has_value());
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
