// Turns a national dictionary release a user holds (UK dm+d XML files, US RxNorm RRF
// files) or a simple CSV list into rows of dictionary.csv, so that codes, exact product
// names and brands resolve. It reads files and maps substances onto ingredients.csv; it
// does not resolve dispensing records (resolver.h) and ships no dictionary content.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "medload/core/status.h"
#include "medload/formulary/formulary.h"

namespace medload {

enum class DictionarySystem { kDmd, kRxnorm, kCsv };

// "dmd", "rxnorm" or "csv"; nullopt for anything else.
std::optional<DictionarySystem> DictionarySystemFromName(std::string_view name);

// What a dictionary release gave.
struct DictionaryLoad {
  std::string code_system;             // "dmd", "rxnorm", or the CSV's own (several: "csv")
  std::vector<DictionaryEntry> entries;
  // Substance names no ingredient of the formulary matches, distinct and sorted: the
  // rows naming them carry "?name" and resolve as partial until ingredients.csv has them.
  std::vector<std::string> unknown_substances;
  size_t skipped = 0;                  // products left out (no ingredient at all)
};

// Reads `files` as a release of `system`, mapping substance names onto the ingredients of
// `formulary` (by name or synonym, salts ignored):
// - dmd: the VMP, AMP and ingredient XML files (any order; recognised by their root
//   element), and optionally the lookup file for units of measure;
// - rxnorm: RXNCONSO.RRF and RXNREL.RRF (recognised by their field counts);
// - csv: files with the header code_system,code,name,brand,ingredients (ingredients by
//   any name, "|"-separated, each optionally "=STRENGTH").
// Status::Input naming the file (and line or element) of the first fault: a file that
// cannot be read or recognised, a missing required file, a malformed row.
Result<DictionaryLoad> ReadDictionaryRelease(const Formulary& formulary, DictionarySystem system,
                                             const std::vector<std::string>& files);

// The text of a dictionary.csv holding `entries` (header, then one row each, quoted where
// needed).
std::string DictionaryCsv(const std::vector<DictionaryEntry>& entries);

// Writes `load` into `dir`/dictionary.csv: rows of the code systems `load` brings are
// replaced, rows of other systems are kept. The file is written whole and renamed into
// place. Status::Input if the existing file has a fault or cannot be written.
Status WriteDictionary(const std::string& dir, const DictionaryLoad& load);

}  // namespace medload
