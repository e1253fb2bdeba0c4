#include "medload/burden/meds_writer.h"

#include <algorithm>
#include <cctype>
#include <cmath>
#include <ostream>

#include "medload/burden/route_notes.h"
#include "medload/burden/longitudinal_writer.h"
#include "medload/core/caution.h"
#include "medload/core/text.h"
#include "medload/dose/dose_unit.h"
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

// How the dosage was read: the amount a day in its own unit and, when that is another
// unit (a dose in mg, administrations without a dose), in the unit of the quantity, or
// why that is not known.
std::string DosageRead(const MedsModel& model, const DispensingUse& use) {
  const DosageReading& dosage = use.dosage;
  std::string text(UnderstandingName(dosage.understanding));
  if (dosage.units_per_day) {
    const bool administrations = dosage.unit == kAdministrationUnit;
    text += ", " + FormatNumber(*dosage.units_per_day, 3) +
            (administrations ? " times a day, no dose stated"
                             : (dosage.unit.empty() ? "" : " " + dosage.unit) + " per day");
    const std::string unit = RecordText(model.records, use, &DispensingRecord::unit);
    const bool converted = administrations || (use.supply.units_per_day &&
                                               std::abs(*use.supply.units_per_day - *dosage.units_per_day) >
                                                   1e-9 * std::abs(*dosage.units_per_day));
    if (use.supply.units_per_day && converted) {
      text += " = " + FormatNumber(*use.supply.units_per_day, 3) + " " +
              (unit.empty() ? std::string("dose units") : unit) + " per day";
    } else if (!use.supply.units_per_day && !use.supply.note.empty()) {
      text += " (not used: " + use.supply.note + ")";
    }
  }
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

// Products of `list` dispensed, on or before the date, recently enough that they could
// still be in use.
std::vector<const UnmatchedProduct*> Recent(const MedsModel& model, const std::vector<UnmatchedProduct>& list) {
  std::vector<const UnmatchedProduct*> recent;
  const Date first = model.burden->on - (model.options.supply.max_supply_days - 1);
  for (const UnmatchedProduct& product : list) {
    const std::optional<Date> last = product.LastBy(model.burden->on);
    if (last && *last >= first) recent.push_back(&product);
  }
  return recent;
}

std::vector<const UnmatchedProduct*> RecentUnmatched(const MedsModel& model) {
  return Recent(model, model.timeline->unmatched);
}

// The recent products of the timeline's partial (or approximate) matches, as text.
nlohmann::json RecentFlagged(const MedsModel& model, MatchKind match) {
  nlohmann::json list = nlohmann::json::array();
  for (const UnmatchedProduct* product : Recent(model, model.timeline->flagged)) {
    if (product->match == match) list.push_back(product->product);
  }
  return list;
}

// The warning for a product recognised only in part or from a close spelling, with what
// was known of it on `on`.
std::string FlaggedWarning(const UnmatchedProduct& product, Date on) {
  const std::string said = "\"" + product.product + "\" (" + std::to_string(product.ItemsBy(on)) + " item(s), last " +
                           product.LastBy(on)->ToIso() + ")";
  if (product.match == MatchKind::kPartial) {
    return said + " was recognised only in part (" + product.detail +
           "): what the formulary does not know is not counted.";
  }
  return said + " was read from a close spelling (" + product.detail + "): confirm it is the medicine dispensed.";
}

// The route notes of the active medicine at `index` in Burden::active.
std::vector<std::string> NotesOf(const std::vector<RouteNote>& notes, const ActiveMedicine& active,
                                 const MedsModel& model) {
  std::vector<std::string> texts;
  const size_t index = static_cast<size_t>(&active - model.burden->active.data());
  for (const RouteNote& note : notes) {
    if (note.active == index) texts.push_back(note.text);
  }
  return texts;
}

// The routes in use, "not stated" for a product whose route the description did not give.
std::string RoutesShown(const ActiveMedicine& active) {
  std::string text;
  for (const Route route : active.routes.Routes()) {
    if (!text.empty()) text += ", ";
    text += route == Route::kUnknown ? std::string("not stated") : std::string(RouteName(route));
  }
  return text;
}

std::vector<RouteNote> Notes(const MedsModel& model) {
  return RouteNotes(*model.timeline, *model.burden, *model.tables, model.age);
}

std::string SystemicRoutesSentence(const MedsModel& model) {
  return "Scores, the DBI and the rules count systemic routes (" +
         RouteListText(model.tables->systemic_routes, ", ") +
         ") unless the formulary says otherwise; items count every route.";
}

std::vector<std::string> RuleMedicines(const MedsModel& model, const FiredRule& fired) {
  std::vector<std::string> names;
  for (size_t index : fired.medicines) names.push_back(DisplayName(model.timeline->medicines[index]));
  return names;
}

}  // namespace

std::string NotCountedNote(const MedsModel& model) {
  long total = 0;
  std::string statuses;
  for (const auto& [status, count] : model.not_counted) {
    total += count;
    if (!statuses.empty()) statuses += ", ";
    statuses += status + " " + std::to_string(count);
  }
  if (total == 0) return "";
  return std::to_string(total) + " dispensing(s) up to " + model.burden->on.ToIso() +
         " are stored but not counted here because of their status (" + statuses +
         "); only completed dispensings count: check them with the dispensing record";
}

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
  for (const UnmatchedProduct* product : Recent(model, model.timeline->flagged)) {
    warnings.push_back(FlaggedWarning(*product, model.burden->on));
  }
  for (const std::string& ingredient : model.burden->dbi_incomplete) {
    const auto& no_minimum = model.burden->dbi_no_minimum;
    if (std::find(no_minimum.begin(), no_minimum.end(), ingredient) != no_minimum.end()) {
      warnings.push_back(ingredient + " is in a class the Drug Burden Index counts, but the table gives it no "
                         "minimum daily dose, so it adds nothing: the DBI is incomplete.");
      continue;
    }
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
    if (c.range_upper) {
      warnings.push_back("The Drug Burden Index dose of " + c.ingredient +
                         " takes the upper value of a range in its instruction (\"1-2\"): the patient may take less.");
    }
  }
  for (const Row& row : Rows(model)) {
    if (row.latest->supply.rule == SupplyRule::kDefaultDays) {
      const std::string& why = row.latest->supply.note;
      warnings.push_back("The days of supply of " + DisplayName(*row.medicine) + " were assumed (" +
                         std::to_string(row.latest->supply.days) + " days): the record gave no days supply and " +
                         (why.empty() ? std::string("the dosage was not understood.")
                                      : "the dosage gave no amount a day in the quantity's unit (" + why + ")."));
    }
  }
  for (const Row& row : Rows(model)) {
    if (RouteNotStated(*row.active)) {
      warnings.push_back("The route of " + DisplayName(*row.medicine) +
                         " was not stated (no form in the product description): it is counted as systemic.");
    }
  }
  if (model.burden->age_unknown_for_rules) {
    warnings.push_back("The patient's age is not known, so a rule with a minimum age (criteria for older people) that these medicines meet was not applied.");
  }
  if (!model.registered) warnings.push_back("The patient has no row in the registry.");
  if (const std::string note = NotCountedNote(model); !note.empty()) {
    std::string sentence = note + ".";
    sentence[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(sentence[0])));
    warnings.push_back(std::move(sentence));
  }
  for (std::string& warning : LongitudinalWarnings(model.burden->longitudinal)) warnings.push_back(std::move(warning));
  return warnings;
}

nlohmann::json MedsJson(const MedsModel& model) {
  const Burden& burden = *model.burden;
  const std::vector<RouteNote> notes = Notes(model);
  nlohmann::json medicines = nlohmann::json::array();
  for (const Row& row : Rows(model)) {
    const DispensingUse& use = *row.latest;
    std::vector<std::string> routes;
    for (const Route route : row.active->routes.Routes()) routes.emplace_back(RouteName(route));
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
                         {"routes", routes},
                         {"not_counted", NotesOf(notes, *row.active, model)},
                         {"last_dispensed", use.dispensed_on.ToIso()},
                         {"quantity", use.quantity},
                         {"supply_days", use.supply.days},
                         {"units_per_day", use.supply.units_per_day ? nlohmann::json(*use.supply.units_per_day)
                                                                    : nlohmann::json(nullptr)},
                         {"supply_rule", SupplyRuleName(use.supply.rule)},
                         {"dosage", DosageText(model, use)},
                         {"dosage_read", DosageRead(model, use)},
                         {"as_needed", use.dosage.as_needed}});
  }
  nlohmann::json rules = nlohmann::json::array();
  for (const FiredRule& fired : burden.rules) {
    rules.push_back({{"id", fired.rule->id},
                     {"title", fired.rule->title},
                     {"explanation", fired.rule->explanation},
                     {"source", RuleSourceText(*fired.rule)},
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
                         {"as_needed_max", source.as_needed_max}, {"range_upper", source.range_upper},
                         {"staged", source.staged}});
    }
    dbi.push_back({{"ingredient", c.ingredient}, {"dose_mg_per_day", c.dose_mg_per_day},
                   {"min_daily_dose_mg", c.min_daily_dose_mg}, {"value", c.value},
                   {"basis", DoseBasisName(c.basis)}, {"supply_assumed", c.supply_assumed},
                   {"as_needed_max", c.as_needed_max}, {"range_upper", c.range_upper}, {"staged", c.staged},
                   {"mark", DoseBasisMark(c)}, {"sources", sources}});
  }
  nlohmann::json unmatched = nlohmann::json::array();
  for (const UnmatchedProduct* product : RecentUnmatched(model)) unmatched.push_back(product->product);
  nlohmann::json age = model.age ? nlohmann::json(*model.age) : nlohmann::json(nullptr);
  nlohmann::json document = {{"patient", model.patient}, {"practice", model.practice}, {"on", burden.on.ToIso()},
          {"age", age}, {"items", burden.items}, {"acb", burden.acb}, {"scale", model.tables->scale},
          {"dbi", burden.dbi}, {"medicines", medicines}, {"rules", rules},
          {"score_contributions", contributions}, {"dbi_contributions", dbi},
          {"dbi_incomplete", burden.dbi_incomplete}, {"dbi_no_minimum", burden.dbi_no_minimum},
          {"unmatched", unmatched}, {"unmatched_in_part", RecentFlagged(model, MatchKind::kPartial)},
          {"approximate", RecentFlagged(model, MatchKind::kApproximate)}, {"not_counted", model.not_counted},
          {"measure", MeasureName(model.options.measure)}, {"data", std::string(DataStateName(model.data))},
          {"systemic_routes", RouteListText(model.tables->systemic_routes, ",")}, {"warnings", MedsWarnings(model)},
          {"caution", std::string(kCaution)}};
  // Longitudinal measures ("falls", "tsdd", "adherence", ...) and the trajectory.
  document.update(LongitudinalJson(*model.timeline, burden));
  document["before"] = model.trajectory ? TrajectoryJson(*model.trajectory) : nlohmann::json(nullptr);
  return document;
}

namespace {

std::vector<std::string> Header(const std::string& scale_label) {
  return {"medicine", "route", "since", "until", "last dispensed", "supply", "dosage read", scale_label, "DBI"};
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
    rows.push_back({DisplayName(*row.medicine), RoutesShown(*row.active), row.active->since.ToIso(),
                    UntilText(*row.active),
                    use.dispensed_on.ToIso(),
                    std::to_string(use.supply.days) + " d (" + std::string(SupplyRuleName(use.supply.rule)) + ")",
                    DosageRead(model, use), std::to_string(row.active->score), FormatNumber(row.active->dbi, 2)});
  }
  return rows;
}

// The quantity dispensed with its unit ("28 tablet", "100 mL"); empty when none is known.
std::string QuantityText(const MedsModel& model, const DispensingUse& use) {
  if (use.quantity <= 0) return "";
  const std::string unit = RecordText(model.records, use, &DispensingRecord::unit);
  return FormatNumber(use.quantity, 3) + (unit.empty() ? "" : " " + unit);
}

// What the latest dispensing of a medicine said: the product as dispensed, the quantity
// and the dosage as written (quoted, "no dosage text" when the record had none).
std::string AsDispensed(const MedsModel& model, const DispensingUse& use) {
  const std::string product = ProductText(model, use);
  const std::string quantity = QuantityText(model, use);
  const std::string dosage = DosageText(model, use);
  std::string text = product.empty() ? std::string("(no product text)") : product;
  if (!quantity.empty()) text += ", " + quantity;
  return text + "; " + (dosage.empty() ? std::string("no dosage text") : "\"" + dosage + "\"");
}

// The HTML table also shows the product as dispensed and the dosage as written (a page
// wraps long cells; the text table keeps them in a list below it).
std::vector<std::string> HtmlHeader(const std::string& scale_label) {
  std::vector<std::string> header = Header(scale_label);
  header.insert(header.begin() + 1, {"product as dispensed", "dosage as written"});
  return header;
}

std::vector<std::vector<std::string>> HtmlRows(const MedsModel& model) {
  std::vector<std::vector<std::string>> rows = TableRows(model);
  const std::vector<Row> source = Rows(model);
  for (size_t i = 0; i < rows.size() && i < source.size(); ++i) {
    const DispensingUse& use = *source[i].latest;
    const std::string quantity = QuantityText(model, use);
    rows[i].insert(rows[i].begin() + 1,
                   {ProductText(model, use) + (quantity.empty() ? "" : " (" + quantity + ")"), DosageText(model, use)});
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

// The falls-risk categories of an active medicine's ingredients, and its PDC (or its
// dispensings in the PDC period); empty when it has none.
std::string FallsRiskOf(const MedsModel& model, const ActiveMedicine& active) {
  std::vector<std::string> parts;
  for (const FallsRiskIngredient& entry : model.burden->longitudinal.falls_ingredients) {
    if (entry.medicine == active.medicine) parts.push_back(entry.ingredient + ":" + Join(entry.categories, "+"));
  }
  return Join(parts, "|");
}

std::string PdcOf(const MedsModel& model, const ActiveMedicine& active, bool dispensings) {
  for (const MedicineAdherence& a : model.burden->longitudinal.adherence) {
    if (a.medicine != active.medicine) continue;
    return dispensings ? std::to_string(a.figure.dispensings) : FormatNumber(a.figure.pdc, 4);
  }
  return "";
}

}  // namespace

void WriteMedsText(std::ostream& out, const MedsModel& model) {
  const Burden& b = *model.burden;
  out << "Patient " << model.patient << (model.practice.empty() ? "" : " (practice " + model.practice + ")")
      << ", age " << (model.age ? std::to_string(*model.age) : std::string("unknown")) << ", on "
      << b.on.ToIso() << " (" << MeasureName(model.options.measure) << ")\n"
      << Totals(model) << "\n";
  // Warnings first: they say which figures to distrust before anyone reads them.
  const auto warnings = MedsWarnings(model);
  if (!warnings.empty()) out << "\nCheck first:\n";
  for (const auto& w : warnings) out << "- " << w << "\n";
  out << "\n";
  WriteTextTable(out, Header(ScaleLabel(model)), TableRows(model));
  const std::vector<Row> rows = Rows(model);
  if (!rows.empty()) out << "\nAs dispensed (the latest dispensing of each):\n";
  for (const Row& row : rows) out << "- " << DisplayName(*row.medicine) << ": " << AsDispensed(model, *row.latest) << "\n";
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
  const std::vector<RouteNote> notes = Notes(model);
  if (!notes.empty()) out << "\nNot counted because of the route:\n";
  for (const RouteNote& note : notes) {
    out << "- " << DisplayName(model.timeline->medicines[b.active[note.active].medicine]) << ": " << note.text
        << "\n";
  }
  out << SystemicRoutesSentence(model) << "\n";
  for (const FiredRule& fired : b.rules) {
    out << "\nRule " << fired.rule->id << ": " << fired.rule->title << "\n  medicines: "
        << Join(RuleMedicines(model, fired), ", ") << "\n  " << fired.rule->explanation
        << "\n  source: " << RuleSourceText(*fired.rule) << "\n";
  }
  out << "\n";
  for (const std::string& line : LongitudinalLines(*model.timeline, b)) out << line << "\n";
  if (model.trajectory) out << "Change: " << TrajectoryText(*model.trajectory, ScaleLabel(model)) << "\n";
  WriteTextCaution(out);
}

void WriteMedsCsv(std::ostream& out, const MedsModel& model) {
  WriteCsvCaution(out);
  if (model.data_note) WriteCsvComment(out, "note: " + *model.data_note);
  if (const std::string note = NotCountedNote(model); !note.empty()) WriteCsvComment(out, "note: " + note);
  WriteCsvComment(out, SystemicRoutesSentence(model));
  for (const std::string& line : LongitudinalLines(*model.timeline, *model.burden)) WriteCsvComment(out, line);
  if (model.trajectory) WriteCsvComment(out, "change: " + TrajectoryText(*model.trajectory, ScaleLabel(model)));
  for (const auto& c : model.burden->dbi_contributions) {
    if (const std::string mark = DoseBasisMark(c); !mark.empty()) WriteCsvComment(out, "dbi " + c.ingredient + ":" + mark);
  }
  out << CsvRow({"patient", "on", "medicine", "ingredients", "since", "until", "in_tail", "last_dispensed",
                 "product", "route", "supply_days", "supply_rule", "dosage", "dosage_read", "scale", "score", "dbi",
                 "classes", "not_counted", "falls_risk", "pdc", "pdc_dispensings"});
  const std::vector<RouteNote> notes = Notes(model);
  for (const Row& row : Rows(model)) {
    const DispensingUse& use = *row.latest;
    out << CsvRow({model.patient, model.burden->on.ToIso(), DisplayName(*row.medicine),
                   Join(row.medicine->ingredients, "|"), row.active->since.ToIso(), row.active->until.ToIso(),
                   row.active->in_tail ? "yes" : "no", use.dispensed_on.ToIso(), ProductText(model, use),
                   RoutesShown(*row.active), std::to_string(use.supply.days),
                   std::string(SupplyRuleName(use.supply.rule)), DosageText(model, use), DosageRead(model, use),
                   model.tables->scale,
                   std::to_string(row.active->score), FormatNumber(row.active->dbi, 4),
                   Join(ClassesOf(model, *row.medicine), "|"), Join(NotesOf(notes, *row.active, model), "; "),
                   FallsRiskOf(model, *row.active), PdcOf(model, *row.active, false), PdcOf(model, *row.active, true)});
  }
}

void WriteMedsHtml(std::ostream& out, const MedsModel& model) {
  const Burden& b = *model.burden;
  WriteHtmlStart(out, "Medicines of patient " + model.patient + " on " + b.on.ToIso());
  out << "<p><strong>" << EscapeHtml(Totals(model)) << "</strong></p>\n";
  const auto warnings = MedsWarnings(model);
  if (!warnings.empty()) out << "<h2>Check first</h2>\n<ul>\n";
  for (const auto& w : warnings) out << "<li>" << EscapeHtml(w) << "</li>\n";
  if (!warnings.empty()) out << "</ul>\n";
  WriteHtmlTable(out, HtmlHeader(ScaleLabel(model)), HtmlRows(model));
  const std::vector<RouteNote> notes = Notes(model);
  if (!notes.empty()) out << "<h2>Not counted because of the route</h2>\n<ul>\n";
  for (const RouteNote& note : notes) {
    out << "<li>" << EscapeHtml(DisplayName(model.timeline->medicines[b.active[note.active].medicine])) << ": "
        << EscapeHtml(note.text) << "</li>\n";
  }
  if (!notes.empty()) out << "</ul>\n";
  out << "<p class=\"note\">" << EscapeHtml(SystemicRoutesSentence(model)) << "</p>\n";
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
        << EscapeHtml(RuleSourceText(*fired.rule)) << "</span></li>\n";
  }
  if (!b.rules.empty()) out << "</ul>\n";
  out << "<h2>Over time</h2>\n<ul>\n";
  for (const std::string& line : LongitudinalLines(*model.timeline, b)) {
    out << "<li>" << EscapeHtml(line) << "</li>\n";
  }
  if (model.trajectory) out << "<li>" << EscapeHtml(TrajectoryText(*model.trajectory, ScaleLabel(model))) << "</li>\n";
  out << "</ul>\n";
  WriteHtmlEnd(out);
}

}  // namespace medload
