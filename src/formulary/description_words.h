// The words of dispensing descriptions that are not names: abbreviations as pharmacy
// systems write them ("tabs", "m/r", "HCl"), salts, release and pack words. Private to
// src/formulary/; it knows no table, only the trade's vocabulary.
#pragma once

#include <string>
#include <string_view>

namespace medload::formulary_internal {

// `normalised` (NormaliseText output) with abbreviations written out ("tabs" -> "tablets",
// "m/r" -> "modified release", "hcl" -> "hydrochloride", "e/d" -> "eye drops") and a
// strength glued to a word split off ("lansoprazole30mg" -> "lansoprazole 30mg").
// Everything else is kept as it was.
std::string ExpandAbbreviations(std::string_view normalised);

// True for a word that describes a product without naming an ingredient: forms, routes,
// release and pack words, salts and esters, units, connectors ("tablets", "hydrochloride",
// "sugar", "with") and company words ("ltd", "pharma"). Such words are never read as unknown ingredients or close spellings.
bool IsDescriptiveWord(std::string_view word);

// True for a mineral or ion that is a salt word beside a name ("levothyroxine sodium")
// but an ingredient standing alone in a part of a combination ("calcium and vitamin D").
bool IsMineralWord(std::string_view word);

// True for a word that joins the parts of a combination: "and", "with", "plus".
bool IsConnectorWord(std::string_view word);

}  // namespace medload::formulary_internal
