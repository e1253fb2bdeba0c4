// The meaning of the tabular inputs: which columns each kind of file has, how a header
// (and a --columns mapping file) locates them, and the checks that turn one CSV record
// into a record or into a rejected row with its reason. It does not read files or store.
#pragma once

#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "medload/core/date.h"
#include "medload/core/records.h"
#include "medload/core/status.h"
#include "medload/input/csv_reader.h"

namespace medload {

// The four kinds of input the import commands take.
enum class InputKind { kDispensing, kPatients, kPractices, kReviews };

// "dispensing", "patients", "practices", "reviews".
std::string_view InputKindName(InputKind kind);

struct ColumnSpec {
  std::string_view name;  // the column name medload knows
  bool required;          // the header must have it (product/code: one of the two)
};

// The known columns of a kind, in documentation order.
const std::vector<ColumnSpec>& ColumnsOf(InputKind kind);

// A --columns mapping: medload column name -> the header name used in the file.
using ColumnMap = std::map<std::string, std::string>;

// Parses a mapping file: one JSON object whose keys are medload column names of `kind`
// and whose values are header names (strings). Fails with Input as
// `FILE: /KEY: fault` (a JSON pointer) on a bad key or value, or `FILE: fault` on bad JSON.
Result<ColumnMap> ParseColumnMap(std::string_view json_text, std::string_view file_name,
                                 InputKind kind);
// Reads and parses the mapping file at `path`; a missing file is an Input failure.
Result<ColumnMap> LoadColumnMap(const std::string& path, InputKind kind);

// Why a row was not imported: a short key counted in the summary ("bad_quantity") and the
// full message `FILE:LINE: FIELD: fault`.
struct RowFault {
  std::string reason;
  std::string message;
};

// Where each known column sits in one file's header.
class HeaderLayout {
 public:
  static constexpr size_t kAbsent = static_cast<size_t>(-1);

  // Locates the columns of `kind` in `header` (names compared after trimming, ASCII case
  // folding and treating ' ' and '-' as '_'), through `map` where it names a column.
  // Fails with Input `FILE:LINE: header: fault` naming every missing required column, or
  // a column found twice. Extra columns are allowed and ignored.
  static Result<HeaderLayout> Find(InputKind kind, const CsvRow& header, const ColumnMap& map,
                                   std::string_view file_name);

  InputKind kind() const { return kind_; }
  // Number of fields in the header; every row must have as many.
  size_t field_count() const { return field_count_; }
  // Position in the row of known column `column` (an index into ColumnsOf(kind)), or
  // kAbsent.
  size_t Position(size_t column) const { return positions_[column]; }
  // The value of `column` in `row` with spaces and tabs trimmed; "" when absent.
  // REQUIRES: row.fields.size() == field_count().
  std::string_view Value(const CsvRow& row, size_t column) const;

 private:
  InputKind kind_ = InputKind::kDispensing;
  size_t field_count_ = 0;
  std::vector<size_t> positions_;
};

// What the row parsers need besides the row.
struct RowContext {
  std::string_view file;                 // as shown in messages
  DateOrder date_order = DateOrder::kIso;  // --date-format
};

// Each parser checks one record in a fixed order (CSV faults, field count, then the
// columns in order) and stops at the first fault. On success it fills `out`, reusing its
// strings' capacity, and returns nullopt. Reason keys and messages are listed in
// docs/input-formats.md.
std::optional<RowFault> ParseDispensingRow(const CsvRow& row, const HeaderLayout& layout,
                                           const RowContext& context, DispensingRecord& out);
std::optional<RowFault> ParsePatientRow(const CsvRow& row, const HeaderLayout& layout,
                                        const RowContext& context, PatientRecord& out);
std::optional<RowFault> ParsePracticeRow(const CsvRow& row, const HeaderLayout& layout,
                                         const RowContext& context, PracticeRecord& out);
std::optional<RowFault> ParseReviewRow(const CsvRow& row, const HeaderLayout& layout,
                                       const RowContext& context, ReviewRecord& out);

// The CSV-level checks alone (invalid UTF-8, too long, unclosed quote, field count).
std::optional<RowFault> CheckRecordShape(const CsvRow& row, const HeaderLayout& layout,
                                         std::string_view file);

// Plausible bounds (docs/input-formats.md, "Plausible values"): a quantity above a
// million units (a thousand litres in ml, a year of two litres of feed a day) or a supply
// of more than ten years is a slip or a unit error, and would make doses meaningless.
inline constexpr double kMaxQuantity = 1e6;
inline constexpr int kMaxDaysSupply = 3650;

// Shared value checks, also used by the FHIR reader. Each returns nullopt and sets the
// value, or returns the fault for `field` at `file:line`: a quantity must be a finite
// number above 0 and at most kMaxQuantity, a days supply a whole number from 1 to
// kMaxDaysSupply.
std::optional<RowFault> ParseQuantity(std::string_view text, std::string_view file, size_t line,
                                      std::string_view field, double& quantity);
std::optional<RowFault> ParseDaysSupply(std::string_view text, std::string_view file,
                                        size_t line, std::string_view field,
                                        std::optional<int>& days);
// A birth date: a full date in `order`, a year alone (-> 1 July, year_only = true) or an
// ISO year-month (-> the 15th).
std::optional<RowFault> ParseBirthDate(std::string_view text, DateOrder order,
                                       std::string_view file, size_t line, std::string_view field,
                                       std::optional<Date>& birth, bool& year_only);
// Sex as "female", "male", "other" or "unknown" from those words or F, M, O, U (any case);
// empty stays empty.
std::optional<RowFault> ParseSex(std::string_view text, std::string_view file, size_t line,
                                 std::string_view field, std::string& sex);

// `FILE:LINE: FIELD: fault`.
std::string FaultMessage(std::string_view file, size_t line, std::string_view field,
                         std::string_view fault);
// A value in double quotes for a message, cut after 60 bytes (on a UTF-8 boundary) with "...".
std::string QuoteForMessage(std::string_view value);

}  // namespace medload
