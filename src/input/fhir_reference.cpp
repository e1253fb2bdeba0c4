// Literal references are parsed by hand rather than by searching for "Type/" inside the
// text: a search finds "Patient/.." in "Patient/../../X/_history/1" and files a record
// under a path step. Only the shapes the R4 specification allows are accepted.
#include "input/fhir_reference.h"

#include <vector>

namespace medload {
namespace {

bool IsAsciiLetter(char c) { return (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z'); }
bool IsAsciiDigit(char c) { return c >= '0' && c <= '9'; }
bool IsHexDigit(char c) {
  return IsAsciiDigit(c) || (c >= 'a' && c <= 'f') || (c >= 'A' && c <= 'F');
}

bool IsResourceType(std::string_view text) {
  if (text.empty() || text.size() > 64 || !(text[0] >= 'A' && text[0] <= 'Z')) return false;
  for (char c : text) {
    if (!IsAsciiLetter(c)) return false;
  }
  return true;
}

// One step of a base URL's path (FHIR R4 references.html: [A-Za-z0-9\-\\\.\:\%\$]*; the
// backslash is left out).
bool IsBaseStep(std::string_view text) {
  if (text.empty()) return false;
  for (char c : text) {
    if (!IsAsciiLetter(c) && !IsAsciiDigit(c) && c != '-' && c != '.' && c != ':' && c != '%' &&
        c != '$') {
      return false;
    }
  }
  return true;
}

std::vector<std::string_view> SplitSteps(std::string_view text) {
  std::vector<std::string_view> steps;
  size_t start = 0;
  for (;;) {
    const size_t slash = text.find('/', start);
    steps.push_back(text.substr(start, slash == std::string_view::npos ? slash : slash - start));
    if (slash == std::string_view::npos) return steps;
    start = slash + 1;
  }
}

constexpr std::string_view kShape =
    "is not a reference of the form Type/id (optionally /_history/version), relative or after"
    " an http(s) base URL";

std::optional<FhirReference> Fail(std::string* why, std::string_view fault) {
  if (why != nullptr) why->assign(fault);
  return std::nullopt;
}

}  // namespace

bool IsFhirId(std::string_view text) {
  if (text.empty() || text.size() > 64 || text == "." || text == "..") return false;
  for (char c : text) {
    if (!IsAsciiLetter(c) && !IsAsciiDigit(c) && c != '-' && c != '.') return false;
  }
  return true;
}

std::optional<FhirReference> ParseFhirReference(std::string_view reference, std::string* why) {
  if (reference.empty()) return Fail(why, "is empty");
  if (reference[0] == '#') return Fail(why, "is a local reference to a contained resource");
  if (reference.substr(0, 4) == "urn:") return Fail(why, "is a urn, not a literal reference");
  std::string_view rest = reference;
  bool absolute = false;
  for (std::string_view scheme : {"http://", "https://"}) {
    if (rest.substr(0, scheme.size()) == scheme) {
      rest.remove_prefix(scheme.size());
      absolute = true;
    }
  }
  std::vector<std::string_view> steps = SplitSteps(rest);
  FhirReference result;
  size_t n = steps.size();
  if (n >= 4 && steps[n - 2] == "_history") {
    if (!IsFhirId(steps[n - 1])) return Fail(why, "has a _history version that is not a FHIR id");
    result.version.assign(steps[n - 1]);
    n -= 2;
  }
  if (absolute ? n < 3 : n != 2) return Fail(why, kShape);
  for (size_t i = 0; absolute && i + 2 < n; ++i) {
    if (!IsBaseStep(steps[i])) return Fail(why, kShape);
  }
  if (!IsResourceType(steps[n - 2])) return Fail(why, kShape);
  if (!IsFhirId(steps[n - 1])) {
    return Fail(why, "has an id that is not a FHIR id (1 to 64 of A-Z a-z 0-9 - .)");
  }
  result.type.assign(steps[n - 2]);
  result.id.assign(steps[n - 1]);
  return result;
}

std::optional<std::string> UrnUuid(std::string_view reference) {
  constexpr std::string_view kPrefix = "urn:uuid:";
  if (reference.substr(0, kPrefix.size()) != kPrefix) return std::nullopt;
  const std::string_view uuid = reference.substr(kPrefix.size());
  if (uuid.size() != 36) return std::nullopt;
  for (size_t i = 0; i < uuid.size(); ++i) {
    const bool dash = i == 8 || i == 13 || i == 18 || i == 23;
    if (dash ? uuid[i] != '-' : !IsHexDigit(uuid[i])) return std::nullopt;
  }
  return std::string(uuid);
}

}  // namespace medload
