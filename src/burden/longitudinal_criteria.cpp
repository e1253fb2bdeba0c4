#include "burden/longitudinal_criteria.h"

#include <algorithm>
#include <charconv>

#include "medload/core/text.h"
#include "medload/format/output.h"

namespace medload {
namespace {

Status Bad(std::string_view text, std::string_view why) {
  return Status::Usage("criterion \"" + std::string(text) + "\" " + std::string(why));
}

// "falls=3", "falls>=3", "tsdd=1095", "tsdd>=1095.5".
Result<Criterion> ParseAtLeast(std::string_view text, std::string_view name, CriterionKind kind) {
  std::string_view number = text.substr(name.size());
  if (number.substr(0, 2) == ">=") number.remove_prefix(2);
  else if (!number.empty() && number[0] == '=') number.remove_prefix(1);
  else return Bad(text, "has an unknown comparison; use " + std::string(name) + "=N");
  const std::optional<double> value = ParseDecimal(number);
  if (!value || !(*value >= 0)) return Bad(text, "has a threshold that is not a number >= 0");
  // Past these no patient can qualify (a falls count is of distinct medicines; ten years of
  // TSDDs from ten anticholinergics at ten times their minimum dose is 365,250), so a larger
  // threshold (inf, 1e300) is a typing slip, not a wish for an empty list.
  const double most = kind == CriterionKind::kFalls ? 1000 : 1000000;
  if (!(*value <= most)) {
    return Bad(text, "has a threshold above " + FormatNumber(most, 0) + ", which no patient can reach");
  }
  if (kind == CriterionKind::kFalls && *value != static_cast<double>(static_cast<long>(*value))) {
    return Bad(text, "needs a whole number");
  }
  Criterion criterion;
  criterion.kind = kind;
  criterion.threshold = *value;
  return criterion;
}

// "pdc<0.8" or "pdc<0.8:CLASS|CLASS" (the comparison already checked and removed).
Result<Criterion> ParsePdc(std::string_view text, std::string_view rest) {
  const size_t colon = rest.find(':');
  const std::optional<double> value = ParseDecimal(rest.substr(0, colon));
  if (!value || !(*value > 0) || *value > 1) {
    return Bad(text, "needs a proportion of days covered above 0 and at most 1 (pdc<0.8)");
  }
  Criterion criterion;
  criterion.kind = CriterionKind::kPdcBelow;
  criterion.threshold = *value;
  if (colon == std::string_view::npos) return criterion;
  std::string_view classes = rest.substr(colon + 1);
  while (true) {
    const size_t bar = classes.find('|');
    const std::string_view name = classes.substr(0, bar);
    if (!IsLowerHyphenated(name)) {
      return Bad(text, "names a class \"" + std::string(name) + "\" that is not lower-case-hyphenated");
    }
    criterion.classes.emplace_back(name);
    if (bar == std::string_view::npos) break;
    classes.remove_prefix(bar + 1);
  }
  std::sort(criterion.classes.begin(), criterion.classes.end());
  criterion.classes.erase(std::unique(criterion.classes.begin(), criterion.classes.end()), criterion.classes.end());
  return criterion;
}

}  // namespace

std::string LongitudinalKey(const Criterion& criterion) {
  switch (criterion.kind) {
    case CriterionKind::kFalls: return "falls>=" + FormatNumber(criterion.threshold, 0);
    case CriterionKind::kTsdd: return "tsdd>=" + FormatNumber(criterion.threshold, 3);
    case CriterionKind::kPdcBelow:
      return "pdc<" + FormatNumber(criterion.threshold, 3) +
             (criterion.classes.empty() ? "" : ":" + Join(criterion.classes, "|"));
    default: return "";
  }
}

bool LongitudinalMet(const Criterion& criterion, const LongitudinalMeasures& measures) {
  switch (criterion.kind) {
    case CriterionKind::kFalls: return measures.falls >= criterion.threshold;
    case CriterionKind::kTsdd: return measures.tsdd >= criterion.threshold - 1e-9;
    case CriterionKind::kPdcBelow:
      if (criterion.classes.empty()) {
        return std::any_of(measures.adherence.begin(), measures.adherence.end(),
                           [&](const MedicineAdherence& a) { return a.figure.pdc < criterion.threshold - 1e-12; });
      }
      return std::any_of(measures.adherence_groups.begin(), measures.adherence_groups.end(),
                         [&](const GroupAdherence& g) {
                           return g.classes == criterion.classes && g.figure.pdc < criterion.threshold - 1e-12;
                         });
    default: return false;
  }
}

std::optional<Result<Criterion>> ParseLongitudinalCriterion(std::string_view text) {
  // The measure's name alone or before a comparison ("falls-risk-pair" may be a rule id).
  const auto names = [&](std::string_view name) {
    return text.substr(0, name.size()) == name &&
           (text.size() == name.size() || std::string_view("<>=").find(text[name.size()]) != std::string_view::npos);
  };
  if (names("falls")) return ParseAtLeast(text, "falls", CriterionKind::kFalls);
  if (names("tsdd")) return ParseAtLeast(text, "tsdd", CriterionKind::kTsdd);
  if (!names("pdc")) return std::nullopt;
  if (text.substr(3, 1) != "<") {
    return Result<Criterion>(Bad(text, "selects adherence below a threshold: write pdc<X"));
  }
  return ParsePdc(text, text.substr(4));
}

Status CheckPdcClassesExist(const std::vector<Criterion>& criteria, const BurdenTables& tables) {
  for (const Criterion& criterion : criteria) {
    for (const std::string& name : criterion.classes) {
      const bool known = std::any_of(tables.classes.begin(), tables.classes.end(), [&](const auto& entry) {
        return std::find(entry.second.begin(), entry.second.end(), name) != entry.second.end();
      });
      if (!known) {
        return Status::Input("criterion \"" + criterion.Key() + "\": no ingredient in ingredients.csv carries the class \"" +
                             name + "\"");
      }
    }
  }
  return Status::Ok();
}

Result<Criterion> ParseBelowCriterion(std::string_view text) {
  if (text.substr(0, 4) == "pdc=") return ParsePdc(text, text.substr(4));
  if (text.substr(0, 4) == "pdc<") return ParsePdc(text, text.substr(4));
  return Bad(text, "cannot be selected below a threshold; only pdc can: pdc=X or pdc=X:CLASS|CLASS");
}

void AddPdcGroups(const std::vector<Criterion>& criteria, MeasureOptions& options) {
  for (const Criterion& criterion : criteria) {
    if (criterion.kind != CriterionKind::kPdcBelow || criterion.classes.empty()) continue;
    if (std::find(options.pdc_groups.begin(), options.pdc_groups.end(), criterion.classes) == options.pdc_groups.end()) {
      options.pdc_groups.push_back(criterion.classes);
    }
  }
}

}  // namespace medload
