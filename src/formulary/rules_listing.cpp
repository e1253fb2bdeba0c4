#include "medload/formulary/rules_listing.h"

#include <ostream>

#include "medload/core/caution.h"
#include "medload/core/text.h"
#include "medload/format/output.h"

namespace medload {
namespace {

std::string Requirements(const std::vector<RuleRequirement>& requirements, std::string_view prefix) {
  std::vector<std::string> parts;
  for (const RuleRequirement& requirement : requirements) parts.push_back(std::string(prefix) + RuleRequirementText(requirement));
  return Join(parts, " + ");
}

std::string AgeText(const Rule& rule) { return rule.age_min ? std::to_string(*rule.age_min) : "none"; }

std::vector<std::string> Classes(const std::vector<RuleRequirement>& requirements) {
  std::vector<std::string> classes;
  for (const RuleRequirement& requirement : requirements) {
    for (const std::string& name : requirement.classes) {
      if (std::find(classes.begin(), classes.end(), name) == classes.end()) classes.push_back(name);
    }
  }
  return classes;
}

nlohmann::json RequirementJson(const RuleRequirement& requirement) {
  nlohmann::json json = {{"classes", requirement.classes}, {"ingredients", requirement.ingredients},
                         {"at_least", requirement.at_least},
                         {"count", requirement.count == RuleCount::kIngredients ? "ingredients" : "medicines"}};
  if (requirement.scale_score_at_least) {
    json["scale_score_at_least"] = *requirement.scale_score_at_least;
    json["scale"] = requirement.scale;
  }
  return json;
}

std::vector<std::string> Header() {
  return {"id", "title", "requires", "forbids", "routes", "minimum age", "source"};
}

std::vector<std::vector<std::string>> Rows(const Formulary& formulary) {
  std::vector<std::vector<std::string>> rows;
  for (const Rule& rule : formulary.rules()) {
    rows.push_back({rule.id, rule.title, Requirements(rule.require, ""), Requirements(rule.forbid, "no "),
                    RuleRoutesText(rule, formulary), AgeText(rule), RuleSourceText(rule)});
  }
  return rows;
}

std::string Summary(const Formulary& formulary) {
  return std::to_string(formulary.rules().size()) + " combination rules; systemic routes by default: " +
         RouteListText(formulary.SystemicRoutes(), ", ") +
         ". A rule counts distinct active ingredients unless it says medicines.";
}

}  // namespace

std::string RuleRequirementText(const RuleRequirement& requirement) {
  std::vector<std::string> what = requirement.classes;
  what.insert(what.end(), requirement.ingredients.begin(), requirement.ingredients.end());
  if (requirement.scale_score_at_least) {
    what.push_back("score " + std::to_string(*requirement.scale_score_at_least) + " or more on " + requirement.scale);
  }
  const std::string text = Join(what, " or ");
  if (requirement.count == RuleCount::kMedicines) return std::to_string(requirement.at_least) + " medicines with: " + text;
  if (requirement.at_least == 1) return text;
  return std::to_string(requirement.at_least) + " different: " + text;
}

std::string RuleRoutesText(const Rule& rule, const Formulary& formulary) {
  if (rule.routes.empty()) return "systemic (" + RouteListText(formulary.SystemicRoutes(), ", ") + ")";
  return RouteListText(rule.routes, ", ");
}

nlohmann::json RulesListingJson(const Formulary& formulary) {
  nlohmann::json rules = nlohmann::json::array();
  for (const Rule& rule : formulary.rules()) {
    nlohmann::json require = nlohmann::json::array(), forbid = nlohmann::json::array();
    for (const RuleRequirement& requirement : rule.require) require.push_back(RequirementJson(requirement));
    for (const RuleRequirement& requirement : rule.forbid) forbid.push_back(RequirementJson(requirement));
    std::vector<std::string> routes;
    for (const Route route : rule.routes.empty() ? formulary.SystemicRoutes() : rule.routes) {
      routes.emplace_back(RouteName(route));
    }
    rules.push_back({{"id", rule.id}, {"title", rule.title}, {"require", require}, {"forbid", forbid},
                     {"classes_required", Classes(rule.require)}, {"classes_forbidden", Classes(rule.forbid)},
                     {"routes", routes}, {"routes_default", rule.routes.empty()},
                     {"age_min", rule.age_min ? nlohmann::json(*rule.age_min) : nlohmann::json(nullptr)},
                     {"source", rule.source}, {"source_checked", rule.source_checked},
                     {"source_text", RuleSourceText(rule)}});
  }
  std::vector<std::string> systemic;
  for (const Route route : formulary.SystemicRoutes()) systemic.emplace_back(RouteName(route));
  return {{"formulary_checksum", formulary.checksum()}, {"systemic_routes", systemic}, {"rules", rules},
          {"caution", std::string(kCaution)}};
}

void WriteRulesListingText(std::ostream& out, const Formulary& formulary) {
  out << Summary(formulary) << "\n";
  for (const Rule& rule : formulary.rules()) {
    out << "\n" << rule.id << ": " << rule.title << "\n  requires: " << Requirements(rule.require, "") << "\n";
    if (!rule.forbid.empty()) out << "  forbids: " << Requirements(rule.forbid, "no ") << "\n";
    out << "  routes: " << RuleRoutesText(rule, formulary) << "\n  minimum age: " << AgeText(rule)
        << "\n  source: " << RuleSourceText(rule) << "\n";
  }
  WriteTextCaution(out);
}

void WriteRulesListingCsv(std::ostream& out, const Formulary& formulary) {
  WriteCsvCaution(out);
  WriteCsvComment(out, Summary(formulary));
  out << CsvRow(Header());
  for (const auto& row : Rows(formulary)) out << CsvRow(row);
}

void WriteRulesListingHtml(std::ostream& out, const Formulary& formulary) {
  WriteHtmlStart(out, "Combination rules");
  out << "<h1>Combination rules</h1>\n<p>" << EscapeHtml(Summary(formulary)) << "</p>\n";
  WriteHtmlTable(out, Header(), Rows(formulary));
  WriteHtmlEnd(out);
}

}  // namespace medload
