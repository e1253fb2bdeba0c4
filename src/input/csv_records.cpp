#include "medload/input/csv_records.h"

#include <nlohmann/json.hpp>

#include <charconv>
#include <cmath>
#include <fstream>
#include <sstream>

#include "medload/core/text.h"
#include "medload/input/input_hints.h"
#include "medload/input/json_file.h"

namespace medload {
namespace {

// Positions in ColumnsOf(kind), one namespace per kind.
namespace dispensing_col {
constexpr size_t kRecordId = 0, kPatientId = 1, kPractice = 2, kDispensedOn = 3, kProduct = 4,
                 kCode = 5, kCodeSystem = 6, kQuantity = 7, kUnit = 8, kDaysSupply = 9,
                 kDosage = 10;
}  // namespace dispensing_col
namespace patient_col {
constexpr size_t kPatientId = 0, kBirthDate = 1, kSex = 2, kPractice = 3, kRegisteredFrom = 4,
                 kRegisteredTo = 5;
}  // namespace patient_col
namespace practice_col {
constexpr size_t kPractice = 0, kName = 1, kNetwork = 2, kListSize = 3;
}  // namespace practice_col
namespace review_col {
constexpr size_t kPatientId = 0, kReviewedOn = 1;
}  // namespace review_col

char AsciiLower(char c) { return c >= 'A' && c <= 'Z' ? static_cast<char>(c - 'A' + 'a') : c; }

// A header name as compared: trimmed, lower case, ' ' and '-' as '_'.
std::string NormaliseHeader(std::string_view name) {
  std::string out;
  for (char c : Trim(name)) out += c == ' ' || c == '-' ? '_' : AsciiLower(c);
  return out;
}

// A value quoted for a message, cut to a readable length on a UTF-8 boundary.
std::string Quoted(std::string_view value) {
  constexpr size_t kShown = 60;
  std::string out = "\"";
  if (value.size() <= kShown) {
    out.append(value);
  } else {
    size_t cut = kShown;
    while (cut > 0 && (static_cast<unsigned char>(value[cut]) & 0xC0) == 0x80) --cut;
    out.append(value.substr(0, cut));
    out += "...";
  }
  return out + "\"";
}

RowFault Fault(std::string reason, std::string_view file, size_t line, std::string_view field,
               std::string_view fault) {
  return {std::move(reason), FaultMessage(file, line, field, fault)};
}

std::string_view DateShape(DateOrder order) {
  switch (order) {
    case DateOrder::kIso: return "YYYY-MM-DD";
    case DateOrder::kDmy: return "DD/MM/YYYY";
    case DateOrder::kMdy: return "MM/DD/YYYY";
  }
  return "YYYY-MM-DD";
}

// A date column: empty is `missing_reason` (or allowed when that is empty).
std::optional<RowFault> ParseDateField(std::string_view text, const RowContext& context,
                                       size_t line, std::string_view field,
                                       std::string_view missing_reason, std::optional<Date>& date) {
  date.reset();
  if (text.empty()) {
    if (missing_reason.empty()) return std::nullopt;
    return Fault(std::string(missing_reason), context.file, line, field, "is empty");
  }
  date = ParseDate(text, context.date_order);
  if (date) return std::nullopt;
  return Fault("bad_date", context.file, line, field,
               Quoted(text) + " is not a real date (expected " +
                   std::string(DateShape(context.date_order)) + ")" + DateOrderHint(text, context.date_order));
}

// The JSON pointer of a top-level key (RFC 6901: "~" as "~0", "/" as "~1").
std::string JsonPointerTo(std::string_view key) {
  std::string pointer = "/";
  for (char c : key) {
    if (c == '~') pointer += "~0";
    else if (c == '/') pointer += "~1";
    else pointer += c;
  }
  return pointer;
}

}  // namespace

std::string QuoteForMessage(std::string_view value) { return Quoted(value); }

std::string FaultMessage(std::string_view file, size_t line, std::string_view field,
                         std::string_view fault) {
  std::string message(file);
  message += ':';
  message += std::to_string(line);
  message += ": ";
  message += field;
  message += ": ";
  message += fault;
  return message;
}

std::string_view InputKindName(InputKind kind) {
  switch (kind) {
    case InputKind::kDispensing: return "dispensing";
    case InputKind::kPatients: return "patients";
    case InputKind::kPractices: return "practices";
    case InputKind::kReviews: return "reviews";
  }
  return "";
}

const std::vector<ColumnSpec>& ColumnsOf(InputKind kind) {
  static const std::vector<ColumnSpec> kDispensing = {
      {"record_id", false}, {"patient_id", true},  {"practice", false},    {"dispensed_on", true},
      {"product", false},   {"code", false},       {"code_system", false}, {"quantity", true},
      {"unit", false},      {"days_supply", false}, {"dosage", false}};
  static const std::vector<ColumnSpec> kPatients = {
      {"patient_id", true}, {"birth_date", true},       {"sex", false},
      {"practice", false},  {"registered_from", false}, {"registered_to", false}};
  static const std::vector<ColumnSpec> kPractices = {
      {"practice", true}, {"name", false}, {"network", false}, {"list_size", false}};
  static const std::vector<ColumnSpec> kReviews = {{"patient_id", true}, {"reviewed_on", true}};
  switch (kind) {
    case InputKind::kDispensing: return kDispensing;
    case InputKind::kPatients: return kPatients;
    case InputKind::kPractices: return kPractices;
    case InputKind::kReviews: return kReviews;
  }
  return kDispensing;
}

Result<ColumnMap> ParseColumnMap(std::string_view json_text, std::string_view file_name,
                                 InputKind kind) {
  const std::string file(file_name);
  auto parsed = ParseJsonText(json_text, file);
  if (!parsed.ok()) return parsed.status();
  const nlohmann::json& json = *parsed;
  if (!json.is_object()) {
    return Status::Input(file + ": must be a JSON object of column name -> header name");
  }
  std::string known;
  for (const ColumnSpec& spec : ColumnsOf(kind)) {
    known += known.empty() ? "" : ", ";
    known += spec.name;
  }
  ColumnMap map;
  for (const auto& [key, value] : json.items()) {
    const std::string pointer = JsonPointerTo(key);
    bool is_known = false;
    for (const ColumnSpec& spec : ColumnsOf(kind)) is_known = is_known || spec.name == key;
    if (!is_known) {
      return Status::Input(file + ": " + pointer + ": not a column of " +
                           std::string(InputKindName(kind)) + " input (one of " + known + ")");
    }
    if (!value.is_string() || value.get<std::string>().empty()) {
      return Status::Input(file + ": " + pointer +
                           ": must be a non-empty string, the header name in your file");
    }
    map[key] = value.get<std::string>();
  }
  return map;
}

Result<ColumnMap> LoadColumnMap(const std::string& path, InputKind kind) {
  auto text = ReadTextFile(path);
  if (!text.ok()) return text.status();
  return ParseColumnMap(*text, path, kind);
}

Result<HeaderLayout> HeaderLayout::Find(InputKind kind, const CsvRow& header,
                                        const ColumnMap& map, std::string_view file_name) {
  const auto header_fault = [&](const std::string& fault) {
    return Status::Input(FaultMessage(file_name, header.line, "header", fault));
  };
  if (header.fault != CsvFault::kNone) {
    return header_fault("cannot be read (" + std::string(CsvFaultName(header.fault)) + ")");
  }
  HeaderLayout layout;
  layout.kind_ = kind;
  layout.field_count_ = header.fields.size();
  std::vector<std::string> names;
  for (std::string_view field : header.fields) names.push_back(NormaliseHeader(field));
  std::string missing;
  for (const ColumnSpec& spec : ColumnsOf(kind)) {
    const auto mapped = map.find(std::string(spec.name));
    const std::string wanted = NormaliseHeader(mapped != map.end() ? mapped->second : spec.name);
    size_t position = kAbsent;
    for (size_t i = 0; i < names.size(); ++i) {
      if (names[i] != wanted) continue;
      if (position != kAbsent) {
        return header_fault("column " + Quoted(wanted) + " appears twice (columns " +
                            std::to_string(position + 1) + " and " + std::to_string(i + 1) + ")");
      }
      position = i;
    }
    layout.positions_.push_back(position);
    if (spec.required && position == kAbsent) {
      missing += missing.empty() ? "" : ", ";
      missing += mapped != map.end() ? wanted + " (for " + std::string(spec.name) + ")" : wanted;
    }
  }
  if (kind == InputKind::kDispensing && layout.positions_[dispensing_col::kProduct] == kAbsent &&
      layout.positions_[dispensing_col::kCode] == kAbsent) {
    missing += missing.empty() ? "product or code" : ", product or code";
  }
  if (!missing.empty()) {
    return header_fault("missing required columns: " + missing +
                        " (name them in the header, or map your names with --columns)" + DelimiterHint(header));
  }
  return layout;
}

std::string_view HeaderLayout::Value(const CsvRow& row, size_t column) const {
  const size_t position = positions_[column];
  return position == kAbsent ? std::string_view() : Trim(row.fields[position]);
}

std::optional<RowFault> CheckRecordShape(const CsvRow& row, const HeaderLayout& layout,
                                         std::string_view file) {
  switch (row.fault) {
    case CsvFault::kNone: break;
    case CsvFault::kInvalidUtf8:
      return Fault("invalid_utf8", file, row.line, "row", "is not valid UTF-8 (save the file as UTF-8)");
    case CsvFault::kFieldTooLong:
      return Fault("too_long", file, row.line, "row", "a field is longer than 64 KiB");
    case CsvFault::kRecordTooLong:
      return Fault("too_long", file, row.line, "row", "the record is longer than 1 MiB");
    case CsvFault::kTooManyFields:
      return Fault("field_count", file, row.line, "row",
                   "has too many fields, the header has " + std::to_string(layout.field_count()));
    case CsvFault::kUnclosedQuote:
      return Fault("unclosed_quote", file, row.line, "row",
                   "a quoted field opened on this line never closes into a valid row; only this "
                   "line is rejected, the next line is read as a new row");
  }
  if (row.fields.size() != layout.field_count()) {
    return Fault("field_count", file, row.line, "row",
                 "has " + std::to_string(row.fields.size()) + " fields, the header has " +
                     std::to_string(layout.field_count()));
  }
  return std::nullopt;
}

std::optional<RowFault> ParseQuantity(std::string_view text, std::string_view file, size_t line,
                                      std::string_view field, double& quantity) {
  if (text.empty()) return Fault("missing_quantity", file, line, field, "is empty");
  double value = 0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (error != std::errc() || end != text.data() + text.size() || !std::isfinite(value)) {
    return Fault("bad_quantity", file, line, field, Quoted(text) + " is not a number");
  }
  if (value <= 0) return Fault("bad_quantity", file, line, field, Quoted(text) + " is not above zero");
  if (value > kMaxQuantity) {
    return Fault("bad_quantity", file, line, field,
                 Quoted(text) + " is above 1000000, the largest plausible quantity (check the unit)");
  }
  quantity = value;
  return std::nullopt;
}

std::optional<RowFault> ParseDaysSupply(std::string_view text, std::string_view file,
                                        size_t line, std::string_view field,
                                        std::optional<int>& days) {
  days.reset();
  if (text.empty()) return std::nullopt;
  double value = 0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), value);
  const bool whole = error == std::errc() && end == text.data() + text.size() &&
                     std::isfinite(value) && std::floor(value) == value && value < 1e9;
  if (!whole) {
    return Fault("bad_days_supply", file, line, field, Quoted(text) + " is not a whole number of days");
  }
  if (value <= 0) return Fault("bad_days_supply", file, line, field, Quoted(text) + " is not above zero");
  if (value > kMaxDaysSupply) {
    return Fault("bad_days_supply", file, line, field, Quoted(text) + " is above 3650 days (ten years)");
  }
  days = static_cast<int>(value);
  return std::nullopt;
}

std::optional<RowFault> ParseBirthDate(std::string_view text, DateOrder order,
                                       std::string_view file, size_t line, std::string_view field,
                                       std::optional<Date>& birth, bool& year_only) {
  birth.reset();
  year_only = false;
  if (text.empty()) return std::nullopt;
  int year = 0;
  int month = 0;
  const char* end = text.data() + text.size();
  if (text.size() == 4 && std::from_chars(text.data(), end, year).ptr == end &&
      IsValidCivil(year, 7, 1)) {
    birth = Date::FromCivil(year, 7, 1);  // docs/input-formats.md: a year alone counts as 1 July
    year_only = true;
    return std::nullopt;
  }
  if (text.size() == 7 && text[4] == '-' &&
      std::from_chars(text.data(), text.data() + 4, year).ptr == text.data() + 4 &&
      std::from_chars(text.data() + 5, end, month).ptr == end && IsValidCivil(year, month, 15)) {
    birth = Date::FromCivil(year, month, 15);  // a year and month: the middle of the month
    return std::nullopt;
  }
  birth = ParseDate(text, order);
  if (birth) return std::nullopt;
  return Fault("bad_date", file, line, field,
               Quoted(text) + " is not a real date or a year (expected " +
                   std::string(DateShape(order)) + " or YYYY)" + DateOrderHint(text, order));
}

std::optional<RowFault> ParseSex(std::string_view text, std::string_view file, size_t line,
                                 std::string_view field, std::string& sex) {
  std::string lower;
  for (char c : text) lower += AsciiLower(c);
  static constexpr std::pair<std::string_view, std::string_view> kWords[] = {
      {"female", "female"}, {"f", "female"}, {"male", "male"},       {"m", "male"},
      {"other", "other"},   {"o", "other"},  {"unknown", "unknown"}, {"u", "unknown"},
      {"", ""}};
  for (const auto& [word, value] : kWords) {
    if (lower == word) {
      sex.assign(value);
      return std::nullopt;
    }
  }
  return Fault("bad_sex", file, line, field,
               Quoted(text) + " is not one of female, male, other, unknown (or F, M, O, U)");
}

std::optional<RowFault> ParseDispensingRow(const CsvRow& row, const HeaderLayout& layout,
                                           const RowContext& context, DispensingRecord& out) {
  namespace col = dispensing_col;
  if (auto fault = CheckRecordShape(row, layout, context.file)) return fault;
  const size_t line = row.line;
  out.patient_id.assign(layout.Value(row, col::kPatientId));
  if (out.patient_id.empty()) return Fault("missing_patient", context.file, line, "patient_id", "is empty");
  std::optional<Date> date;
  if (auto fault = ParseDateField(layout.Value(row, col::kDispensedOn), context, line,
                                  "dispensed_on", "missing_date", date)) {
    return fault;
  }
  out.dispensed_on = *date;
  out.product.assign(layout.Value(row, col::kProduct));
  out.code.assign(layout.Value(row, col::kCode));
  if (out.product.empty() && out.code.empty()) {
    return Fault("missing_product", context.file, line, "product", "product and code are both empty");
  }
  if (auto fault = ParseQuantity(layout.Value(row, col::kQuantity), context.file, line,
                                 "quantity", out.quantity)) {
    return fault;
  }
  if (auto fault = ParseDaysSupply(layout.Value(row, col::kDaysSupply), context.file, line,
                                   "days_supply", out.days_supply)) {
    return fault;
  }
  out.record_id.assign(layout.Value(row, col::kRecordId));
  out.practice.assign(layout.Value(row, col::kPractice));
  out.code_system.assign(layout.Value(row, col::kCodeSystem));
  out.unit.assign(layout.Value(row, col::kUnit));
  out.dosage.assign(layout.Value(row, col::kDosage));
  out.structured_units_per_day.reset();
  out.structured_as_needed = false;
  out.status.clear();
  return std::nullopt;
}

std::optional<RowFault> ParsePatientRow(const CsvRow& row, const HeaderLayout& layout,
                                        const RowContext& context, PatientRecord& out) {
  namespace col = patient_col;
  if (auto fault = CheckRecordShape(row, layout, context.file)) return fault;
  const size_t line = row.line;
  out.patient_id.assign(layout.Value(row, col::kPatientId));
  if (out.patient_id.empty()) return Fault("missing_patient", context.file, line, "patient_id", "is empty");
  if (auto fault = ParseBirthDate(layout.Value(row, col::kBirthDate), context.date_order,
                                  context.file, line, "birth_date", out.birth_date,
                                  out.birth_year_only)) {
    return fault;
  }
  if (auto fault = ParseSex(layout.Value(row, col::kSex), context.file, line, "sex", out.sex)) {
    return fault;
  }
  out.practice.assign(layout.Value(row, col::kPractice));
  if (auto fault = ParseDateField(layout.Value(row, col::kRegisteredFrom), context, line,
                                  "registered_from", "", out.registered_from)) {
    return fault;
  }
  if (auto fault = ParseDateField(layout.Value(row, col::kRegisteredTo), context, line,
                                  "registered_to", "", out.registered_to)) {
    return fault;
  }
  if (out.registered_from && out.registered_to && *out.registered_to < *out.registered_from) {
    return Fault("bad_registration", context.file, line, "registered_to",
                 Quoted(out.registered_to->ToIso()) + " is before registered_from " +
                     Quoted(out.registered_from->ToIso()));
  }
  return std::nullopt;
}

std::optional<RowFault> ParsePracticeRow(const CsvRow& row, const HeaderLayout& layout,
                                         const RowContext& context, PracticeRecord& out) {
  namespace col = practice_col;
  if (auto fault = CheckRecordShape(row, layout, context.file)) return fault;
  out.practice.assign(layout.Value(row, col::kPractice));
  if (out.practice.empty()) return Fault("missing_practice", context.file, row.line, "practice", "is empty");
  out.name.assign(layout.Value(row, col::kName));
  out.network.assign(layout.Value(row, col::kNetwork));
  out.list_size.reset();
  const std::string_view list_size = layout.Value(row, col::kListSize);
  if (list_size.empty()) return std::nullopt;
  long value = 0;
  const char* end = list_size.data() + list_size.size();
  const auto parsed = std::from_chars(list_size.data(), end, value);
  if (parsed.ec != std::errc() || parsed.ptr != end) {
    return Fault("bad_list_size", context.file, row.line, "list_size",
                 Quoted(list_size) + " is not a whole number");
  }
  if (value <= 0) {
    return Fault("bad_list_size", context.file, row.line, "list_size",
                 Quoted(list_size) + " is not above zero");
  }
  out.list_size = value;
  return std::nullopt;
}

std::optional<RowFault> ParseReviewRow(const CsvRow& row, const HeaderLayout& layout,
                                       const RowContext& context, ReviewRecord& out) {
  namespace col = review_col;
  if (auto fault = CheckRecordShape(row, layout, context.file)) return fault;
  out.patient_id.assign(layout.Value(row, col::kPatientId));
  if (out.patient_id.empty()) return Fault("missing_patient", context.file, row.line, "patient_id", "is empty");
  std::optional<Date> date;
  if (auto fault = ParseDateField(layout.Value(row, col::kReviewedOn), context, row.line,
                                  "reviewed_on", "missing_date", date)) {
    return fault;
  }
  out.reviewed_on = *date;
  return std::nullopt;
}

}  // namespace medload
