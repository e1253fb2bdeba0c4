#include "medload/synth/catalogue.h"

#include <cmath>
#include <unordered_map>

namespace medload {
namespace {

using Texts = std::vector<std::string_view>;
constexpr PeriodUnit kH = PeriodUnit::kHour;
constexpr PeriodUnit kD = PeriodUnit::kDay;
constexpr PeriodUnit kW = PeriodUnit::kWeek;

CatalogueDosage Regimen(double low, double high, int frequency, int period, PeriodUnit unit,
                        bool as_needed, std::string_view dose_unit, Texts texts) {
  return CatalogueDosage{low, high, frequency, period, unit, as_needed, dose_unit,
                         std::move(texts)};
}

// The regimens, each written the ways British prescribers and pharmacy labels write it
// (common practice). Texts of one regimen agree on the units per day.
struct Dosages {
  CatalogueDosage od_tab = Regimen(1, 1, 1, 1, kD, false, "tablet",
      {"one tablet once a day", "ONE TO BE TAKEN EACH DAY", "1 od", "take one daily"});
  CatalogueDosage om_tab = Regimen(1, 1, 1, 1, kD, false, "tablet",
      {"one tablet in the morning", "ONE TO BE TAKEN EACH MORNING", "1 om", "one mane"});
  CatalogueDosage on_tab = Regimen(1, 1, 1, 1, kD, false, "tablet",
      {"one tablet at night", "ONE TO BE TAKEN AT NIGHT", "1 on", "one nocte"});
  CatalogueDosage bd_tab = Regimen(1, 1, 2, 1, kD, false, "tablet",
      {"one tablet twice a day", "ONE TO BE TAKEN TWICE A DAY", "1 bd",
       "one in the morning and one at night"});
  CatalogueDosage tds_tab = Regimen(1, 1, 3, 1, kD, false, "tablet",
      {"one tablet three times a day", "ONE TO BE TAKEN THREE TIMES A DAY", "1 tds"});
  CatalogueDosage two_bd_tab = Regimen(2, 2, 2, 1, kD, false, "tablet",
      {"two tablets twice a day", "TWO TO BE TAKEN TWICE A DAY", "2 bd"});
  CatalogueDosage two_od_tab = Regimen(2, 2, 1, 1, kD, false, "tablet",
      {"two tablets once a day with the evening meal", "TWO TO BE TAKEN WITH EVENING MEAL",
       "2 od"});
  CatalogueDosage two_on_tab = Regimen(2, 2, 1, 1, kD, false, "tablet",
      {"two tablets at night", "TWO TO BE TAKEN AT NIGHT", "2 on"});
  CatalogueDosage two_qds_tab = Regimen(2, 2, 4, 1, kD, false, "tablet",
      {"two tablets four times a day", "TWO TO BE TAKEN FOUR TIMES A DAY", "2 qds"});
  CatalogueDosage two_qds_cap = Regimen(2, 2, 4, 1, kD, false, "capsule",
      {"two capsules four times a day", "TWO CAPSULES TO BE TAKEN FOUR TIMES A DAY", "2 qds"});
  CatalogueDosage od_cap = Regimen(1, 1, 1, 1, kD, false, "capsule",
      {"one capsule once a day", "ONE CAPSULE TO BE TAKEN EACH DAY", "1 od",
       "take one capsule daily"});
  CatalogueDosage on_cap = Regimen(1, 1, 1, 1, kD, false, "capsule",
      {"one capsule at night", "ONE CAPSULE TO BE TAKEN AT NIGHT", "1 on"});
  CatalogueDosage bd_cap = Regimen(1, 1, 2, 1, kD, false, "capsule",
      {"one capsule twice a day", "ONE CAPSULE TO BE TAKEN TWICE A DAY", "1 bd"});
  CatalogueDosage tds_cap = Regimen(1, 1, 3, 1, kD, false, "capsule",
      {"one capsule three times a day", "ONE CAPSULE TO BE TAKEN THREE TIMES A DAY", "1 tds"});
  CatalogueDosage two_tds_cap = Regimen(2, 2, 3, 1, kD, false, "capsule",
      {"two capsules three times a day", "TWO CAPSULES TO BE TAKEN THREE TIMES A DAY", "2 tds"});
  CatalogueDosage weekly_tab = Regimen(1, 1, 1, 1, kW, false, "tablet",
      {"one tablet once a week", "ONE TO BE TAKEN ONCE A WEEK ON THE SAME DAY", "1 weekly"});
  CatalogueDosage six_weekly_tab = Regimen(6, 6, 1, 1, kW, false, "tablet",
      {"six tablets once a week on the same day", "SIX TABLETS TO BE TAKEN ONCE A WEEK ON THE SAME DAY"});
  CatalogueDosage patch_72h = Regimen(1, 1, 1, 72, kH, false, "patch",
      {"apply one patch every 72 hours", "APPLY ONE PATCH EVERY 3 DAYS",
       "one patch every three days"});
  CatalogueDosage patch_weekly = Regimen(1, 1, 1, 1, kW, false, "patch",
      {"apply one patch once a week", "APPLY ONE PATCH EVERY SEVEN DAYS",
       "change patch weekly"});
  CatalogueDosage patch_daily = Regimen(1, 1, 1, 1, kD, false, "patch",
      {"apply one patch once a day", "APPLY ONE PATCH EACH DAY", "one patch daily"});
  CatalogueDosage as_directed = Regimen(0, 0, 0, 1, kD, false, "",
      {"as directed", "use as directed", "AS DIRECTED"});
  CatalogueDosage anticoagulant_clinic = Regimen(0, 0, 0, 1, kD, false, "tablet",
      {"as directed by the anticoagulant clinic", "take as directed", "AS DIRECTED"});
  CatalogueDosage insulin = Regimen(0, 0, 0, 1, kD, false, "",
      {"inject as directed", "use as directed", "INJECT AS DIRECTED BY YOUR DIABETES NURSE"});
  CatalogueDosage no_text = Regimen(0, 0, 0, 1, kD, false, "", {""});
  // As-needed regimens with a stated maximum.
  CatalogueDosage prn_one_two_qds = Regimen(1, 2, 4, 1, kD, true, "tablet",
      {"1-2 tablets up to four times a day when required",
       "TAKE ONE OR TWO TABLETS UP TO FOUR TIMES A DAY WHEN REQUIRED", "1-2 qds prn",
       "one or two tablets every four to six hours when required, maximum eight in 24 hours"});
  CatalogueDosage prn_one_two_qds_cap = Regimen(1, 2, 4, 1, kD, true, "capsule",
      {"one or two capsules up to four times a day when required",
       "1-2 capsules qds prn", "TAKE ONE OR TWO CAPSULES UP TO FOUR TIMES A DAY IF NEEDED"});
  CatalogueDosage prn_one_qds = Regimen(1, 1, 4, 1, kD, true, "tablet",
      {"one tablet up to four times a day when required", "1 qds prn",
       "ONE TO BE TAKEN UP TO FOUR TIMES A DAY WHEN REQUIRED"});
  CatalogueDosage prn_one_tds = Regimen(1, 1, 3, 1, kD, true, "tablet",
      {"one tablet up to three times a day when required", "1 tds prn",
       "ONE TO BE TAKEN UP TO THREE TIMES A DAY AS NEEDED"});
  CatalogueDosage prn_one_night = Regimen(1, 1, 1, 1, kD, true, "tablet",
      {"one tablet at night when required", "1 on prn", "ONE AT NIGHT WHEN NEEDED"});
  CatalogueDosage prn_puffs = Regimen(1, 2, 4, 1, kD, true, "puff",
      {"two puffs up to four times a day when required", "1-2 puffs qds prn",
       "INHALE ONE OR TWO PUFFS UP TO FOUR TIMES A DAY WHEN REQUIRED"});
  CatalogueDosage prn_spray_no_max = Regimen(0, 0, 0, 1, kD, true, "spray",
      {"one or two sprays under the tongue when required", "1-2 sprays sl prn",
       "SPRAY ONE OR TWO DOSES UNDER THE TONGUE WHEN REQUIRED"});
  CatalogueDosage prn_oral_solution = Regimen(2.5, 5, 6, 1, kD, true, "ml",
      {"2.5ml to 5ml every four hours when required", "2.5-5ml 4 hourly prn",
       "TAKE 2.5ML TO 5ML EVERY FOUR HOURS IF NEEDED FOR PAIN"});
  CatalogueDosage prn_sachet = Regimen(1, 1, 2, 1, kD, true, "sachet",
      {"one sachet up to twice a day when required", "1 sachet bd prn"});
  CatalogueDosage prn_loperamide = Regimen(1, 1, 4, 1, kD, true, "capsule",
      {"one capsule after each loose stool, maximum four a day", "1 prn max 4 in 24 hours"});
  // Inhaled, liquid, topical and eye regimens.
  CatalogueDosage two_puffs_bd = Regimen(2, 2, 2, 1, kD, false, "puff",
      {"two puffs twice a day", "INHALE TWO DOSES TWICE A DAY", "2 puffs bd"});
  CatalogueDosage inhaled_capsule_od = Regimen(1, 1, 1, 1, kD, false, "capsule",
      {"inhale the contents of one capsule once a day", "1 capsule inhaled od"});
  CatalogueDosage nasal_bd = Regimen(4, 4, 2, 1, kD, false, "spray",
      {"two sprays into each nostril twice a day", "2 sprays each nostril bd"});
  CatalogueDosage liquid_15ml_bd = Regimen(15, 15, 2, 1, kD, false, "ml",
      {"15ml twice a day", "15ML TO BE TAKEN TWICE A DAY", "15ml bd"});
  CatalogueDosage eye_drop_night = Regimen(2, 2, 1, 1, kD, false, "drop",  // one per eye
      {"one drop into both eyes at night", "ONE DROP TO BE USED IN BOTH EYES AT NIGHT",
       "1 drop both eyes nocte"});
  // Creams: no structured dose (the amount per application is not said).
  CatalogueDosage apply_bd = Regimen(0, 0, 0, 1, kD, false, "",
      {"apply thinly twice a day", "APPLY TWICE A DAY", "apply bd"});
  CatalogueDosage apply_tds = Regimen(0, 0, 0, 1, kD, false, "",
      {"apply three times a day", "APPLY THREE TIMES A DAY FOR 7 DAYS", "apply tds"});
  CatalogueDosage injection_12_weekly = Regimen(1, 1, 1, 12, kW, false, "ampoule",
      {"one injection every 12 weeks", "1ml every 12 weeks"});
  // Courses.
  CatalogueDosage course_tds_cap = Regimen(1, 1, 3, 1, kD, false, "capsule",
      {"one capsule three times a day for seven days",
       "ONE CAPSULE TO BE TAKEN THREE TIMES A DAY FOR 7 DAYS", "1 tds for 7 days"});
  CatalogueDosage course_tds_tab = Regimen(1, 1, 3, 1, kD, false, "tablet",
      {"one tablet three times a day for seven days",
       "ONE TO BE TAKEN THREE TIMES A DAY UNTIL ALL TAKEN", "1 tds for 7 days"});
  CatalogueDosage course_qds_cap = Regimen(1, 1, 4, 1, kD, false, "capsule",
      {"one capsule four times a day for seven days",
       "ONE CAPSULE TO BE TAKEN FOUR TIMES A DAY ONE HOUR BEFORE FOOD", "1 qds for 7 days"});
  CatalogueDosage course_two_qds_tab = Regimen(2, 2, 4, 1, kD, false, "tablet",
      {"two tablets four times a day for five days", "2 qds for 5 days"});
  CatalogueDosage course_bd_tab = Regimen(1, 1, 2, 1, kD, false, "tablet",
      {"one tablet twice a day", "ONE TO BE TAKEN TWICE A DAY WITH OR AFTER FOOD", "1 bd"});
  CatalogueDosage course_bd_cap = Regimen(1, 1, 2, 1, kD, false, "capsule",
      {"one capsule twice a day for three days", "1 bd for 3 days"});
  CatalogueDosage course_od_cap = Regimen(1, 1, 1, 1, kD, false, "capsule",
      {"two capsules on the first day then one capsule once a day",
       "TWO ON DAY ONE THEN ONE DAILY"});
  CatalogueDosage course_prednisolone = Regimen(6, 6, 1, 1, kD, false, "tablet",
      {"six tablets once a day for five days", "TAKE SIX TABLETS EACH MORNING FOR 5 DAYS",
       "6 om for 5 days"});
  CatalogueDosage single_dose = Regimen(0, 0, 0, 1, kD, false, "capsule",
      {"one capsule as a single dose", "ONE TO BE TAKEN AS A SINGLE DOSE"});
};

const Dosages& AllDosages() {
  static const Dosages kDosages;
  return kDosages;
}

constexpr CatalogueUse kReg = CatalogueUse::kRegular;
constexpr CatalogueUse kPrn = CatalogueUse::kAsNeeded;
constexpr CatalogueUse kCourse = CatalogueUse::kCourse;
constexpr CatalogueUse kAppl = CatalogueUse::kAppliance;
constexpr bool kTarget = true;  // a typical target of a medication review

CatalogueProduct Med(std::string_view key, std::string_view description, CatalogueUse use,
                     std::string_view unit, double quantity, const CatalogueDosage& dosage,
                     std::string_view medicine, bool review_target = false,
                     int stated_days = 0, int repeat_days = 0) {
  return CatalogueProduct{key,      description, CatalogueKind::kMedicine, use,
                          unit,     quantity,    &dosage,                  stated_days,
                          repeat_days, medicine, review_target};
}

CatalogueProduct Item(std::string_view key, std::string_view description,
                      std::string_view unit, double quantity, const CatalogueDosage& dosage,
                      int repeat_days) {
  return CatalogueProduct{key,  description, CatalogueKind::kNonMedicine, kAppl, unit,
                          quantity, &dosage, -1, repeat_days, key, false};
}

// Descriptions follow the usual British generic style ("Amlodipine 5mg tablets");
// quantities are the usual 28-day or course quantities (common practice).
std::vector<CatalogueProduct> BuildProducts() {
  const Dosages& d = AllDosages();
  return {
      // Cardiovascular.
      Med("amlodipine-5", "Amlodipine 5mg tablets", kReg, "tablet", 28, d.od_tab, "amlodipine"),
      Med("amlodipine-10", "Amlodipine 10mg tablets", kReg, "tablet", 28, d.od_tab, "amlodipine"),
      Med("nifedipine-mr", "Nifedipine 20mg modified-release tablets", kReg, "tablet", 56,
          d.bd_tab, "nifedipine"),
      Med("ramipril-2.5", "Ramipril 2.5mg capsules", kReg, "capsule", 28, d.od_cap, "ramipril"),
      Med("ramipril-5", "Ramipril 5mg capsules", kReg, "capsule", 28, d.od_cap, "ramipril"),
      Med("ramipril-10", "Ramipril 10mg capsules", kReg, "capsule", 28, d.od_cap, "ramipril"),
      Med("lisinopril-10", "Lisinopril 10mg tablets", kReg, "tablet", 28, d.od_tab, "lisinopril"),
      Med("lisinopril-20", "Lisinopril 20mg tablets", kReg, "tablet", 28, d.od_tab, "lisinopril"),
      Med("perindopril-4", "Perindopril erbumine 4mg tablets", kReg, "tablet", 28, d.od_tab,
          "perindopril"),
      Med("losartan-50", "Losartan 50mg tablets", kReg, "tablet", 28, d.od_tab, "losartan"),
      Med("losartan-100", "Losartan potassium 100mg tablets", kReg, "tablet", 28, d.od_tab,
          "losartan"),
      Med("candesartan-8", "Candesartan 8mg tablets", kReg, "tablet", 28, d.od_tab, "candesartan"),
      Med("candesartan-16", "Candesartan 16mg tablets", kReg, "tablet", 28, d.od_tab,
          "candesartan"),
      Med("bendroflumethiazide", "Bendroflumethiazide 2.5mg tablets", kReg, "tablet", 28,
          d.om_tab, "bendroflumethiazide"),
      Med("indapamide", "Indapamide 2.5mg tablets", kReg, "tablet", 28, d.om_tab, "indapamide"),
      Med("doxazosin", "Doxazosin 4mg tablets", kReg, "tablet", 28, d.od_tab, "doxazosin"),
      Med("atorvastatin-20", "Atorvastatin 20mg tablets", kReg, "tablet", 28, d.od_tab,
          "atorvastatin"),
      Med("atorvastatin-40", "Atorvastatin 40mg tablets", kReg, "tablet", 28, d.od_tab,
          "atorvastatin"),
      Med("atorvastatin-80", "Atorvastatin 80mg tablets", kReg, "tablet", 28, d.on_tab,
          "atorvastatin"),
      Med("simvastatin-40", "Simvastatin 40mg tablets", kReg, "tablet", 28, d.on_tab,
          "simvastatin"),
      Med("rosuvastatin-10", "Rosuvastatin 10mg tablets", kReg, "tablet", 28, d.od_tab,
          "rosuvastatin"),
      Med("aspirin-75", "Aspirin 75mg dispersible tablets", kReg, "tablet", 28, d.od_tab,
          "aspirin"),
      Med("aspirin-75-gr", "Aspirin 75mg gastro-resistant tablets", kReg, "tablet", 28, d.od_tab,
          "aspirin"),
      Med("clopidogrel", "Clopidogrel 75mg tablets", kReg, "tablet", 28, d.od_tab, "clopidogrel"),
      Med("bisoprolol-2.5", "Bisoprolol fumarate 2.5mg tablets", kReg, "tablet", 28, d.od_tab,
          "bisoprolol"),
      Med("bisoprolol-5", "Bisoprolol 5mg tablets", kReg, "tablet", 28, d.om_tab, "bisoprolol"),
      Med("atenolol", "Atenolol 50mg tablets", kReg, "tablet", 28, d.od_tab, "atenolol"),
      Med("isosorbide-mr", "Isosorbide mononitrate 60mg modified-release tablets", kReg, "tablet",
          28, d.om_tab, "isosorbide mononitrate"),
      Med("gtn-spray", "Glyceryl trinitrate 400micrograms/dose pump sublingual spray", kPrn,
          "dose", 200, d.prn_spray_no_max, "glyceryl trinitrate", false, 0, 180),
      Med("apixaban-5", "Apixaban 5mg tablets", kReg, "tablet", 56, d.bd_tab, "apixaban"),
      Med("apixaban-2.5", "Apixaban 2.5mg tablets", kReg, "tablet", 56, d.bd_tab, "apixaban"),
      Med("edoxaban", "Edoxaban 60mg tablets", kReg, "tablet", 28, d.od_tab, "edoxaban"),
      Med("rivaroxaban", "Rivaroxaban 20mg tablets", kReg, "tablet", 28, d.od_tab, "rivaroxaban"),
      Med("warfarin-1", "Warfarin 1mg tablets", kReg, "tablet", 56, d.anticoagulant_clinic,
          "warfarin", false, 28),
      Med("warfarin-3", "Warfarin 3mg tablets", kReg, "tablet", 28, d.anticoagulant_clinic,
          "warfarin 3mg", false, 28),
      Med("digoxin", "Digoxin 125microgram tablets", kReg, "tablet", 28, d.od_tab, "digoxin"),
      Med("amiodarone", "Amiodarone 200mg tablets", kReg, "tablet", 28, d.od_tab, "amiodarone"),
      Med("furosemide-20", "Furosemide 20mg tablets", kReg, "tablet", 28, d.om_tab, "furosemide"),
      Med("furosemide-40", "Furosemide 40mg tablets", kReg, "tablet", 28, d.om_tab, "furosemide"),
      Med("co-amilofruse", "Co-amilofruse 5mg/40mg tablets", kReg, "tablet", 28, d.om_tab,
          "furosemide"),
      Med("spironolactone", "Spironolactone 25mg tablets", kReg, "tablet", 28, d.od_tab,
          "spironolactone"),
      // Diabetes.
      Med("metformin-500", "Metformin 500mg tablets", kReg, "tablet", 112, d.two_bd_tab,
          "metformin"),
      Med("metformin-mr", "Metformin 500mg modified-release tablets", kReg, "tablet", 56,
          d.two_od_tab, "metformin"),
      Med("gliclazide", "Gliclazide 80mg tablets", kReg, "tablet", 56, d.bd_tab, "gliclazide"),
      Med("empagliflozin", "Empagliflozin 10mg tablets", kReg, "tablet", 28, d.od_tab,
          "empagliflozin"),
      Med("dapagliflozin", "Dapagliflozin 10mg tablets", kReg, "tablet", 28, d.od_tab,
          "dapagliflozin"),
      Med("sitagliptin", "Sitagliptin 100mg tablets", kReg, "tablet", 28, d.od_tab, "sitagliptin"),
      Med("insulin-glargine",
          "Insulin glargine 100units/ml solution for injection 3ml pre-filled pens", kReg,
          "ml", 15, d.insulin, "insulin glargine", false, 28),
      Med("insulin-detemir",
          "Insulin detemir 100units/ml solution for injection 3ml pre-filled pens", kReg,
          "ml", 15, d.insulin, "insulin detemir", false, 28),
      // Respiratory.
      Med("salbutamol", "Salbutamol 100micrograms/dose inhaler CFC free", kPrn, "dose", 200,
          d.prn_puffs, "salbutamol", false, 0, 60),
      Med("beclometasone-inh", "Beclometasone 100micrograms/dose inhaler CFC free", kReg, "dose",
          200, d.two_puffs_bd, "beclometasone"),
      Med("budesonide-formoterol",
          "Budesonide 200micrograms/dose / Formoterol 6micrograms/dose dry powder inhaler", kReg,
          "dose", 120, d.two_puffs_bd, "budesonide"),
      Med("tiotropium", "Tiotropium 18microgram inhalation powder capsules", kReg, "capsule", 30,
          d.inhaled_capsule_od, "tiotropium"),
      Med("montelukast", "Montelukast 10mg tablets", kReg, "tablet", 28, d.on_tab, "montelukast"),
      Med("carbocisteine", "Carbocisteine 375mg capsules", kReg, "capsule", 120, d.two_tds_cap,
          "carbocisteine"),
      // Mental health, sleep and dementia.
      Med("sertraline-50", "Sertraline 50mg tablets", kReg, "tablet", 28, d.od_tab, "sertraline"),
      Med("sertraline-100", "Sertraline 100mg tablets", kReg, "tablet", 28, d.od_tab,
          "sertraline"),
      Med("citalopram", "Citalopram 20mg tablets", kReg, "tablet", 28, d.od_tab, "citalopram"),
      Med("fluoxetine", "Fluoxetine 20mg capsules", kReg, "capsule", 30, d.od_cap, "fluoxetine"),
      Med("paroxetine", "Paroxetine 20mg tablets", kReg, "tablet", 30, d.om_tab, "paroxetine",
          kTarget),
      Med("mirtazapine-15", "Mirtazapine 15mg tablets", kReg, "tablet", 28, d.on_tab,
          "mirtazapine"),
      Med("mirtazapine-30", "Mirtazapine 30mg tablets", kReg, "tablet", 28, d.on_tab,
          "mirtazapine"),
      Med("venlafaxine", "Venlafaxine 75mg modified-release capsules", kReg, "capsule", 28,
          d.od_cap, "venlafaxine"),
      Med("duloxetine", "Duloxetine 60mg gastro-resistant capsules", kReg, "capsule", 28,
          d.od_cap, "duloxetine"),
      Med("trazodone", "Trazodone 50mg capsules", kReg, "capsule", 28, d.on_cap, "trazodone",
          kTarget),
      Med("amitriptyline-10", "Amitriptyline 10mg tablets", kReg, "tablet", 28, d.on_tab,
          "amitriptyline", kTarget),
      Med("amitriptyline-25", "Amitriptyline 25mg tablets", kReg, "tablet", 28, d.on_tab,
          "amitriptyline", kTarget),
      Med("zopiclone-7.5", "Zopiclone 7.5mg tablets", kPrn, "tablet", 14, d.prn_one_night,
          "zopiclone", kTarget, 0, 42),
      Med("zopiclone-3.75", "Zopiclone 3.75mg tablets", kPrn, "tablet", 28, d.prn_one_night,
          "zopiclone", kTarget, 0, 42),
      Med("temazepam", "Temazepam 10mg tablets", kReg, "tablet", 28, d.on_tab, "temazepam",
          kTarget),
      Med("diazepam-2", "Diazepam 2mg tablets", kPrn, "tablet", 30, d.prn_one_tds, "diazepam",
          kTarget, 0, 45),
      Med("diazepam-5", "Diazepam 5mg tablets", kReg, "tablet", 28, d.on_tab, "diazepam",
          kTarget),
      Med("promethazine", "Promethazine hydrochloride 25mg tablets", kPrn, "tablet", 28,
          d.prn_one_night, "promethazine", kTarget, 0, 45),
      Med("propranolol", "Propranolol 10mg tablets", kPrn, "tablet", 84, d.prn_one_tds,
          "propranolol", false, 0, 56),
      Med("quetiapine-25", "Quetiapine 25mg tablets", kReg, "tablet", 56, d.bd_tab, "quetiapine",
          kTarget),
      Med("quetiapine-100", "Quetiapine 100mg tablets", kReg, "tablet", 56, d.bd_tab,
          "quetiapine", kTarget),
      Med("olanzapine", "Olanzapine 5mg tablets", kReg, "tablet", 28, d.on_tab, "olanzapine",
          kTarget),
      Med("risperidone-0.5", "Risperidone 500microgram tablets", kReg, "tablet", 56, d.bd_tab,
          "risperidone", kTarget),
      Med("risperidone-1", "Risperidone 1mg tablets", kReg, "tablet", 56, d.bd_tab, "risperidone"),
      Med("aripiprazole", "Aripiprazole 10mg tablets", kReg, "tablet", 28, d.od_tab,
          "aripiprazole"),
      Med("lithium", "Lithium carbonate 400mg modified-release tablets", kReg, "tablet", 28,
          d.on_tab, "lithium"),
      Med("procyclidine", "Procyclidine 5mg tablets", kReg, "tablet", 84, d.tds_tab,
          "procyclidine", kTarget),
      Med("donepezil-5", "Donepezil 5mg tablets", kReg, "tablet", 28, d.on_tab, "donepezil"),
      Med("donepezil-10", "Donepezil 10mg tablets", kReg, "tablet", 28, d.on_tab, "donepezil"),
      Med("rivastigmine-patch", "Rivastigmine 9.5mg/24hours transdermal patches", kReg, "patch",
          30, d.patch_daily, "rivastigmine"),
      Med("memantine", "Memantine 20mg tablets", kReg, "tablet", 28, d.od_tab, "memantine"),
      Med("co-careldopa", "Co-careldopa 25mg/100mg tablets", kReg, "tablet", 84, d.tds_tab,
          "levodopa"),
      Med("ropinirole", "Ropinirole 1mg tablets", kReg, "tablet", 84, d.tds_tab, "ropinirole"),
      Med("lamotrigine", "Lamotrigine 100mg tablets", kReg, "tablet", 56, d.bd_tab, "lamotrigine"),
      Med("levetiracetam", "Levetiracetam 500mg tablets", kReg, "tablet", 56, d.bd_tab,
          "levetiracetam"),
      Med("valproate", "Sodium valproate 500mg gastro-resistant tablets", kReg, "tablet", 56,
          d.bd_tab, "valproate"),
      Med("carbamazepine", "Carbamazepine 200mg tablets", kReg, "tablet", 56, d.bd_tab,
          "carbamazepine"),
      // Pain.
      Med("paracetamol-prn", "Paracetamol 500mg tablets", kPrn, "tablet", 100, d.prn_one_two_qds,
          "paracetamol", false, 0, 35),
      Med("paracetamol-regular", "Paracetamol 500mg caplets", kReg, "tablet", 200, d.two_qds_tab,
          "paracetamol"),
      Med("co-codamol-30-prn", "Co-codamol 30mg/500mg tablets", kPrn, "tablet", 100,
          d.prn_one_two_qds, "co-codamol", kTarget, 0, 30),
      Med("co-codamol-30-regular", "Co-codamol 30mg/500mg capsules", kReg, "capsule", 200,
          d.two_qds_cap, "co-codamol", kTarget),
      Med("co-codamol-8", "Co-codamol 8mg/500mg tablets", kPrn, "tablet", 100, d.prn_one_two_qds,
          "co-codamol", false, 0, 40),
      Med("co-dydramol", "Co-dydramol 10mg/500mg tablets", kPrn, "tablet", 100,
          d.prn_one_two_qds, "co-dydramol", kTarget, 0, 35),
      Med("codeine", "Codeine phosphate 30mg tablets", kPrn, "tablet", 100, d.prn_one_qds,
          "codeine", kTarget, 0, 35),
      Med("tramadol", "Tramadol 50mg capsules", kPrn, "capsule", 100, d.prn_one_two_qds_cap,
          "tramadol", kTarget, 0, 28),
      Med("tramadol-mr", "Tramadol 100mg modified-release tablets", kReg, "tablet", 56, d.bd_tab,
          "tramadol", kTarget),
      Med("morphine-mr", "Morphine sulfate 10mg modified-release tablets", kReg, "tablet", 56,
          d.bd_tab, "morphine", kTarget),
      Med("morphine-solution", "Morphine sulfate 10mg/5ml oral solution", kPrn, "ml", 100,
          d.prn_oral_solution, "morphine solution", kTarget, 0, 30),
      Med("oxycodone-mr", "Oxycodone 5mg modified-release tablets", kReg, "tablet", 56, d.bd_tab,
          "oxycodone", kTarget),
      Med("fentanyl-patch", "Fentanyl 25micrograms/hour transdermal patches", kReg, "patch", 10,
          d.patch_72h, "fentanyl", kTarget),
      Med("buprenorphine-patch", "Buprenorphine 10micrograms/hour seven day transdermal patches",
          kReg, "patch", 4, d.patch_weekly, "buprenorphine", kTarget),
      Med("naproxen-250", "Naproxen 250mg tablets", kReg, "tablet", 56, d.bd_tab, "naproxen",
          kTarget),
      Med("diclofenac", "Diclofenac sodium 50mg gastro-resistant tablets", kReg, "tablet", 84,
          d.tds_tab, "diclofenac", kTarget),
      Med("gabapentin", "Gabapentin 300mg capsules", kReg, "capsule", 84, d.tds_cap, "gabapentin",
          kTarget),
      Med("pregabalin-75", "Pregabalin 75mg capsules", kReg, "capsule", 56, d.bd_cap, "pregabalin",
          kTarget),
      Med("pregabalin-150", "Pregabalin 150mg capsules", kReg, "capsule", 56, d.bd_cap,
          "pregabalin", kTarget),
      Med("baclofen", "Baclofen 10mg tablets", kReg, "tablet", 84, d.tds_tab, "baclofen", kTarget),
      // Urology.
      Med("oxybutynin", "Oxybutynin hydrochloride 5mg tablets", kReg, "tablet", 56, d.bd_tab,
          "oxybutynin", kTarget),
      Med("solifenacin", "Solifenacin 5mg tablets", kReg, "tablet", 30, d.od_tab, "solifenacin",
          kTarget),
      Med("tolterodine", "Tolterodine 2mg tablets", kReg, "tablet", 56, d.bd_tab, "tolterodine",
          kTarget),
      Med("mirabegron", "Mirabegron 50mg modified-release tablets", kReg, "tablet", 30, d.od_tab,
          "mirabegron"),
      Med("tamsulosin", "Tamsulosin 400microgram modified-release capsules", kReg, "capsule", 30,
          d.od_cap, "tamsulosin"),
      Med("finasteride", "Finasteride 5mg tablets", kReg, "tablet", 28, d.od_tab, "finasteride"),
      // Gastro-intestinal.
      Med("omeprazole-20", "Omeprazole 20mg gastro-resistant capsules", kReg, "capsule", 28,
          d.od_cap, "omeprazole", kTarget),
      Med("omeprazole-40", "Omeprazole 40mg gastro-resistant capsules", kReg, "capsule", 28,
          d.od_cap, "omeprazole", kTarget),
      Med("lansoprazole-15", "Lansoprazole 15mg gastro-resistant capsules", kReg, "capsule", 28,
          d.od_cap, "lansoprazole", kTarget),
      Med("lansoprazole-30", "Lansoprazole 30mg gastro-resistant capsules", kReg, "capsule", 28,
          d.od_cap, "lansoprazole", kTarget),
      Med("lactulose", "Lactulose 3.35g/5ml oral solution", kReg, "ml", 500, d.liquid_15ml_bd,
          "lactulose"),
      Med("senna", "Senna 7.5mg tablets", kReg, "tablet", 60, d.two_on_tab, "senna"),
      Med("macrogol", "Macrogol compound oral powder sachets", kPrn, "sachet", 30, d.prn_sachet,
          "macrogol", false, 0, 40),
      Med("loperamide", "Loperamide 2mg capsules", kPrn, "capsule", 30, d.prn_loperamide,
          "loperamide", false, 0, 90),
      Med("mebeverine", "Mebeverine 135mg tablets", kReg, "tablet", 84, d.tds_tab, "mebeverine"),
      // Endocrine, bone, blood and allergy.
      Med("levothyroxine-50", "Levothyroxine sodium 50microgram tablets", kReg, "tablet", 28,
          d.om_tab, "levothyroxine"),
      Med("levothyroxine-100", "Levothyroxine sodium 100microgram tablets", kReg, "tablet", 28,
          d.om_tab, "levothyroxine"),
      Med("alendronic-acid", "Alendronic acid 70mg tablets", kReg, "tablet", 4, d.weekly_tab,
          "alendronic acid"),
      Med("calcium-vitamin-d", "Calcium carbonate 1.5g / Colecalciferol 400unit chewable tablets",
          kReg, "tablet", 56, d.bd_tab, "calcium and colecalciferol"),
      Med("allopurinol-100", "Allopurinol 100mg tablets", kReg, "tablet", 28, d.od_tab,
          "allopurinol"),
      Med("allopurinol-300", "Allopurinol 300mg tablets", kReg, "tablet", 28, d.od_tab,
          "allopurinol"),
      Med("colchicine", "Colchicine 500microgram tablets", kPrn, "tablet", 24, d.prn_one_qds,
          "colchicine", false, 0, 120),
      Med("ferrous-sulfate", "Ferrous sulfate 200mg tablets", kReg, "tablet", 28, d.od_tab,
          "ferrous sulfate"),
      Med("folic-acid", "Folic acid 5mg tablets", kReg, "tablet", 28, d.od_tab, "folic acid"),
      Med("folic-acid-weekly", "Folic acid 5mg tablets", kReg, "tablet", 4, d.weekly_tab,
          "folic acid"),
      Med("methotrexate", "Methotrexate 2.5mg tablets", kReg, "tablet", 24, d.six_weekly_tab,
          "methotrexate"),
      Med("hydroxocobalamin", "Hydroxocobalamin 1mg/1ml solution for injection ampoules", kReg,
          "ampoule", 1, d.injection_12_weekly, "hydroxocobalamin"),
      Med("cetirizine", "Cetirizine 10mg tablets", kReg, "tablet", 30, d.od_tab, "cetirizine"),
      Med("loratadine", "Loratadine 10mg tablets", kReg, "tablet", 30, d.od_tab, "loratadine"),
      Med("chlorphenamine", "Chlorphenamine 4mg tablets", kPrn, "tablet", 28, d.prn_one_qds,
          "chlorphenamine", kTarget, 0, 40),
      Med("hydroxyzine", "Hydroxyzine hydrochloride 25mg tablets", kReg, "tablet", 28, d.on_tab,
          "hydroxyzine", kTarget),
      Med("beclometasone-nasal", "Beclometasone 50micrograms/dose nasal spray", kReg, "dose", 200,
          d.nasal_bd, "beclometasone nasal"),
      Med("latanoprost", "Latanoprost 50micrograms/ml eye drops", kReg, "ml", 2.5,
          d.eye_drop_night, "latanoprost", false, 28),
      // Courses.
      Med("amoxicillin", "Amoxicillin 500mg capsules", kCourse, "capsule", 21, d.course_tds_cap,
          "amoxicillin"),
      Med("flucloxacillin", "Flucloxacillin 500mg capsules", kCourse, "capsule", 28,
          d.course_qds_cap, "flucloxacillin"),
      Med("clarithromycin", "Clarithromycin 500mg tablets", kCourse, "tablet", 14,
          d.course_bd_tab, "clarithromycin"),
      Med("doxycycline", "Doxycycline 100mg capsules", kCourse, "capsule", 8, d.course_od_cap,
          "doxycycline"),
      Med("phenoxymethylpenicillin", "Phenoxymethylpenicillin 250mg tablets", kCourse, "tablet",
          40, d.course_two_qds_tab, "phenoxymethylpenicillin"),
      Med("co-amoxiclav", "Co-amoxiclav 500mg/125mg tablets", kCourse, "tablet", 21,
          d.course_tds_tab, "co-amoxiclav"),
      Med("nitrofurantoin", "Nitrofurantoin 100mg modified-release capsules", kCourse, "capsule",
          6, d.course_bd_cap, "nitrofurantoin"),
      Med("trimethoprim", "Trimethoprim 200mg tablets", kCourse, "tablet", 6, d.course_bd_tab,
          "trimethoprim"),
      Med("cefalexin", "Cefalexin 500mg capsules", kCourse, "capsule", 21, d.course_tds_cap,
          "cefalexin"),
      Med("fluconazole", "Fluconazole 150mg capsules", kCourse, "capsule", 1, d.single_dose,
          "fluconazole", false, 1),
      Med("naproxen-500", "Naproxen 500mg tablets", kCourse, "tablet", 14, d.course_bd_tab,
          "naproxen course"),
      Med("ibuprofen-400", "Ibuprofen 400mg tablets", kCourse, "tablet", 24, d.course_tds_tab,
          "ibuprofen"),
      Med("ibuprofen-gel", "Ibuprofen 5% gel", kCourse, "gram", 100, d.apply_tds, "ibuprofen gel",
          false, -1),
      Med("prednisolone", "Prednisolone 5mg tablets", kCourse, "tablet", 30, d.course_prednisolone,
          "prednisolone"),
      Med("hydrocortisone-cream", "Hydrocortisone 1% cream", kCourse, "gram", 30, d.apply_bd,
          "hydrocortisone", false, -1),
      Med("clotrimazole-cream", "Clotrimazole 1% cream", kCourse, "gram", 20, d.apply_bd,
          "clotrimazole", false, -1),
      Med("fusidic-acid-cream", "Fusidic acid 2% cream", kCourse, "gram", 15, d.apply_tds,
          "fusidic acid", false, -1),
      // Non-medicines.
      Item("glucose-strips", "Blood glucose testing strips", "strip", 50, d.as_directed, 42),
      Item("lancets", "Sterile lancets 30 gauge", "lancet", 100, d.as_directed, 84),
      Item("pen-needles", "Pen needles 4mm/32 gauge", "needle", 100, d.as_directed, 60),
      Item("stockings", "Class 2 below knee compression stockings", "pair", 2, d.no_text, 120),
      Item("foam-dressing", "Foam dressing 10cm x 10cm", "dressing", 10, d.as_directed, 21),
      Item("dressing-pad", "Absorbent dressing pad 10cm x 20cm", "dressing", 10, d.no_text, 28),
      Item("gauze-swabs", "Sterile gauze swabs 7.5cm x 7.5cm", "pack", 5, d.no_text, 42),
      Item("leg-bags", "Catheter leg bag 500ml", "bag", 10, d.as_directed, 30),
      Item("spacer", "Large volume spacer device", "device", 1, d.as_directed, 365),
  };
}

std::vector<CatalogueProduct> BuildCatalogue() {
  // Schedule 2-4 controlled drugs of the catalogue (Misuse of Drugs Regulations 2001, as
  // amended; from memory).
  static constexpr std::string_view kControlled[] = {
      "morphine-mr",  "morphine-solution", "oxycodone-mr",  "fentanyl-patch",
      "buprenorphine-patch", "tramadol",  "tramadol-mr",   "gabapentin",
      "pregabalin-75", "pregabalin-150",  "temazepam",     "diazepam-2",
      "diazepam-5",   "zopiclone-7.5",     "zopiclone-3.75"};
  std::vector<CatalogueProduct> products = BuildProducts();
  for (CatalogueProduct& product : products) {
    for (const std::string_view key : kControlled) {
      if (product.key == key) product.controlled = true;
    }
  }
  return products;
}

}  // namespace

const std::vector<CatalogueProduct>& SynthCatalogue() {
  static const std::vector<CatalogueProduct> kCatalogue = BuildCatalogue();
  return kCatalogue;
}

std::optional<size_t> FindCatalogueProduct(std::string_view key) {
  static const std::unordered_map<std::string_view, size_t> kIndex = [] {
    std::unordered_map<std::string_view, size_t> index;
    const auto& catalogue = SynthCatalogue();
    for (size_t i = 0; i < catalogue.size(); ++i) index.emplace(catalogue[i].key, i);
    return index;
  }();
  const auto found = kIndex.find(key);
  if (found == kIndex.end()) return std::nullopt;
  return found->second;
}

std::optional<double> UnitsPerDay(const CatalogueDosage& dosage) {
  if (dosage.dose_high <= 0 || dosage.frequency <= 0 || dosage.period <= 0) return std::nullopt;
  double period_days = dosage.period;
  if (dosage.period_unit == PeriodUnit::kHour) period_days = dosage.period / 24.0;
  if (dosage.period_unit == PeriodUnit::kWeek) period_days = dosage.period * 7.0;
  return dosage.dose_high * dosage.frequency / period_days;
}

std::optional<int> DaysCovered(const CatalogueProduct& product, double quantity) {
  if (product.stated_days < 0) return std::nullopt;
  double days = 0;
  if (product.stated_days > 0) {
    days = product.stated_days * quantity / product.quantity;
  } else {
    const std::optional<double> per_day = UnitsPerDay(*product.dosage);
    if (!per_day) return std::nullopt;
    days = quantity / *per_day;
  }
  // Round up, but not past a whole number that binary floating point narrowly missed.
  const int whole = static_cast<int>(std::ceil(days - 1e-9));
  return whole < 1 ? 1 : whole;
}

}  // namespace medload

