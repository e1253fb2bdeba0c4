#include "formulary/description_words.h"

#include <doctest/doctest.h>

#include <string>
#include <vector>

namespace medload::formulary_internal {
namespace {

TEST_SUITE("formulary/description_words") {

// Abbreviations as pharmacy systems print them (common practice).
TEST_CASE("abbreviations in descriptions are written out") {
  struct Case {
    const char* text;
    const char* expanded;
  };
  const std::vector<Case> cases = {
      {"amitriptyline 10mg tabs", "amitriptyline 10mg tablets"},
      {"omeprazole 20mg caps", "omeprazole 20mg capsules"},
      {"quetiapine 25mg tab", "quetiapine 25mg tablets"},
      {"metformin 500mg m/r tabs", "metformin 500mg modified release tablets"},
      {"diclofenac sod 50mg e/c tabs", "diclofenac sodium 50mg gastro resistant tablets"},
      {"amoxicillin 250mg/5ml susp s/f", "amoxicillin 250mg/5ml suspension sugar free"},
      {"chloramphenicol 0.5% e/d", "chloramphenicol 0.5% eye drops"},
      {"salbutamol 100mcg inh", "salbutamol 100mcg inhaler"},
      {"bisacodyl 10mg supps", "bisacodyl 10mg suppositories"},
      {"cyclizine 50mg/ml inj", "cyclizine 50mg/ml injection"},
      {"paracetamol 120mg/5ml liq", "paracetamol 120mg/5ml oral liquid"},
      {"hyoscine hbr 300mcg", "hyoscine hydrobromide 300mcg"},
      {"hyoscine butylbrom 10mg", "hyoscine butylbromide 10mg"},
      {"amitriptyline hcl 25mg", "amitriptyline hydrochloride 25mg"},
      {"nifedipine 30mg xl", "nifedipine 30mg modified release"},
      {"glyceryl trinitrate 400mcg sl spray", "glyceryl trinitrate 400mcg sublingual spray"},
      {"lansoprazole30mg caps", "lansoprazole 30mg capsules"},
      {"citalopram20mg", "citalopram 20mg"},
      // Not abbreviations: kept as written.
      {"adcal-d3 chewable tablets", "adcal-d3 chewable tablets"},
      {"vitamin b12 1mg/ml", "vitamin b12 1mg/ml"},
      {"tablets", "tablets"},
      {"a/b", "a/b"},
      {"capsaicin 0.025% cream", "capsaicin 0.025% cream"},
      {"", ""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    CHECK(ExpandAbbreviations(c.text) == c.expanded);
  }
}

TEST_CASE("descriptive words are told apart from words that may name an ingredient") {
  for (const char* word : {"tablets", "hydrochloride", "bitartrate", "sugar", "modified", "with", "ltd", "handihaler"}) {
    CAPTURE(word);
    CHECK(IsDescriptiveWord(word));
  }
  for (const char* word : {"hydrocodone", "frobazine", "paracetamol", "detrusitol"}) {
    CAPTURE(word);
    CHECK_FALSE(IsDescriptiveWord(word));
  }
  CHECK(IsConnectorWord("and"));
  CHECK(IsConnectorWord("with"));
  CHECK_FALSE(IsConnectorWord("tablets"));
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload::formulary_internal
