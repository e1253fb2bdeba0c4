#include "medload/synth/care_plan.h"

#include <algorithm>
#include <span>

#include "medload/synth/catalogue.h"

namespace medload {
namespace {

// Prevalences per 10,000 by age band (0-17, 18-39, 40-49, 50-59, 60-69, 70-79, 80+),
// rounded figures in the range of English primary-care disease registers, from memory;
// treatment shares are common practice. They are tuned for plausible synthetic data, not
// for epidemiology.
std::vector<CareCondition> BuildConditions() {
  return {
      {"hypertension", {0, 150, 800, 1800, 3200, 4800, 6000}, 100, 100,
       {{7000, {{"ramipril-2.5", 10}, {"ramipril-5", 15}, {"ramipril-10", 15},
                {"lisinopril-10", 8}, {"lisinopril-20", 6}, {"perindopril-4", 4},
                {"losartan-50", 12}, {"losartan-100", 4}, {"candesartan-8", 8},
                {"candesartan-16", 6}}},
        {5500, {{"amlodipine-5", 20}, {"amlodipine-10", 15}, {"nifedipine-mr", 3}}},
        {3000, {{"bendroflumethiazide", 10}, {"indapamide", 10}}},
        {700, {{"doxazosin", 1}}}}},
      {"type 2 diabetes", {10, 100, 450, 850, 1300, 1700, 1600}, 90, 115,
       {{8500, {{"metformin-500", 10}, {"metformin-mr", 5}}},
        {2500, {{"gliclazide", 1}}},
        {2500, {{"empagliflozin", 10}, {"dapagliflozin", 10}}},
        {1500, {{"sitagliptin", 1}}},
        {1200, {{"insulin-glargine", 10, "pen-needles", 9000},
                {"insulin-detemir", 4, "pen-needles", 9000}}},
        {2500, {{"glucose-strips", 1, "lancets", 9000}}},
        {7500, {{"atorvastatin-20", 25}, {"atorvastatin-40", 10}}},
        {4000, {{"ramipril-5", 10}, {"ramipril-10", 5}, {"lisinopril-10", 5}}}}},
      {"coronary heart disease or stroke", {0, 20, 150, 450, 900, 1600, 2200}, 75, 130,
       {{8500, {{"atorvastatin-20", 10}, {"atorvastatin-40", 10}, {"atorvastatin-80", 20},
                {"simvastatin-40", 5}, {"rosuvastatin-10", 5}}},
        {8000, {{"aspirin-75", 20, "lansoprazole-15", 2500},
                {"aspirin-75-gr", 5},
                {"clopidogrel", 15, "lansoprazole-15", 2500}}},
        {5000, {{"bisoprolol-2.5", 10}, {"bisoprolol-5", 10}, {"atenolol", 3}}},
        {5000, {{"ramipril-2.5", 5}, {"ramipril-5", 10}, {"ramipril-10", 10}}},
        {2000, {{"isosorbide-mr", 1}}},
        {2500, {{"gtn-spray", 1}}}}},
      {"atrial fibrillation", {0, 10, 50, 150, 400, 900, 1600}, 85, 120,
       {{8500, {{"apixaban-5", 25}, {"apixaban-2.5", 8}, {"edoxaban", 12}, {"rivaroxaban", 8},
                {"warfarin-1", 8, "warfarin-3", 6000}}},
        {7000, {{"bisoprolol-2.5", 10}, {"bisoprolol-5", 15}, {"digoxin", 5}}},
        {500, {{"amiodarone", 1}}}}},
      {"heart failure", {0, 5, 30, 100, 250, 500, 1000}, 85, 120,
       {{8500, {{"furosemide-40", 15}, {"furosemide-20", 8}, {"co-amilofruse", 5}}},
        {7000, {{"ramipril-2.5", 10}, {"ramipril-5", 5}, {"candesartan-8", 5}}},
        {7500, {{"bisoprolol-2.5", 15}, {"bisoprolol-5", 5}}},
        {4500, {{"spironolactone", 1}}},
        {3000, {{"dapagliflozin", 1}}}}},
      {"COPD", {0, 20, 150, 400, 700, 1000, 1000}, 95, 105,
       {{9000, {{"salbutamol", 1, "spacer", 1500}}},
        {6000, {{"tiotropium", 1}}},
        {5000, {{"budesonide-formoterol", 1}}},
        {1500, {{"carbocisteine", 1}}}},
       {{"prednisolone", 6000}, {"doxycycline", 3000}, {"amoxicillin", 2000}}},
      {"asthma", {700, 700, 650, 600, 600, 600, 550}, 110, 90,
       {{9000, {{"salbutamol", 1, "spacer", 2500}}},
        {6000, {{"beclometasone-inh", 3}, {"budesonide-formoterol", 1}}},
        {1200, {{"montelukast", 1}}}},
       {{"prednisolone", 2500}}},
      {"depression", {100, 900, 1100, 1000, 900, 800, 800}, 130, 70,
       {{8500, {{"sertraline-50", 25}, {"sertraline-100", 10}, {"citalopram", 20},
                {"fluoxetine", 12}, {"mirtazapine-15", 8}, {"mirtazapine-30", 4},
                {"paroxetine", 3}, {"venlafaxine", 6}, {"duloxetine", 4},
                {"amitriptyline-25", 2}}},
        {800, {{"mirtazapine-15", 1}}},
        {500, {{"trazodone", 1}}}}},
      {"chronic pain", {20, 300, 700, 1200, 1600, 2000, 2600}, 115, 85,
       {{5000, {{"paracetamol-prn", 10}, {"paracetamol-regular", 4}}},
        {4500, {{"co-codamol-30-prn", 20}, {"co-codamol-30-regular", 8}, {"co-codamol-8", 6},
                {"co-dydramol", 8}, {"codeine", 6}, {"tramadol", 10}, {"tramadol-mr", 4}}},
        {700, {{"morphine-mr", 6, "morphine-solution", 4000}, {"oxycodone-mr", 3},
               {"fentanyl-patch", 3}, {"buprenorphine-patch", 6}}},
        {1300, {{"naproxen-250", 10, "omeprazole-20", 6000},
                {"diclofenac", 4, "omeprazole-20", 6000}}},
        {2200, {{"gabapentin", 10}, {"pregabalin-75", 8}, {"pregabalin-150", 4},
                {"amitriptyline-10", 12}, {"duloxetine", 3}}},
        {1800, {{"senna", 10}, {"lactulose", 8}, {"macrogol", 6}}},
        {300, {{"baclofen", 1}}},
        {1500, {{"zopiclone-7.5", 6}, {"zopiclone-3.75", 4}, {"diazepam-2", 3}, {"diazepam-5", 2}, {"temazepam", 2}}}}},
      {"overactive bladder", {0, 50, 150, 300, 500, 800, 1200}, 140, 60,
       {{7500, {{"oxybutynin", 15}, {"solifenacin", 20}, {"tolterodine", 10}}},
        {2000, {{"mirabegron", 1}}}}},
      {"benign prostatic hyperplasia", {0, 0, 100, 400, 1000, 1800, 2500}, 0, 100,
       {{7500, {{"tamsulosin", 1}}}, {3500, {{"finasteride", 1}}}}},
      {"dementia", {0, 0, 0, 30, 150, 600, 2000}, 110, 90,
       {{8000, {{"donepezil-10", 50}, {"donepezil-5", 15}, {"rivastigmine-patch", 10},
                {"memantine", 25}}},
        {2000, {{"memantine", 1}}},
        {1200, {{"risperidone-0.5", 10}, {"quetiapine-25", 8}}},
        {2000, {{"mirtazapine-15", 10}, {"sertraline-50", 10}, {"citalopram", 5}}}}},
      {"Parkinson's disease", {0, 0, 5, 30, 100, 250, 400}, 80, 120,
       {{9500, {{"co-careldopa", 1}}},
        {3000, {{"ropinirole", 1}}},
        {3000, {{"lactulose", 10}, {"macrogol", 5}}}}},
      {"insomnia or anxiety", {50, 400, 500, 500, 500, 600, 800}, 130, 70,
       {{4000, {{"zopiclone-7.5", 10}, {"zopiclone-3.75", 8}, {"temazepam", 2}}},
        {2500, {{"diazepam-2", 10}, {"diazepam-5", 3}}},
        {1500, {{"propranolol", 1}}},
        {800, {{"promethazine", 5}, {"hydroxyzine", 3}}}}},
      {"severe mental illness", {10, 100, 120, 120, 100, 80, 60}, 100, 100,
       {{9000, {{"olanzapine", 20}, {"quetiapine-100", 15}, {"aripiprazole", 15},
                {"risperidone-1", 10}}},
        {1200, {{"procyclidine", 1}}},
        {1500, {{"zopiclone-7.5", 1}}},
        {800, {{"lithium", 1}}}}},
      {"hypothyroidism", {20, 150, 300, 500, 700, 900, 1000}, 170, 30,
       {{9500, {{"levothyroxine-50", 10}, {"levothyroxine-100", 12}}}}},
      {"gastro-oesophageal reflux", {50, 400, 800, 1200, 1600, 2000, 2400}, 100, 100,
       {{9000, {{"omeprazole-20", 30}, {"omeprazole-40", 5}, {"lansoprazole-30", 15},
                {"lansoprazole-15", 5}}}}},
      {"allergic rhinitis or urticaria", {400, 500, 400, 350, 300, 250, 200}, 110, 90,
       {{8000, {{"cetirizine", 30}, {"loratadine", 20}, {"chlorphenamine", 10},
                {"hydroxyzine", 3}}},
        {3000, {{"beclometasone-nasal", 1}}}}},
      {"osteoporosis", {0, 0, 0, 80, 250, 600, 1000}, 170, 30,
       {{8000, {{"alendronic-acid", 1}}}, {8500, {{"calcium-vitamin-d", 1}}}}},
      {"constipation", {50, 100, 100, 200, 300, 600, 1200}, 120, 80,
       {{9000, {{"lactulose", 10}, {"senna", 12}, {"macrogol", 10}}}}},
      {"epilepsy", {50, 80, 80, 80, 80, 80, 80}, 100, 100,
       {{9500, {{"lamotrigine", 10}, {"levetiracetam", 10}, {"valproate", 6},
                {"carbamazepine", 6}}}}},
      {"gout", {0, 50, 200, 300, 400, 500, 500}, 40, 160,
       {{8500, {{"allopurinol-100", 10}, {"allopurinol-300", 10}}},
        {3000, {{"colchicine", 1}}}}},
      {"glaucoma", {0, 10, 50, 150, 300, 600, 900}, 100, 100,
       {{9500, {{"latanoprost", 1}}}}},
      {"raised cardiovascular risk", {0, 50, 600, 1200, 1800, 2000, 1500}, 90, 110,
       {{10000, {{"atorvastatin-20", 25}, {"simvastatin-40", 5}, {"rosuvastatin-10", 3}}}}},
      {"anaemia or B12 deficiency", {30, 100, 100, 100, 150, 200, 400}, 150, 60,
       {{9000, {{"ferrous-sulfate", 10}, {"folic-acid", 8}, {"hydroxocobalamin", 3}}}}},
      {"leg ulcer or wound", {0, 0, 10, 30, 80, 200, 500}, 110, 90,
       {{9000, {{"foam-dressing", 10, "gauze-swabs", 4000}, {"dressing-pad", 6}}},
        {5000, {{"stockings", 1}}}}},
      {"long-term urinary catheter", {0, 0, 0, 5, 20, 60, 160}, 70, 130,
       {{10000, {{"leg-bags", 1}}}}},
      {"irritable bowel syndrome", {20, 300, 250, 200, 150, 100, 80}, 150, 50,
       {{8000, {{"mebeverine", 1}}}, {1500, {{"loperamide", 1}}}}},
      {"inflammatory arthritis", {5, 40, 80, 120, 150, 150, 120}, 150, 50,
       {{7000, {{"methotrexate", 1, "folic-acid-weekly", 9500}}},
        {2500, {{"naproxen-250", 1, "omeprazole-20", 6000}}}}},
  };
}

// Short courses per 10,000 patients a year by age band: rounded, from memory, in the
// range of English primary-care prescribing (antibiotics most common in the old and the
// young).
std::vector<CareCourse> BuildCourses() {
  return {
      {"amoxicillin", {1500, 1200, 1300, 1400, 1600, 1900, 2400}, 100, 100},
      {"flucloxacillin", {300, 300, 350, 400, 450, 550, 700}, 100, 100},
      {"clarithromycin", {150, 250, 300, 320, 350, 400, 450}, 100, 100},
      {"doxycycline", {50, 400, 450, 500, 600, 700, 800}, 100, 100},
      {"phenoxymethylpenicillin", {900, 500, 300, 250, 200, 200, 200}, 100, 100},
      {"co-amoxiclav", {150, 200, 250, 300, 350, 450, 600}, 100, 100},
      {"nitrofurantoin", {150, 700, 450, 450, 500, 700, 1000}, 180, 20},
      {"trimethoprim", {100, 300, 250, 250, 300, 450, 700}, 170, 30},
      {"cefalexin", {100, 150, 150, 150, 200, 300, 450}, 100, 100},
      {"fluconazole", {0, 500, 300, 150, 80, 60, 40}, 190, 10},
      {"naproxen-500", {50, 700, 900, 900, 700, 400, 200}, 100, 100},
      {"ibuprofen-400", {300, 900, 800, 700, 500, 300, 150}, 100, 100},
      {"ibuprofen-gel", {50, 200, 300, 400, 450, 450, 400}, 100, 100},
      {"prednisolone", {150, 250, 300, 400, 500, 650, 750}, 100, 100},
      {"hydrocortisone-cream", {500, 300, 250, 250, 250, 300, 400}, 100, 100},
      {"clotrimazole-cream", {300, 300, 250, 250, 250, 300, 350}, 100, 100},
      {"fusidic-acid-cream", {300, 150, 150, 150, 150, 200, 250}, 100, 100},
  };
}

size_t AgeBand(int age) {
  size_t band = 0;
  for (size_t i = 0; i < kCareAgeBandStarts.size(); ++i) {
    if (age >= kCareAgeBandStarts[i]) band = i;
  }
  return band;
}

// A latent "how unwell" factor shared by all conditions, so that conditions cluster in
// the same patients the way multimorbidity does.
int DrawFrailty(int age, SynthRandom& random) {
  static constexpr int kValues[] = {60, 120, 200, 330};
  static constexpr int kYounger[] = {54, 28, 12, 6};
  static constexpr int kOlder[] = {34, 30, 22, 14};
  const std::span<const int> weights =
      age < 50 ? std::span<const int>(kYounger) : std::span<const int>(kOlder);
  return kValues[random.PickWeighted(weights)];
}

int Scaled(int per_10000, int sex_percent, int frailty_percent, int cap) {
  const long value = static_cast<long>(per_10000) * sex_percent / 100 * frailty_percent / 100;
  return static_cast<int>(std::min<long>(value, cap));
}

// Medicines of one group that prescribers rarely give together: a second one through
// another condition is usually the same treatment (one renin-angiotensin blocker for
// hypertension and heart failure, one PPI). The second is kept with this chance per
// 10,000 so that the duplications the combination rules look for occur at plausible
// rates (rounded, from memory; see docs/synthetic-data.md).
struct TherapeuticGroup {
  std::vector<std::string_view> medicines;  // CatalogueProduct::medicine names
  int keep_second_per_10000;
};

const std::vector<TherapeuticGroup>& TherapeuticGroups() {
  static const std::vector<TherapeuticGroup> kGroups = {
      {{"ramipril", "lisinopril", "perindopril", "losartan", "candesartan"}, 300},
      {{"omeprazole", "lansoprazole"}, 300},
      {{"paracetamol", "co-codamol", "co-dydramol"}, 1000},
  };
  return kGroups;
}

const TherapeuticGroup* GroupOf(std::string_view medicine) {
  for (const TherapeuticGroup& group : TherapeuticGroups()) {
    if (std::find(group.medicines.begin(), group.medicines.end(), medicine) != group.medicines.end()) return &group;
  }
  return nullptr;
}

// Where guidance prefers one treatment without another, a patient planned both keeps the
// second only with this chance per 10,000: an anticoagulant alone in atrial fibrillation
// with stable coronary disease; no bladder antimuscarinic or tricyclic with a
// cholinesterase inhibitor. Rounded, from memory, so that these combinations occur at
// plausible rates rather than whenever two conditions meet (docs/synthetic-data.md).
struct Displacement {
  std::vector<std::string_view> preferred;  // CatalogueProduct::medicine names
  std::vector<std::string_view> displaced;
  int keep_displaced_per_10000;
};

const std::vector<Displacement>& Displacements() {
  static const std::vector<Displacement> kDisplacements = {
      {{"apixaban", "edoxaban", "rivaroxaban", "warfarin"}, {"aspirin", "clopidogrel"}, 2500},
      {{"donepezil", "rivastigmine"}, {"oxybutynin", "solifenacin", "tolterodine", "amitriptyline", "paroxetine"},
       2500},
  };
  return kDisplacements;
}

bool Names(const std::vector<std::string_view>& names, const PlannedMedicine& planned) {
  const std::string_view medicine = SynthCatalogue()[planned.product].medicine;
  return std::find(names.begin(), names.end(), medicine) != names.end();
}

void ApplyDisplacements(SynthRandom& random, CarePlan& plan) {
  for (const Displacement& rule : Displacements()) {
    const bool preferred = std::any_of(plan.medicines.begin(), plan.medicines.end(),
                                       [&](const PlannedMedicine& p) { return Names(rule.preferred, p); });
    if (!preferred) continue;
    std::erase_if(plan.medicines, [&](const PlannedMedicine& p) {
      return Names(rule.displaced, p) && !random.Chance(rule.keep_displaced_per_10000);
    });
  }
}

class PlanBuilder {
 public:
  PlanBuilder(int window_days, SynthRandom& random, CarePlan& plan)
      : window_days_(window_days), random_(random), plan_(plan) {}

  // Adds the product with this catalogue key unless the patient already has that medicine.
  void Add(std::string_view key, size_t condition) {
    const std::optional<size_t> index = FindCatalogueProduct(key);
    if (!index) return;
    const CatalogueProduct& product = SynthCatalogue()[*index];
    if (std::find(medicines_.begin(), medicines_.end(), product.medicine) != medicines_.end()) {
      return;
    }
    if (const TherapeuticGroup* group = GroupOf(product.medicine)) {
      const bool has_one = std::any_of(medicines_.begin(), medicines_.end(), [&](std::string_view held) {
        return GroupOf(held) == group;
      });
      if (has_one && !random_.Chance(group->keep_second_per_10000)) return;
    }
    medicines_.push_back(product.medicine);
    PlannedMedicine planned;
    planned.product = *index;
    planned.condition = condition;
    planned.quantity = product.quantity * Multiplier(product);
    planned.starts_in_window = random_.Chance(std::min(5000, 800 * window_days_ / 365));
    plan_.medicines.push_back(planned);
  }

  void AddStep(const CareStep& step, size_t condition) {
    std::vector<int> weights;
    for (const CareOption& option : step.options) weights.push_back(option.weight);
    const CareOption& option = step.options[random_.PickWeighted(weights)];
    Add(option.product, condition);
    if (!option.companion.empty() && random_.Chance(option.companion_per_10000)) {
      Add(option.companion, condition);
    }
  }

 private:
  // Most repeats are for 28 days; some practices issue two or three months at a time.
  int Multiplier(const CatalogueProduct& product) {
    if (product.use != CatalogueUse::kRegular || product.controlled) return 1;
    const std::optional<int> days = DaysCovered(product, product.quantity);
    if (!days || *days > 31) return 1;
    const uint32_t draw = random_.Below(100);
    return draw < 82 ? 1 : draw < 96 ? 2 : 3;
  }

  int window_days_;
  SynthRandom& random_;
  CarePlan& plan_;
  std::vector<std::string_view> medicines_;
};

void PlanCourses(size_t band, bool female, int window_days, SynthRandom& random,
                 CarePlan& plan) {
  std::vector<std::string_view> products;
  std::vector<int> rates;
  for (const CareCourse& course : SynthCourses()) {
    products.push_back(course.product);
    rates.push_back(Scaled(course.per_10000_year[band],
                           female ? course.female_percent : course.male_percent,
                           (plan.frailty_percent + 100) / 2, 1000000));
  }
  for (const size_t condition : plan.conditions) {
    for (const CareExtraCourse& extra : SynthConditions()[condition].extra_courses) {
      products.push_back(extra.product);
      rates.push_back(extra.per_10000_year);
    }
  }
  int total = 0;
  for (const int rate : rates) total += rate;
  if (total <= 0) return;
  // One draw per 30-day block: at most one course a block, which these rates allow.
  for (int block_start = 0; block_start < window_days; block_start += 30) {
    const int block_days = std::min(30, window_days - block_start);
    if (!random.Chance(total * block_days / 365)) continue;
    const std::optional<size_t> index = FindCatalogueProduct(products[random.PickWeighted(rates)]);
    if (!index) continue;
    plan.courses.push_back({*index, block_start + random.Between(0, block_days - 1)});
  }
}

}  // namespace

const std::vector<CareCondition>& SynthConditions() {
  static const std::vector<CareCondition> kConditions = BuildConditions();
  return kConditions;
}

const std::vector<CareCourse>& SynthCourses() {
  static const std::vector<CareCourse> kCourses = BuildCourses();
  return kCourses;
}

CarePlan PlanCare(int age, bool female, int window_days, SynthRandom& random) {
  CarePlan plan;
  plan.frailty_percent = DrawFrailty(age, random);
  const size_t band = AgeBand(age);
  PlanBuilder builder(window_days, random, plan);
  const std::vector<CareCondition>& conditions = SynthConditions();
  for (size_t c = 0; c < conditions.size(); ++c) {
    const CareCondition& condition = conditions[c];
    const int sex_percent = female ? condition.female_percent : condition.male_percent;
    if (!random.Chance(Scaled(condition.per_10000[band], sex_percent, plan.frailty_percent,
                              9500))) {
      continue;
    }
    plan.conditions.push_back(c);
    bool any = false;
    for (const CareStep& step : condition.steps) {
      if (!random.Chance(step.per_10000)) continue;
      builder.AddStep(step, c);
      any = true;
    }
    if (!any) builder.AddStep(condition.steps.front(), c);
  }
  ApplyDisplacements(random, plan);
  PlanCourses(band, female, window_days, random, plan);
  return plan;
}

}  // namespace medload
