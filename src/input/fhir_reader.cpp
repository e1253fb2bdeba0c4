// FHIR R4 NDJSON: bounded line reading, then one resource per line, dispatched by its
// resourceType to the element readers (input/fhir_resources.h).
#include "medload/input/fhir_reader.h"

#include <nlohmann/json.hpp>

#include <cmath>
#include <cstring>
#include <istream>

#include "input/fhir_resources.h"
#include "input/read_chunk.h"
#include "medload/core/text.h"

namespace medload {
namespace {

using nlohmann::json;

constexpr size_t kChunkBytes = 256 * 1024;

// Arrays and objects nested deeper than this are refused before parsing: a FHIR resource
// needs far fewer levels, and the JSON library copies and prints values recursively.
constexpr size_t kMaxJsonNesting = 64;

// True if `text` opens more than `limit` arrays or objects inside one another (brackets
// inside strings do not count).
bool NestedDeeperThan(std::string_view text, size_t limit) {
  size_t depth = 0;
  bool in_string = false;
  bool escaped = false;
  for (char c : text) {
    if (in_string) {
      if (escaped) escaped = false;
      else if (c == '\\') escaped = true;
      else if (c == '"') in_string = false;
    } else if (c == '"') {
      in_string = true;
    } else if (c == '[' || c == '{') {
      if (++depth > limit) return true;
    } else if ((c == ']' || c == '}') && depth > 0) {
      --depth;
    }
  }
  return false;
}

std::string StringAt(const json& parent, const char* key) {
  if (!parent.is_object()) return {};
  const auto found = parent.find(key);
  return found != parent.end() && found->is_string() ? found->get<std::string>() : std::string();
}

}  // namespace

const std::vector<std::string_view>& MedicationDispenseStatuses() {
  // Source: HL7 FHIR R4 MedicationDispense.status, value set medicationdispense-status.
  static const std::vector<std::string_view> kStatuses = {
      "preparation", "in-progress", "cancelled", "on-hold",  "completed",
      "entered-in-error", "stopped", "declined", "unknown"};
  return kStatuses;
}

bool StatusCounts(std::string_view status) { return status.empty() || status == "completed"; }

FhirReader::FhirReader(std::istream& in, std::string file, size_t max_line_bytes, size_t first_line)
    : in_(in), file_(std::move(file)), max_line_bytes_(max_line_bytes), chunk_(kChunkBytes),
      next_line_(first_line) {}

bool FhirReader::Fill() {
  if (eof_) return false;
  pos_ = 0;
  end_ = ReadChunk(in_, chunk_, eof_, read_failed_);
  return end_ > 0;
}

// Reads one physical line into line_text_ (without its line end), keeping at most
// max_line_bytes_. Returns false at the end of the input.
bool FhirReader::ReadLine() {
  line_text_.clear();
  line_too_long_ = false;
  if (pos_ >= end_ && !Fill()) return false;
  if (!started_) {
    started_ = true;
    if (end_ - pos_ >= 3 && std::memcmp(chunk_.data() + pos_, "\xEF\xBB\xBF", 3) == 0) pos_ += 3;
  }
  while (pos_ < end_ || Fill()) {
    const char* start = chunk_.data() + pos_;
    const void* newline = std::memchr(start, '\n', end_ - pos_);
    const size_t run = newline != nullptr ? static_cast<size_t>(static_cast<const char*>(newline) - start)
                                          : end_ - pos_;
    const size_t room = max_line_bytes_ - line_text_.size();
    if (run > room) line_too_long_ = true;
    line_text_.append(start, std::min(run, room));
    pos_ += run;
    if (newline != nullptr) {
      ++pos_;
      break;
    }
  }
  if (!line_text_.empty() && line_text_.back() == '\r' && !line_too_long_) line_text_.pop_back();
  return true;
}

bool FhirReader::Next(FhirItem& item) {
  for (;;) {
    const size_t line = next_line_;
    if (!ReadLine()) return false;
    ++next_line_;
    if (!line_too_long_ && IsBlank(line_text_, " \t\r")) {
      ++blank_lines_;
      continue;
    }
    item.line = line;
    item.text = line_text_;
    Interpret(item);
    return true;
  }
}

void FhirReader::Interpret(FhirItem& item) {
  const FhirFaults fault{file_, item.line};
  item.kind = FhirItemKind::kRejected;
  if (line_too_long_) {
    item.fault = fault("too_long", "row", "the line is longer than 1 MiB");
    return;
  }
  if (!IsValidUtf8(line_text_)) {
    item.fault = fault("invalid_utf8", "row", "is not valid UTF-8 (save the file as UTF-8)");
    return;
  }
  if (NestedDeeperThan(line_text_, kMaxJsonNesting)) {
    item.fault = fault("bad_json", "row", "nests arrays and objects more than " +
                                              std::to_string(kMaxJsonNesting) + " levels deep");
    return;
  }
  json resource;
  try {
    resource = json::parse(line_text_);
  } catch (const json::parse_error& error) {
    item.fault = fault("bad_json", "row", "is not valid JSON (at byte " + std::to_string(error.byte) + ")");
    return;
  } catch (const json::exception&) {
    item.fault = fault("bad_json", "row", "is not valid JSON (a number is out of range)");
    return;
  }
  if (!resource.is_object()) {
    item.fault = fault("bad_json", "row", "is not a JSON object (one FHIR resource per line)");
    return;
  }
  // A Bundle entry on a line of its own: its resource, and its fullUrl for a Patient.
  std::string full_url;
  if (!resource.contains("resourceType") && resource.contains("resource") &&
      resource.at("resource").is_object()) {
    full_url = StringAt(resource, "fullUrl");
    json inner = std::move(resource.at("resource"));
    resource = std::move(inner);
  }
  const std::string type = StringAt(resource, "resourceType");
  std::optional<RowFault> bad;
  if (type == "MedicationDispense") {
    bad = ReadDispenseResource(resource, fault, item);
    item.kind = FhirItemKind::kDispense;
  } else if (type == "Patient") {
    bad = ReadPatientResource(resource, fault, full_url, item);
    item.kind = FhirItemKind::kPatient;
  } else if (type == "Medication") {
    bad = ReadMedicationLine(resource, fault, item);
    item.kind = FhirItemKind::kMedication;
  } else {
    bad = fault("unsupported_resource", "/resourceType",
                type.empty() ? std::string("is missing (expected MedicationDispense, Patient or Medication)")
                             : QuoteForMessage(type) + " is not MedicationDispense, Patient or Medication");
  }
  if (bad) {
    item.kind = FhirItemKind::kRejected;
    item.fault = std::move(*bad);
  }
}

}  // namespace medload
