#include "medload/burden/meds_writer.h"

#include <algorithm>
#include <cctype>
#include <ostream>

#include "medload/core/caution.h"
#include "medload/core/text.h"
#include "medload/format/output.h"

namespace medload {
namespace {

struct Row {
  const ActiveMedicine* active;
  const Medicine* medicine;
  const DispensingUse* latest;
};

std::vector<Row> Rows(const MedsModel& model) {
  std::vector<Row> rows;
  for (const ActiveMedicine& active : model.burden->active) {
    const Medicine& medicine = model.timeline->medicines[active.medicine];
    rows.push_back({&active, &medicine, &medicine.uses[active.latest_use]});
  }
  return rows;
}

std::string DisplayName(const Medicine& medicine) { return Join(medicine.ingredients, " + "); }

std::vector<std::string> ClassesOf(const MedsModel& model, const Medicine& medicine) {
  std::vector<std::string> classes;
  for (const auto& ingredient : medicine.ingredients) {
    auto it = model.tables->classes.find(ingredient);
    if (it == model.tables->classes.end()) continue;
    for (const auto& c : it->second) {
      if (std::find(classes.begin(), classes.end(), c) == classes.end()) classes.push_back(c);
    }
  }
  return classes;
}

std::string DosageRead(const DosageReading& dosage) {
  std::string text(UnderstandingName(dosage.understanding));
  if (dosage.units_per_day) text += ", " + FormatNumber(*dosage.units_per_day, 3) + " per day";
  if (dosage.as_needed) text += ", as needed";
  return text;
}

std::string DosageText(const MedsModel& model, const DispensingUse& use) {
  return RecordText(model.records, use, &DispensingRecord::dosage);
}

// The description as dispensed.
std::string ProductText(const MedsModel& model, const DispensingUse& use) {
  return RecordText(model.records, use, &DispensingRecord::product);
}

// Unmatched products dispensed, on or before the date, recently enough that they could
// still be in use.
std::vector<const UnmatchedProduct*> RecentUnmatched(const MedsModel& model) {
  std::vector<const UnmatchedProduct*> recent;
  const Date first = model.burden->on - (model.options.supply.max_supply_days - 1);
  for (const UnmatchedProduct& product : model.timeline->unmatched) {
    const std::optional<Date> last = product.LastBy(model.burden->on);
    if (last && *last >= first) recent.push_back(&product);
  }
  return recent;
}

std::vector<std::string> RuleMedicines(const MedsModel& model, const FiredRule& fired) {
  std::vector<std::string> names;
  for (size_t index : fired.medicines) names.push_back(DisplayName(model.timeline->medicines[index]));
  return names;
}

}  // namespace

std::vector<std::string> MedsWarnings(const MedsModel& model) {
  std::vector<std::string> warnings;
  if (model.data_note && !model.data_note->empty()) {
    std::string sentence = "Data coverage: " + *model.data_note + ".";
    warnings.push_back(std::move(sentence));
  }
  for (const UnmatchedProduct* product : RecentUnmatched(model)) {
    warnings.push_back("\"" + product->product + "\" (" + std::to_string(product->ItemsBy(model.burden->on)) +
                       " item(s), last " + product->LastBy(model.burden->on)->ToIso() +
                       ") was not recognised by the formulary and is not counted.");
  }
  for (const std::string& ingredient : model.burden->dbi_incomplete) {
    warnings.push_back("The daily dose of " + ingredient +
                       " is not known (no strength), so it adds nothing to the Drug Burden Index.");
  }
  for (const Row& row : Rows(model)) {
    if (row.active->in_tail) {
      warnings.push_back("The supply of " + DisplayName(*row.medicine) + " ran out on " +
                         row.active->supply_end.ToIso() + "; it still counts until " + row.active->until.ToIso() +
                         " (its tail): a refill may be late, or the medicine may have stopped.");
    }
  }
  for (const auto& c : model.burden->dbi_contributions) {
    if (c.as_needed_max) {
      warnings.push_back("The Drug Burden Index dose of " + c.ingredient +
                         " is the as-needed maximum of its instruction, not a dose known to be taken.");
    }
  }
  for (const Row& row : Rows(model)) {
    if (row.latest->supply.rule == SupplyRule::kDefaultDays) {
      warnings.push_back("The days of supply of " + DisplayName(*row.medicine) + " were assumed (" +
                         std::to_string(row.latest->supply.days) +
                         " days): the record gave no days supply and the dosage was not understood.");
    }
  }
  if (model.burden->age_unknown_for_rules) {
    warnings.push_back("The patient's age is not known, so rules with an age limit were not checked.");
  }
  if (!model.registered) warnings.push_back("The patient has no row in the registry.");
  return warnings;
}

nlohmann::json MedsJson(const MedsModel& model) {
  const Burden& burden = *model.burden;
  nlohmann::json medicines = nlohmann::json::array();
  for (const Row& row : Rows(model)) {
    const DispensingUse& use = *row.latest;
    medicines.push_back({{"name", DisplayName(*row.medicine)},
                         {"ingredients", row.medicine->ingredients},
                         {"since", row.active->since.ToIso()},
                         {"until", row.active->until.ToIso()},
                         {"supply_until", row.active->supply_end.ToIso()},
                         {"in_tail", row.active->in_tail},
                         {"acb", row.active->score},
                         {"dbi", row.active->dbi},
                         {"classes", ClassesOf(model, *row.medicine)},
                         {"product", ProductText(model, use)},
                         {"route", RouteName(use.route)},
                         {"last_dispensed", use.dispensed_on.ToIso()},
                         {"quantity", use.quantity},
                         {"supply_days", use.supply.days},
                         {"units_per_day", use.supply.units_per_day ? nlohmann::json(*use.supply.units_per_day)
                                                                    : nlohmann::json(nullptr)},
                         {"supply_rule", SupplyRuleName(use.supply.rule)},
                         {"dosage", DosageText(model, use)},
                         {"dosage_read", DosageRead(use.dosage)},
                         {"as_needed", use.dosage.as_needed}});
  }
  nlohmann::json rules = nlohmann::json::array();
  for (const FiredRule& fired : burden.rules) {
    rules.push_back({{"id", fired.rule->id},
                     {"title", fired.rule->title},
                     {"explanation", fired.rule->explanation},
                     {"source", fired.rule->source},
                     {"medicines", RuleMedicines(model, fired)}});
  }
  nlohmann::json contributions = nlohmann::json::array();
  for (const auto& c : burden.score_contributions) contributions.push_back({{"ingredient", c.ingredient}, {"score", c.score}});
  nlohmann::json dbi = nlohmann::json::array();
  for (const auto& c : burden.dbi_contributions) {
    nlohmann::json sources = nlohmann::json::array();
    for (const DoseSource& source : c.sources) {
      const DispensingUse& use = model.timeline->medicines[source.medicine].uses[source.use];
      sources.push_back({{"product", ProductText(model, use)}, {"dispensed", use.dispensed_on.ToIso()},
                         {"dose_mg_per_day", source.dose_mg_per_day}, {"basis", DoseBasisName(source.basis)},
                         {"as_needed_max", source.as_needed_max}});
    }
    dbi.push_back({{"ingredient", c.ingredient}, {"dose_mg_per_day", c.dose_mg_per_day},
                   {"min_daily_dose_mg", c.min_daily_dose_mg}, {"value", c.value},
                   {"basis", DoseBasisName(c.basis)}, {"supply_assumed", c.supply_assumed},
                   {"as_needed_max", c.as_needed_max}, {"sources", sources}});
  }
  nlohmann::json unmatched = nlohmann::json::array();
  for (const UnmatchedProduct* product : RecentUnmatched(model)) unmatched.push_back(product->product);
  nlohmann::json age = model.age ? nlohmann::json(*model.age) : nlohmann::json(nullptr);
  return {{"patient", model.patient}, {"practice", model.practice}, {"on", burden.on.ToIso()},
          {"age", age}, {"items", burden.items}, {"acb", burden.acb}, {"scale", model.tables->scale},
          {"dbi", burden.dbi}, {"medicines", medicines}, {"rules", rules},
          {"score_contributions", contributions}, {"dbi_contributions", dbi},
          {"dbi_incomplete", burden.dbi_incomplete}, {"unmatched", unmatched},
          {"measure", MeasureName(model.options.measure)}, {"data", std::string(DataStateName(model.data))},
          {"warnings", MedsWarnings(model)},
          {"caution", std::string(kCaution)}};
}

namespace {

std::vector<std::string> Header(const std::string& scale_label) {
  return {"medicine", "since", "until", "last dispensed", "supply", "dosage read", scale_label, "DBI"};
}

// The episode's last counted day, marked when the date falls in the tail.
std::string UntilText(const ActiveMedicine& active) {
  return active.until.ToIso() + (active.in_tail ? " (tail: supply ran out " + active.supply_end.ToIso() + ")" : "");
}

// How one ingredient's DBI dose was reached, products summed where more than one.
std::string DbiWorking(const MedsModel& model, const DbiContribution& c) {
  std::string working;
  for (const DoseSource& source : c.sources) {
    const DispensingUse& use = model.timeline->medicines[source.medicine].uses[source.use];
    if (!working.empty()) working += " + ";
    working += FormatNumber(source.dose_mg_per_day, 2) + " mg/day";
    if (c.sources.size() > 1) working += " (" + ProductText(model, use) + ")";
  }
  if (c.sources.size() > 1) working += " = " + FormatNumber(c.dose_mg_per_day, 2) + " mg/day";
  return working;
}

std::vector<std::vector<std::string>> TableRows(const MedsModel& model) {
  std::vector<std::vector<std::string>> rows;
  for (const Row& row : Rows(model)) {
    const DispensingUse& use = *row.latest;
    rows.push_back({DisplayName(*row.medicine), row.active->since.ToIso(), UntilText(*row.active),
                    use.dispensed_on.ToIso(),
                    std::to_string(use.supply.days) + " d (" + std::string(SupplyRuleName(use.supply.rule)) + ")",
                    DosageRead(use.dosage), std::to_string(row.active->score), FormatNumber(row.active->dbi, 2)});
  }
  return rows;
}

std::string ScaleLabel(const MedsModel& model) {
  std::string label = model.tables->scale;
  for (char& c : label) c = static_cast<char>(std::toupper(static_cast<unsigned char>(c)));
  return label;
}

std::string Totals(const MedsModel& model) {
  const Burden& b = *model.burden;
  return std::to_string(b.items) + " medicine(s); " + ScaleLabel(model) + " " + std::to_string(b.acb) +
         "; DBI " + FormatNumber(b.dbi, 2);
}

}  // namespace

void WriteMedsText(std::ostream& out, const MedsModel& model) {
  const Burden& b = *model.burden;
  out << "Patient " << model.patient << (model.practice.empty() ? "" : " (practice " + model.practice + ")")
      << ", age " << (model.age ? std::to_string(*model.age) : std::string("unknown")) << ", on "
      << b.on.ToIso() << " (" << MeasureName(model.options.measure) << ")\n"
      << Totals(model) << "\n\n";
  WriteTextTable(out, Header(ScaleLabel(model)), TableRows(model));
  if (!b.score_contributions.empty()) {
    out << "\n" << ScaleLabel(model) << " contributions:";
    for (const auto& c : b.score_contributions) out << " " << c.ingredient << " " << c.score << ";";
    out << "\n";
  }
  for (const auto& c : b.dbi_contributions) {
    out << "DBI " << c.ingredient << ": " << DbiWorking(model, c) << ", minimum "
        << FormatNumber(c.min_daily_dose_mg, 2) << " mg -> " << FormatNumber(c.value, 3) << " ("
        << DoseBasisName(c.basis) << ")" << DoseBasisMark(c) << "\n";
  }
  for (const FiredRule& fired : b.rules) {
    out << "\nRule " << fired.rule->id << ": " << fired.rule->title << "\n  medicines: "
        << Join(RuleMedicines(model, fired), ", ") << "\n  " << fired.rule->explanation
        << "\n  source: " << fired.rule->source << "\n";
  }
  const auto warnings = MedsWarnings(model);
  if (!warnings.empty()) out << "\nWarnings:\n";
  for (const auto& w : warnings) out << "- " << w << "\n";
  WriteTextCaution(out);
}

void WriteMedsCsv(std::ostream& out, const MedsModel& model) {
  WriteCsvCaution(out);
  if (model.data_note) WriteCsvComment(out, "note: " + *model.data_note);
  out << CsvRow({"patient", "on", "medicine", "ingredients", "since", "until", "in_tail", "last_dispensed",
                 "product", "supply_days", "supply_rule", "dosage", "dosage_read", "score", "dbi", "classes"});
  for (const Row& row : Rows(model)) {
    const DispensingUse& use = *row.latest;
    out << CsvRow({model.patient, model.burden->on.ToIso(), DisplayName(*row.medicine),
                   Join(row.medicine->ingredients, "|"), row.active->since.ToIso(), row.active->until.ToIso(),
                   row.active->in_tail ? "yes" : "no", use.dispensed_on.ToIso(), ProductText(model, use), std::to_string(use.supply.days),
                   std::string(SupplyRuleName(use.supply.rule)), DosageText(model, use), DosageRead(use.dosage),
                   std::to_string(row.active->score), FormatNumber(row.active->dbi, 4),
                   Join(ClassesOf(model, *row.medicine), "|")});
  }
}

void WriteMedsHtml(std::ostream& out, const MedsModel& model) {
  const Burden& b = *model.burden;
  WriteHtmlStart(out, "Medicines of patient " + model.patient + " on " + b.on.ToIso());
  out << "<p><strong>" << EscapeHtml(Totals(model)) << "</strong></p>\n";
  WriteHtmlTable(out, Header(ScaleLabel(model)), TableRows(model));
  if (!b.dbi_contributions.empty()) out << "<h2>Drug Burden Index</h2>\n<ul>\n";
  for (const auto& c : b.dbi_contributions) {
    out << "<li>" << EscapeHtml(c.ingredient) << ": " << EscapeHtml(DbiWorking(model, c)) << ", minimum "
        << EscapeHtml(FormatNumber(c.min_daily_dose_mg, 2)) << " mg -&gt; " << EscapeHtml(FormatNumber(c.value, 3))
        << " (" << EscapeHtml(DoseBasisName(c.basis)) << ")" << EscapeHtml(DoseBasisMark(c)) << "</li>\n";
  }
  if (!b.dbi_contributions.empty()) out << "</ul>\n";
  if (!b.rules.empty()) out << "<h2>Rules fired</h2>\n<ul>\n";
  for (const FiredRule& fired : b.rules) {
    out << "<li><strong>" << EscapeHtml(fired.rule->title) << "</strong> (" << EscapeHtml(fired.rule->id)
        << "): " << EscapeHtml(Join(RuleMedicines(model, fired), ", ")) << ". "
        << EscapeHtml(fired.rule->explanation) << " <span class=\"note\">Source: "
        << EscapeHtml(fired.rule->source) << "</span></li>\n";
  }
  if (!b.rules.empty()) out << "</ul>\n";
  const auto warnings = MedsWarnings(model);
  if (!warnings.empty()) out << "<h2>Warnings</h2>\n<ul>\n";
  for (const auto& w : warnings) out << "<li>" << EscapeHtml(w) << "</li>\n";
  if (!warnings.empty()) out << "</ul>\n";
  WriteHtmlEnd(out);
}

}  // namespace medload
