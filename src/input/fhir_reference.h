// Strict reading of FHIR R4 literal references ("Patient/123", an absolute URL ending in
// "Patient/123", either optionally followed by "/_history/4") and of resource ids. Private
// to the FHIR reader. It resolves nothing: which resource a reference names is the
// importer's question.
#pragma once

#include <optional>
#include <string>
#include <string_view>

namespace medload {

// True for a FHIR R4 id: 1 to 64 of [A-Za-z0-9-.] (HL7 FHIR R4 datatypes.html, id), and
// not "." or ".." (a path step, never an id a server would mint: refused on purpose).
bool IsFhirId(std::string_view text);

// One literal reference, split.
struct FhirReference {
  std::string type;     // the resource type, e.g. "Patient"
  std::string id;       // a valid FHIR id
  std::string version;  // the _history id, or empty
};

// Reads `reference` as `[Type]/[id]`, optionally followed by `/_history/[id]`, either
// alone (relative) or after `http://` or `https://` and a base URL whose path steps hold
// only [A-Za-z0-9-.:%$] (HL7 FHIR R4 references.html, literal references). The type
// starts with an upper-case ASCII letter and holds letters only. Anything else (a local
// "#id", a "urn:", a bare id, a path with more steps, "..", a query or fragment) gives
// nullopt with the fault in `*why`, worded to follow the quoted reference.
std::optional<FhirReference> ParseFhirReference(std::string_view reference, std::string* why);

// The UUID of "urn:uuid:UUID" (8-4-4-4-12 hex digits, either case), or nullopt.
std::optional<std::string> UrnUuid(std::string_view reference);

}  // namespace medload
