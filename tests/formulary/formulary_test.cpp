#include "medload/formulary/formulary.h"
#include "medload/formulary/resolver.h"

#include <doctest/doctest.h>

#include <algorithm>
#include <sstream>
#include <string>
#include <vector>

#include "formulary/formulary_fixture.h"

namespace medload {
namespace {

using testing::BundledFormulary;

std::vector<std::string> Split(const std::string& list) {
  std::vector<std::string> names;
  std::stringstream in(list);
  std::string name;
  while (std::getline(in, name, ',')) {
    while (!name.empty() && name.front() == ' ') name.erase(name.begin());
    names.push_back(name);
  }
  return names;
}

// Every name on the published list is on the scale with that score (names may be US
// names: they resolve through synonyms).
void CheckScale(const std::string& scale, int score, const std::string& list) {
  for (const std::string& name : Split(list)) {
    CAPTURE(name);
    REQUIRE(BundledFormulary().FindIngredient(name) != nullptr);
    CHECK(BundledFormulary().ScoreOn(scale, name) == score);
  }
}

TEST_SUITE("formulary/formulary") {

TEST_CASE("the ACB table holds every published score-3 entry with score 3") {
  // Source: Boustani et al. 2008 Aging Health 4(3):311-320, 2012 update (Campbell et al.
  // JAGS 2013); list as in shared/spec/references.md.
  CheckScale("acb", 3,
             "amitriptyline, amoxapine, atropine, benztropine, brompheniramine, carbinoxamine, chlorpheniramine, "
             "chlorpromazine, clemastine, clomipramine, clozapine, darifenacin, desipramine, dicyclomine, "
             "dimenhydrinate, diphenhydramine, doxepin, doxylamine, fesoterodine, flavoxate, hydroxyzine, "
             "hyoscyamine, imipramine, meclizine, nortriptyline, olanzapine, orphenadrine, oxybutynin, paroxetine, "
             "perphenazine, procyclidine, promazine, promethazine, propantheline, propiverine, pyrilamine, "
             "quetiapine, scopolamine, solifenacin, thioridazine, tolterodine, trifluoperazine, trihexyphenidyl, "
             "trimipramine, trospium");
  // Source: Boustani et al. 2008 ACB scale (from memory).
  CHECK(BundledFormulary().ScoreOn("acb", "methocarbamol") == 3);
}

TEST_CASE("the ACB table holds every published score-2 entry with score 2") {
  // Source: Boustani et al. 2008 Aging Health 4(3):311-320, 2012 update.
  CheckScale("acb", 2,
             "amantadine, belladonna alkaloids, carbamazepine, cyclobenzaprine, cyproheptadine, loxapine, "
             "meperidine, methotrimeprazine, molindone, nefopam, oxcarbazepine, pimozide");
}

TEST_CASE("the ACB table holds every published score-1 entry with score 1") {
  // Source: Boustani et al. 2008 Aging Health 4(3):311-320, 2012 update. "isosorbide" is
  // listed without its ester: both nitrates carry it.
  CheckScale("acb", 1,
             "alimemazine, alprazolam, alverine, aripiprazole, asenapine, atenolol, bupropion, captopril, "
             "cetirizine, chlorthalidone, cimetidine, clidinium, clorazepate, codeine, colchicine, desloratadine, "
             "diazepam, digoxin, dipyridamole, disopyramide, fentanyl, fluvoxamine, furosemide, haloperidol, "
             "hydralazine, hydrocortisone, iloperidone, isosorbide mononitrate, isosorbide dinitrate, "
             "levocetirizine, loperamide, loratadine, metoprolol, morphine, nifedipine, paliperidone, prednisone, "
             "quinidine, ranitidine, risperidone, theophylline, trazodone, triamterene, venlafaxine, warfarin");
}

TEST_CASE("the ACB table lists nothing beyond the published scale") {
  // Source: Boustani et al. 2008: 45 entries at 3 (plus methocarbamol), 12 at 2, 44 at 1
  // (isosorbide counted once).
  const auto& scales = BundledFormulary().tables().scales;
  const auto acb = std::find_if(scales.begin(), scales.end(), [](const Scale& s) { return s.name == "acb"; });
  REQUIRE(acb != scales.end());
  CHECK(acb->rows.size() == 46 + 12 + 45);
}

TEST_CASE("the ARS table holds every published entry with its score") {
  // Source: Rudolph et al. 2008 Arch Intern Med 168(5):508-513.
  CheckScale("ars", 3,
             "amitriptyline, atropine, benztropine, carisoprodol, chlorpheniramine, chlorpromazine, cyproheptadine, "
             "dicyclomine, diphenhydramine, fluphenazine, hydroxyzine, hyoscyamine, imipramine, meclizine, "
             "oxybutynin, perphenazine, promethazine, thioridazine, thiothixene, tizanidine, trifluoperazine");
  CheckScale("ars", 2,
             "amantadine, baclofen, cetirizine, cimetidine, clozapine, cyclobenzaprine, desipramine, loperamide, "
             "loratadine, nortriptyline, olanzapine, prochlorperazine, triprolidine, tolterodine");
  // carbidopa-levodopa is scored on levodopa.
  CheckScale("ars", 1,
             "levodopa, entacapone, haloperidol, methocarbamol, metoclopramide, mirtazapine, paroxetine, "
             "pramipexole, quetiapine, ranitidine, risperidone, selegiline, trazodone, ziprasidone");
}

TEST_CASE("the ARS scores the pseudoephedrine-triprolidine combination on triprolidine, not plain pseudoephedrine") {
  // Source: Rudolph et al. 2008 Arch Intern Med 168(5):508-513, Table 1: the 2-point entry
  // is the pseudoephedrine-triprolidine combination (from memory; references.md lists it
  // under its first name). Triprolidine is the antihistamine that carries the effect.
  const Formulary& f = BundledFormulary();
  CHECK(f.ScoreOn("ars", "triprolidine") == 2);
  CHECK_FALSE(f.ScoreOn("ars", "pseudoephedrine").has_value());
  CHECK_FALSE(f.ScoreOn("acb", "pseudoephedrine").has_value());
}

TEST_CASE("a levonorgestrel intrauterine system is a medicine and a copper intrauterine device is not") {
  // A levonorgestrel intrauterine system is a licensed medicine (its dm+d name reads
  // "... intrauterine device", from memory); copper devices are appliances (common
  // practice). Route: other (intrauterine).
  struct Case {
    const char* description;
    bool medicine;
  };
  const std::vector<Case> cases = {
      {"Levonorgestrel 20micrograms/24hours intrauterine device", true},
      {"Levonorgestrel 52mg intrauterine system", true},
      {"Mirena 20micrograms/24hours intrauterine system", true},
      {"Jaydess 13.5mg intrauterine delivery system", true},
      {"T-Safe 380A QL intrauterine device", false},
      {"Nova-T 380 intrauterine device", false},
      {"Copper intrauterine device", false},
  };
  for (const Case& c : cases) {
    const std::string description = c.description;
    CAPTURE(description);
    const ResolvedProduct product = Resolve(BundledFormulary(), description, "", "");
    CHECK(product.is_medicine() == c.medicine);
    CHECK(product.non_medicine == !c.medicine);
    if (c.medicine) {
      REQUIRE(product.ingredients.size() == 1);
      CHECK(product.ingredients[0].ingredient == "levonorgestrel");
      CHECK(product.route == Route::kOther);
    }
  }
  // Levonorgestrel tablets stay oral.
  CHECK(Resolve(BundledFormulary(), "Levonorgestrel 1.5mg tablets", "", "").route == Route::kOral);
}

TEST_CASE("the two scales disagree where the publications disagree") {
  // Source: Boustani et al. 2008 and Rudolph et al. 2008 (references.md, discriminating).
  const Formulary& f = BundledFormulary();
  CHECK(f.ScoreOn("acb", "paroxetine") == 3);
  CHECK(f.ScoreOn("ars", "paroxetine") == 1);
  CHECK(f.ScoreOn("acb", "quetiapine") == 3);
  CHECK(f.ScoreOn("ars", "quetiapine") == 1);
  CHECK(f.ScoreOn("acb", "cetirizine") == 1);
  CHECK(f.ScoreOn("ars", "cetirizine") == 2);
  CHECK(f.ScoreOn("acb", "cyproheptadine") == 2);
  CHECK(f.ScoreOn("ars", "cyproheptadine") == 3);
  CHECK_FALSE(f.ScoreOn("acb", "baclofen").has_value());
  CHECK(f.ScoreOn("ars", "baclofen") == 2);
}

TEST_CASE("the scale names are the files found in anticholinergic/") {
  CHECK(BundledFormulary().ScaleNames() == std::vector<std::string>{"acb", "ars"});
  CHECK(BundledFormulary().HasScale("acb"));
  CHECK_FALSE(BundledFormulary().HasScale("nope"));
  CHECK_FALSE(BundledFormulary().ScoreOn("nope", "amitriptyline").has_value());
}

TEST_CASE("every ingredient named by a scale, dbi.csv, products or rules is in ingredients.csv") {
  const Formulary& f = BundledFormulary();
  for (const Scale& scale : f.tables().scales) {
    for (const ScaleRow& row : scale.rows) {
      CAPTURE(row.ingredient);
      CHECK(f.FindIngredient(row.ingredient) != nullptr);
    }
  }
  for (const DbiDose& row : f.tables().dbi) CHECK(f.FindIngredient(row.ingredient) != nullptr);
  for (const NamedProduct& product : f.tables().products) {
    for (const std::string& name : product.ingredients) CHECK(f.FindIngredient(name) != nullptr);
  }
}

TEST_CASE("the Drug Burden Index dose of diazepam follows Hilmer et al. 2007") {
  // Source: Hilmer et al. 2007 Arch Intern Med 167(8):781-787 (diazepam delta 4 mg).
  const DbiDose* diazepam = BundledFormulary().DbiOf("diazepam");
  REQUIRE(diazepam != nullptr);
  CHECK(diazepam->min_daily_dose_mg == 4);
  CHECK(diazepam->effect == DbiEffect::kSedative);
  // A dose equal to delta contributes 0.5 (Hilmer et al. 2007: D/(D+delta)).
  CHECK(4 / (4 + diazepam->min_daily_dose_mg) == doctest::Approx(0.5));
  const DbiDose* by_synonym = BundledFormulary().DbiOf("chlorpheniramine");
  REQUIRE(by_synonym != nullptr);
  CHECK(by_synonym->ingredient == "chlorphenamine");
}

TEST_CASE("ingredients are found by any name, without case, accents or punctuation") {
  const Formulary& f = BundledFormulary();
  for (const char* name : {"chlorphenamine", "Chlorpheniramine", "CHLORPHENIRAMINE", "chlorphénamine",
                           " chlorphenamine "}) {
    const std::string text = name;
    CAPTURE(text);
    const Ingredient* ingredient = f.FindIngredient(text);
    REQUIRE(ingredient != nullptr);
    CHECK(ingredient->name == "chlorphenamine");
  }
  CHECK(f.FindIngredient("omega 3 acid ethyl esters") == f.FindIngredient("omega-3-acid ethyl esters"));
  CHECK(f.FindIngredient("unobtainium") == nullptr);
  REQUIRE(f.FindByAtc("n06aa09") != nullptr);
  CHECK(f.FindByAtc("n06aa09")->name == "amitriptyline");
}

// System URIs as FHIR R4 names them (terminologies page); the dm+d URI from memory.
TEST_CASE("code systems compare without case, spaces or punctuation, and their FHIR URIs read as their names") {
  struct Case {
    const char* system;
    const char* key;
  };
  const Case cases[] = {
      {"ATC", "atc"},
      {"http://www.whocc.no/atc", "atc"},
      {"https://www.whocc.no/atc/", "atc"},
      {"WHO ATC", "atc"},
      {"dm+d", "dmd"},
      {"DMD", "dmd"},
      {"https://dmd.nhs.uk", "dmd"},
      {"http://dmd.nhs.uk/", "dmd"},
      {"RxNorm", "rxnorm"},
      {"http://www.nlm.nih.gov/research/umls/rxnorm", "rxnorm"},
      {"SNOMED CT", "snomedct"},
      {"http://snomed.info/sct", "httpsnomedinfosct"},
      {"Local-List 2", "locallist2"},
      {"", ""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.system);
    CHECK(CodeSystemKey(c.system) == c.key);
  }
}

TEST_CASE("classes answer by any name and list their members") {
  const Formulary& f = BundledFormulary();
  CHECK(f.HasClass("frusemide", "loop-diuretic"));
  CHECK_FALSE(f.HasClass("furosemide", "nsaid"));
  CHECK(f.IsKnownClass("cns-active"));
  CHECK_FALSE(f.IsKnownClass("nsaids"));
  CHECK(f.ClassesOf("unobtainium").empty());
  const auto gabapentinoids = f.IngredientsInClass("gabapentinoid");
  CHECK(gabapentinoids == std::vector<std::string>{"pregabalin", "gabapentin"});
}

TEST_CASE("CNS-active follows the 2023 AGS Beers Criteria groups") {
  // Source: 2023 AGS Beers Criteria Update Expert Panel, J Am Geriatr Soc 2023;71:2052
  // (antiepileptics incl. gabapentinoids, TCAs, SSRIs, SNRIs, antipsychotics,
  // benzodiazepines, Z-drugs, opioids, skeletal muscle relaxants); the skeletal muscle
  // relaxants it names: carisoprodol, chlorzoxazone, cyclobenzaprine, metaxalone,
  // methocarbamol, orphenadrine (from memory; chlorzoxazone and metaxalone are not in
  // the table).
  const Formulary& f = BundledFormulary();
  for (const char* name : {"gabapentin", "pregabalin", "levetiracetam", "amitriptyline", "sertraline",
                           "duloxetine", "quetiapine", "diazepam", "zopiclone", "codeine", "tramadol",
                           "carisoprodol", "cyclobenzaprine", "methocarbamol", "orphenadrine"}) {
    const std::string text = name;
    CAPTURE(text);
    CHECK(f.HasClass(text, "cns-active"));
  }
  CHECK_FALSE(f.HasClass("paracetamol", "cns-active"));
  CHECK_FALSE(f.HasClass("amlodipine", "cns-active"));
}

TEST_CASE("muscle relaxants the Beers list does not name are a class of their own, not CNS-active") {
  // Source: 2023 AGS Beers Criteria (skeletal muscle relaxants named: see above; from
  // memory): baclofen, tizanidine and dantrolene are not among them.
  const Formulary& f = BundledFormulary();
  for (const char* name : {"baclofen", "tizanidine", "dantrolene"}) {
    const std::string text = name;
    CAPTURE(text);
    CHECK_FALSE(f.HasClass(text, "cns-active"));
    CHECK(f.HasClass(text, "cns-active-extension"));
  }
  CHECK(f.IngredientsInClass("cns-active-extension").size() == 3);
}

TEST_CASE("the checksum changes when any table changes") {
  testing::TempFolder folder;
  testing::WriteMinimalFormulary(folder);
  auto first = LoadFormulary(folder.path());
  REQUIRE(first.ok());
  CHECK(first->checksum().size() == 64);
  auto same = LoadFormulary(folder.path());
  REQUIRE(same.ok());
  CHECK(same->checksum() == first->checksum());
  folder.Write("dbi.csv", "ingredient,min_daily_dose_mg,effect,source\nchlorphenamine,6,both,test\n");
  auto changed = LoadFormulary(folder.path());
  REQUIRE(changed.ok());
  CHECK(changed->checksum() != first->checksum());
}

TEST_CASE("a user adds a scale by adding a file") {
  testing::TempFolder folder;
  testing::WriteMinimalFormulary(folder);
  folder.Write("anticholinergic/local.csv", "ingredient,score,source\nibuprofen,1,local decision\n");
  auto loaded = LoadFormulary(folder.path());
  REQUIRE(loaded.ok());
  CHECK(loaded->ScaleNames() == std::vector<std::string>{"acb", "local"});
  CHECK(loaded->ScoreOn("local", "ibuprofen") == 1);
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
