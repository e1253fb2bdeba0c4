// `medload formulary check|lookup|unmatched|load-dictionary` output: a table check's verdict and counts,
// how one product resolves with its ingredients' facts from the tables, and the stored
// products nothing resolves (or resolves only in part or from a close spelling), in text,
// CSV, JSON and HTML; what a dictionary load wrote, in text and JSON. Writers take a finished model
// and a stream; they load no tables and run no queries.
#pragma once

#include <cstddef>
#include <iosfwd>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "medload/core/records.h"
#include "medload/formulary/dictionary.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/product.h"

namespace medload {

// ---- formulary check: `dir` is the folder the check read ----
nlohmann::json FormularyCheckJson(const std::string& dir, const FormularyCheck& check);
void WriteFormularyCheckText(std::ostream& out, const std::string& dir, const FormularyCheck& check);
void WriteFormularyCheckCsv(std::ostream& out, const FormularyCheck& check);
void WriteFormularyCheckHtml(std::ostream& out, const std::string& dir, const FormularyCheck& check);

// ---- formulary lookup ----
struct LookupModel {
  std::string description, code, code_system;  // as the user gave them
  ResolvedProduct product;                     // their resolution
  const Formulary* formulary = nullptr;        // REQUIRES: non-null, outlives the writer call
};

nlohmann::json LookupJson(const LookupModel& model);
void WriteLookupText(std::ostream& out, const LookupModel& model);
void WriteLookupCsv(std::ostream& out, const LookupModel& model);
void WriteLookupHtml(std::ostream& out, const LookupModel& model);

// ---- formulary unmatched ----
// A stored product nothing resolves, or one resolved only in part or from a close spelling.
struct UnresolvedProduct {
  ProductCount count;
  MatchKind match = MatchKind::kUnmatched;  // kUnmatched, kPartial or kApproximate
  std::string detail;                       // what is unknown, or how a spelling was read
  std::vector<std::string> suggestions;     // nearest names in the tables, for an unmatched one
};

// The products of `counts` that `formulary` does not resolve, or resolves only in part or
// from a close spelling, most items first (then most patients; ties keep their order), at
// most `limit` of them (0: all).
std::vector<UnresolvedProduct> UnmatchedProducts(const Formulary& formulary, const std::vector<ProductCount>& counts,
                                                 size_t limit);
// `checksum`: the formulary's checksum, which the JSON names.
nlohmann::json UnmatchedJson(const std::vector<UnresolvedProduct>& products, const std::string& checksum);
void WriteUnmatchedText(std::ostream& out, const std::vector<UnresolvedProduct>& products);
void WriteUnmatchedCsv(std::ostream& out, const std::vector<UnresolvedProduct>& products);
void WriteUnmatchedHtml(std::ostream& out, const std::vector<UnresolvedProduct>& products);

// ---- formulary load-dictionary: `dictionary` is the file written, `rows_in_file` its rows ----
nlohmann::json DictionaryLoadJson(const std::string& dictionary, const DictionaryLoad& load, size_t rows_in_file);
void WriteDictionaryLoadText(std::ostream& out, const std::string& dictionary, const DictionaryLoad& load,
                             size_t rows_in_file);

}  // namespace medload
