// `medload formulary rules`: the combination rules of a formulary as a pharmacist reads
// them (id, title, the classes and ingredients required and forbidden, the routes
// counted, the minimum age, the source), in text, CSV, JSON and HTML with the caution.
// Writers take a loaded formulary and a stream; they evaluate nothing.
#pragma once

#include <iosfwd>
#include <string>

#include <nlohmann/json.hpp>

#include "medload/formulary/formulary.h"

namespace medload {

// One requirement in words: "ace-inhibitor or arb", "2 different: nsaid",
// "2 medicines with: paracetamol", "score 3 or more on acb".
std::string RuleRequirementText(const RuleRequirement& requirement);
// The routes a rule counts in words: "systemic (oral, transdermal, ...)" when it keeps
// the formulary's default, else the rule's own list.
std::string RuleRoutesText(const Rule& rule, const Formulary& formulary);

// {"formulary_checksum", "systemic_routes", "rules": [{"id", "title", "require",
// "forbid", "classes_required", "classes_forbidden", "routes", "routes_default",
// "age_min", "source", "source_checked", "source_text"}], "caution"}.
nlohmann::json RulesListingJson(const Formulary& formulary);
void WriteRulesListingText(std::ostream& out, const Formulary& formulary);
void WriteRulesListingCsv(std::ostream& out, const Formulary& formulary);
void WriteRulesListingHtml(std::ostream& out, const Formulary& formulary);

}  // namespace medload
