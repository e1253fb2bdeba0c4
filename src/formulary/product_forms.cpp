// Form words as dispensing descriptions write them (common practice), with the dose-form
// names of the national dictionaries.
#include "formulary/product_forms.h"

#include <iterator>

namespace medload::formulary_internal {
namespace {

// Form words as dispensing descriptions write them. Longest match wins.
constexpr FormWords kForms[] = {
    {"tablet", "tablet", Route::kOral, "tablet"},
    {"caplet", "tablet", Route::kOral, "tablet"},
    {"modified release tablet", "modified-release tablet", Route::kOral, "tablet"},
    {"prolonged release tablet", "modified-release tablet", Route::kOral, "tablet"},
    {"gastro resistant tablet", "gastro-resistant tablet", Route::kOral, "tablet"},
    {"dispersible tablet", "dispersible tablet", Route::kOral, "tablet"},
    {"soluble tablet", "soluble tablet", Route::kOral, "tablet"},
    {"effervescent tablet", "effervescent tablet", Route::kOral, "tablet"},
    {"chewable tablet", "chewable tablet", Route::kOral, "tablet"},
    {"orodispersible tablet", "orodispersible tablet", Route::kOral, "tablet"},
    {"orodispersible film", "orodispersible film", Route::kOral, "film"},
    {"sublingual tablet", "sublingual tablet", Route::kSublingualBuccal, "tablet"},
    {"sublingual spray", "sublingual spray", Route::kSublingualBuccal, "dose"},
    {"buccal tablet", "buccal tablet", Route::kSublingualBuccal, "tablet"},
    {"buccal film", "buccal film", Route::kSublingualBuccal, "film"},
    {"oromucosal solution", "oromucosal solution", Route::kSublingualBuccal, "ml"},
    {"oromucosal spray", "oromucosal spray", Route::kSublingualBuccal, "dose"},
    {"mouthspray", "oromucosal spray", Route::kSublingualBuccal, "dose"},
    {"chewing gum", "medicated chewing gum", Route::kSublingualBuccal, "piece"},
    {"capsule", "capsule", Route::kOral, "capsule"},
    {"modified release capsule", "modified-release capsule", Route::kOral, "capsule"},
    {"prolonged release capsule", "modified-release capsule", Route::kOral, "capsule"},
    {"gastro resistant capsule", "gastro-resistant capsule", Route::kOral, "capsule"},
    {"oral solution", "oral solution", Route::kOral, "ml"},
    {"oral suspension", "oral suspension", Route::kOral, "ml"},
    {"suspension", "oral suspension", Route::kOral, "ml"},  // longer phrases name the others
    {"oral liquid", "oral solution", Route::kOral, "ml"},
    {"oral drops", "oral drops", Route::kOral, "ml"},
    {"oral emulsion", "oral emulsion", Route::kOral, "ml"},
    {"oral powder", "oral powder", Route::kOral, "sachet"},
    {"oral gel", "oral gel", Route::kOral, "g"},
    {"syrup", "syrup", Route::kOral, "ml"},
    {"elixir", "elixir", Route::kOral, "ml"},
    {"linctus", "linctus", Route::kOral, "ml"},
    {"mixture", "oral solution", Route::kOral, "ml"},
    {"granules", "granules", Route::kOral, "sachet"},
    {"sachet", "sachet", Route::kOral, "sachet"},
    {"lozenge", "lozenge", Route::kOral, "lozenge"},
    {"pastille", "pastille", Route::kOral, "pastille"},
    {"mouthwash", "mouthwash", Route::kOral, "ml"},
    {"cream", "cream", Route::kSkin, "g"},
    {"ointment", "ointment", Route::kSkin, "g"},
    {"gel", "gel", Route::kSkin, "g"},
    {"lotion", "lotion", Route::kSkin, "ml"},
    {"cutaneous solution", "cutaneous solution", Route::kSkin, "ml"},
    {"cutaneous spray", "cutaneous spray", Route::kSkin, "ml"},
    {"cutaneous foam", "cutaneous foam", Route::kSkin, "g"},
    {"cutaneous emulsion", "cutaneous emulsion", Route::kSkin, "ml"},
    {"scalp application", "scalp application", Route::kSkin, "ml"},
    {"shampoo", "shampoo", Route::kSkin, "ml"},
    {"paste", "paste", Route::kSkin, "g"},
    {"emollient", "emollient", Route::kSkin, "g"},
    {"bath additive", "bath additive", Route::kSkin, "ml"},
    {"dusting powder", "dusting powder", Route::kSkin, "g"},
    {"medicated plaster", "medicated plaster", Route::kSkin, "plaster"},
    {"paint", "paint", Route::kSkin, "ml"},
    {"spray", "spray", Route::kUnknown, "dose"},
    {"eye drop", "eye drops", Route::kEye, "ml"},
    {"eye ointment", "eye ointment", Route::kEye, "g"},
    {"eye gel", "eye gel", Route::kEye, "g"},
    {"ear drop", "ear drops", Route::kEar, "ml"},
    {"ear spray", "ear spray", Route::kEar, "ml"},
    {"ear eye drop", "ear/eye drops", Route::kEye, "ml"},
    {"nasal spray", "nasal spray", Route::kNasal, "dose"},
    {"nasal drop", "nasal drops", Route::kNasal, "ml"},
    {"nasal ointment", "nasal ointment", Route::kNasal, "g"},
    {"inhaler", "inhaler", Route::kInhaled, "puff"},
    // Inhaler devices often named in place of the form.
    {"accuhaler", "inhalation powder", Route::kInhaled, "dose"},
    {"easyhaler", "inhalation powder", Route::kInhaled, "dose"},
    {"ellipta", "inhalation powder", Route::kInhaled, "dose"},
    {"evohaler", "inhaler", Route::kInhaled, "puff"},
    {"nexthaler", "inhalation powder", Route::kInhaled, "dose"},
    {"respimat", "inhalation solution", Route::kInhaled, "puff"},
    {"spiromax", "inhalation powder", Route::kInhaled, "dose"},
    {"turbohaler", "inhalation powder", Route::kInhaled, "dose"},
    {"pressurised inhalation", "inhaler", Route::kInhaled, "puff"},
    {"inhalation powder", "inhalation powder", Route::kInhaled, "dose"},
    {"inhalation solution", "inhalation solution", Route::kInhaled, "puff"},
    {"inhalation capsule", "inhalation powder capsule", Route::kInhaled, "capsule"},
    {"inhalation powder capsule", "inhalation powder capsule", Route::kInhaled, "capsule"},
    {"nebuliser solution", "nebuliser liquid", Route::kInhaled, "ml"},
    {"nebuliser liquid", "nebuliser liquid", Route::kInhaled, "ml"},
    {"nebuliser suspension", "nebuliser liquid", Route::kInhaled, "ml"},
    {"nebule", "nebuliser liquid", Route::kInhaled, "ml"},
    {"patch", "patch", Route::kTransdermal, "patch"},
    {"transdermal patch", "patch", Route::kTransdermal, "patch"},
    {"injection", "injection", Route::kInjection, "injection"},
    {"solution for injection", "injection", Route::kInjection, "injection"},
    {"suspension for injection", "injection", Route::kInjection, "injection"},
    {"powder for solution for injection", "injection", Route::kInjection, "injection"},
    {"pre filled pen", "injection", Route::kInjection, "injection"},
    {"prefilled pen", "injection", Route::kInjection, "injection"},
    {"pre filled syringe", "injection", Route::kInjection, "injection"},
    {"prefilled syringe", "injection", Route::kInjection, "injection"},
    {"cartridge", "injection", Route::kInjection, "injection"},
    {"ampoule", "injection", Route::kInjection, "injection"},
    {"implant", "implant", Route::kInjection, "implant"},
    {"suppository", "suppository", Route::kRectal, "suppository"},
    {"enema", "enema", Route::kRectal, "enema"},
    {"rectal foam", "rectal foam", Route::kRectal, "dose"},
    {"rectal ointment", "rectal ointment", Route::kRectal, "g"},
    {"rectal solution", "enema", Route::kRectal, "enema"},
    {"pessary", "pessary", Route::kVaginal, "pessary"},
    {"vaginal cream", "vaginal cream", Route::kVaginal, "g"},
    {"vaginal gel", "vaginal gel", Route::kVaginal, "g"},
    {"vaginal tablet", "vaginal tablet", Route::kVaginal, "tablet"},
    {"vaginal ring", "vaginal ring", Route::kVaginal, "ring"},
    // Names used by US and national dictionaries (RxNorm dose forms, dm+d forms).
    {"extended release tablet", "modified-release tablet", Route::kOral, "tablet"},
    {"extended release capsule", "modified-release capsule", Route::kOral, "capsule"},
    {"delayed release tablet", "gastro-resistant tablet", Route::kOral, "tablet"},
    {"delayed release capsule", "gastro-resistant capsule", Route::kOral, "capsule"},
    {"oral granules", "granules", Route::kOral, "sachet"},
    {"transdermal system", "patch", Route::kTransdermal, "patch"},
    {"ophthalmic solution", "eye drops", Route::kEye, "ml"},
    {"ophthalmic suspension", "eye drops", Route::kEye, "ml"},
    {"ophthalmic ointment", "eye ointment", Route::kEye, "g"},
    {"otic solution", "ear drops", Route::kEar, "ml"},
    {"otic suspension", "ear drops", Route::kEar, "ml"},
    {"injectable solution", "injection", Route::kInjection, "injection"},
    {"injectable suspension", "injection", Route::kInjection, "injection"},
    {"metered dose inhaler", "inhaler", Route::kInhaled, "puff"},
    {"rectal tube", "rectal solution", Route::kRectal, "tube"},
    {"rectal suppository", "suppository", Route::kRectal, "suppository"},
    {"rectal gel", "rectal gel", Route::kRectal, "g"},
    {"vaginal suppository", "pessary", Route::kVaginal, "pessary"},
    {"vaginal insert", "pessary", Route::kVaginal, "pessary"},
    {"topical cream", "cream", Route::kSkin, "g"},
    {"topical solution", "cutaneous solution", Route::kSkin, "ml"},
    {"nebuliser", "nebuliser liquid", Route::kInhaled, "ml"},
    {"inhalation suspension", "nebuliser liquid", Route::kInhaled, "ml"},
    {"handihaler", "inhalation powder capsule", Route::kInhaled, "capsule"},
    {"breezhaler", "inhalation powder capsule", Route::kInhaled, "capsule"},
    {"genuair", "inhalation powder", Route::kInhaled, "dose"},
    {"diskus", "inhalation powder", Route::kInhaled, "dose"},
    {"autohaler", "inhaler", Route::kInhaled, "puff"},
    {"modulite", "inhaler", Route::kInhaled, "puff"},
};

const WordTable& FormTable() {
  static const WordTable table = [] {
    WordTable forms;
    for (size_t i = 0; i < std::size(kForms); ++i) forms.Add(kForms[i].words, i);
    return forms;
  }();
  return table;
}

}  // namespace

const FormWords* FindForm(const std::vector<Word>& words) {
  const WordTable::Entry* best = nullptr;
  for (size_t i = 0; i < words.size(); ++i) {
    const WordTable::Entry* entry = FormTable().LongestAt(words, i);
    if (entry != nullptr && (best == nullptr || entry->words.size() > best->words.size())) best = entry;
  }
  return best == nullptr ? nullptr : &kForms[best->target];
}


}  // namespace medload::formulary_internal
