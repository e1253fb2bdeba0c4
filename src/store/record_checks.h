// The import's checks of a whole record, after its reader parsed it: identifiers free of
// control characters and bidi controls, and product strengths within plausible bounds.
// The readers check each field's form (csv_records.h, fhir_reader.h); these checks need
// the finished record. Private to src/store.
#pragma once

#include <functional>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_set>

#include "medload/core/records.h"
#include "medload/input/csv_records.h"

namespace medload {

// The largest strength of one product unit that is plausible, per kind of strength:
// a kilogram in mg, 100 million units, 100 percent (docs/input-formats.md, "Plausible
// values"). A description above them is a slip of the keyboard or a unit error.
inline constexpr double kMaxStrengthMg = 1e6;
inline constexpr double kMaxStrengthUnits = 1e8;
inline constexpr double kMaxStrengthPercent = 100;

// How a record's fields are named in messages: CSV columns or FHIR JSON pointers.
enum class FieldNames { kCsv, kFhir };

// A "bad_identifier" fault when `value` holds a control character (tab, CR and LF too) or
// a bidi control: `FILE:LINE: FIELD: holds the character \u202E; identifiers must be plain
// text (it would reorder or break the lines of every output naming it)`.
std::optional<RowFault> IdentifierFault(std::string_view file, size_t line, std::string_view field,
                                        std::string_view value);

// Product descriptions whose strengths were found plausible during one import, so that
// a description repeated on many rows is read once (up to kMaxRemembered of them; the
// rest are read on every row).
class PlausibleProducts {
 public:
  static constexpr size_t kMaxRemembered = 100000;
  bool Contains(std::string_view product) const { return products_.find(product) != products_.end(); }
  void Add(std::string_view product) {
    if (products_.size() < kMaxRemembered) products_.emplace(product);
  }

 private:
  struct Hash {
    using is_transparent = void;
    size_t operator()(std::string_view text) const { return std::hash<std::string_view>{}(text); }
  };
  std::unordered_set<std::string, Hash, std::equal_to<>> products_;
};

// An "implausible_strength" fault when the description's strengths (as the resolver reads
// them) exceed the bounds above: `FILE:LINE: product: "Amlodipine 5000000mg tablets":
// 5000000 mg a unit is above the plausible 1000000 mg; check the description`. With
// `plausible`, a description found there passes unread, and one that passes is added.
std::optional<RowFault> StrengthFault(std::string_view file, size_t line, std::string_view product,
                                      PlausibleProducts* plausible = nullptr);

// The checks above for each kind of record, in field order; nullopt when it passes.
// `plausible` (dispensings only; the others have no product) as for StrengthFault.
std::optional<RowFault> RecordFault(const DispensingRecord& record, std::string_view file, size_t line,
                                    FieldNames names, PlausibleProducts* plausible = nullptr);
std::optional<RowFault> RecordFault(const PatientRecord& record, std::string_view file, size_t line,
                                    FieldNames names, PlausibleProducts* plausible = nullptr);
std::optional<RowFault> RecordFault(const PracticeRecord& record, std::string_view file, size_t line,
                                    FieldNames names, PlausibleProducts* plausible = nullptr);
std::optional<RowFault> RecordFault(const ReviewRecord& record, std::string_view file, size_t line,
                                    FieldNames names, PlausibleProducts* plausible = nullptr);

}  // namespace medload
