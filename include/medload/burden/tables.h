// The facts about ingredients that the measures need, flattened from the formulary for
// one run: classes, scores on every scale, Drug Burden Index minimum doses, and the
// combination rules. A plain value so that tests can build one by hand.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <unordered_map>
#include <vector>

#include "medload/formulary/rules.h"

namespace medload {

struct DbiEntry {
  double min_daily_dose_mg = 0;  // delta in Hilmer et al. 2007; > 0
  std::string effect;            // "anticholinergic", "sedative" or "both"
};

struct BurdenTables {
  std::string scale = "acb";  // the scale that acb(D) sums
  // Canonical ingredient name -> classes.
  std::unordered_map<std::string, std::vector<std::string>> classes;
  // Scale name -> canonical ingredient name -> score (absent = 0).
  std::map<std::string, std::unordered_map<std::string, int>> scales;
  std::unordered_map<std::string, DbiEntry> dbi;
  std::vector<Rule> rules;
  // Longitudinal measures (docs/measures.md): canonical ingredient -> minimum effective
  // daily dose in mg (anticholinergic/tsdd.csv), and -> falls-risk categories, sorted
  // (falls_risk.csv, classes expanded to their ingredients).
  std::unordered_map<std::string, double> tsdd_doses;
  std::unordered_map<std::string, std::vector<std::string>> falls_categories;

  // The score of `ingredient` on `scale_name` (0 when absent or the scale is unknown).
  int Score(const std::string& ingredient, const std::string& scale_name) const;
  int Score(const std::string& ingredient) const { return Score(ingredient, scale); }
  bool HasClass(const std::string& ingredient, const std::string& class_name) const;
  const DbiEntry* Dbi(const std::string& ingredient) const;
  const Rule* FindRule(const std::string& id) const;
};

class Formulary;

// Flattens a loaded formulary for a run that scores on `scale`. Rules are copied, with
// their ingredient names already canonical. REQUIRES: formulary.HasScale(scale) was
// checked by the caller (an unknown scale scores every ingredient 0).
BurdenTables TablesFromFormulary(const Formulary& formulary, const std::string& scale);

}  // namespace medload
