#include "medload/burden/criteria.h"

#include <doctest/doctest.h>

#include <string>

namespace medload {

TEST_SUITE("burden/criteria") {

TEST_CASE("a criterion's text is read into its kind, threshold and key") {
  const struct {
    std::string text;
    std::string key;
  } cases[] = {
      {"items=10", "items>=10"}, {"items>=10", "items>=10"}, {"acb=3", "acb>=3"},   {"dbi=1.0", "dbi>=1"},
      {"dbi>=0.5", "dbi>=0.5"},  {"dbi=100", "dbi>=100"},    {"items=1000", "items>=1000"},
      {"rule:opioid-and-sedative", "rule:opioid-and-sedative"},
  };
  for (const auto& c : cases) {
    CAPTURE(c.text);
    Result<Criterion> criterion = ParseCriterion(c.text);
    REQUIRE(criterion.ok());
    CHECK(criterion->Key() == c.key);
  }
}

TEST_CASE("a threshold that is not a number, not finite or beyond any patient is refused with what is accepted") {
  const std::string accepted = "; use items=N, acb=N, dbi=X, falls=N, tsdd=N, pdc<X or rule:ID";
  const struct {
    std::string text;
    std::string fault;
  } cases[] = {
      {"dbi>=inf", "has a threshold above 100, which no patient can reach"},
      {"dbi=1e300", "has a threshold above 100, which no patient can reach"},
      {"dbi=100.5", "has a threshold above 100, which no patient can reach"},
      {"items=1e300", "has a threshold above 1000, which no patient can reach"},
      {"acb=1001", "has a threshold above 1000, which no patient can reach"},
      {"dbi=nan", "has a threshold that is not a number >= 0"},
      {"dbi=1e400", "has a threshold that is not a number >= 0"},
      {"items=-1", "has a threshold that is not a number >= 0"},
      {"items=2.5", "needs a whole number"},
      {"items", "has no threshold"},
      {"age>=80", "measures nothing known"},
      {"rule:", "names no rule"},
  };
  for (const auto& c : cases) {
    CAPTURE(c.text);
    Result<Criterion> criterion = ParseCriterion(c.text);
    REQUIRE_FALSE(criterion.ok());
    CHECK(criterion.status().code() == StatusCode::kUsage);
    CHECK(criterion.status().message() == "criterion \"" + c.text + "\" " + c.fault + accepted);
  }
}

TEST_CASE("a falls or tsdd threshold beyond any patient is refused") {
  const struct {
    std::string text;
    std::string fault;
  } cases[] = {
      {"falls>=inf", "has a threshold above 1000, which no patient can reach"},
      {"falls=1001", "has a threshold above 1000, which no patient can reach"},
      {"tsdd=1e300", "has a threshold above 1000000, which no patient can reach"},
      {"tsdd=nan", "has a threshold that is not a number >= 0"},
      {"falls=2.5", "needs a whole number"},
  };
  for (const auto& c : cases) {
    CAPTURE(c.text);
    Result<Criterion> criterion = ParseCriterion(c.text);
    REQUIRE_FALSE(criterion.ok());
    CHECK(criterion.status().code() == StatusCode::kUsage);
    CHECK(criterion.status().message() == "criterion \"" + c.text + "\" " + c.fault);
  }
  CHECK(ParseCriterion("tsdd=1000000").ok());
  CHECK(ParseCriterion("falls=1000").ok());
}

}  // TEST_SUITE

}  // namespace medload
