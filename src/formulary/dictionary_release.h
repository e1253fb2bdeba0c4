// Shared by the dictionary readers (dm+d, RxNorm, CSV): substance names mapped onto the
// formulary's ingredients, strengths written back as text. Private to src/formulary/.
#pragma once

#include <set>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "medload/core/status.h"
#include "medload/formulary/dictionary.h"
#include "medload/formulary/resolver.h"

namespace medload::formulary_internal {

// A file of a release: its path (as given, for messages) and contents.
struct ReleaseFile {
  std::string path;
  std::string content;
};

// The canonical ingredient a substance name means ("Tolterodine tartrate" -> tolterodine:
// a name or synonym, salts and esters ignored, exactly one ingredient), or "?name" (lower
// case) when none, with the name added to `unknown`.
std::string IngredientOfSubstance(const Formulary& formulary, std::string_view substance,
                                  std::set<std::string>& unknown);

// A strength as text that ParseStrengths reads back to the same value ("30mg",
// "5mg/5ml", "25micrograms/hour" is written "0.025mg/1hour").
std::string StrengthText(const Strength& strength);

// The file name of `path` without its folders, for source notes.
std::string FileName(std::string_view path);

Result<DictionaryLoad> ReadDmdRelease(const Formulary& formulary, const std::vector<ReleaseFile>& files);
Result<DictionaryLoad> ReadRxnormRelease(const Formulary& formulary, const std::vector<ReleaseFile>& files);

}  // namespace medload::formulary_internal
