#include "input/fhir_reference.h"

#include <doctest/doctest.h>

namespace medload {

TEST_SUITE("input/fhir_reference") {

TEST_CASE("literal references of the forms R4 allows are split into type, id and version") {
  // Source: HL7 FHIR R4 references.html (Resource References), Reference.reference: a
  // relative [type]/[id], or an absolute URL ending so, either followed by
  // /_history/[version]; the id pattern from datatypes.html (id).
  struct Case {
    const char* reference;
    const char* type;
    const char* id;
    const char* version;
  };
  const Case cases[] = {
      {"Patient/123", "Patient", "123", ""},
      {"Patient/pt-anwen.2", "Patient", "pt-anwen.2", ""},
      {"Patient/123/_history/4", "Patient", "123", "4"},
      {"https://ehr.example.org/fhir/Patient/123", "Patient", "123", ""},
      {"http://ehr.example.org:8080/fhir/r4/Patient/123/_history/7", "Patient", "123", "7"},
      {"https://ehr.example.org/Medication/m-1", "Medication", "m-1", ""},
      {"Patient/3f2a6c1e-8b4d-4e2a-9c1f-5d7e8a9b0c11", "Patient", "3f2a6c1e-8b4d-4e2a-9c1f-5d7e8a9b0c11", ""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.reference);
    std::string why;
    const std::optional<FhirReference> parsed = ParseFhirReference(c.reference, &why);
    REQUIRE(parsed.has_value());
    CHECK(parsed->type == c.type);
    CHECK(parsed->id == c.id);
    CHECK(parsed->version == c.version);
    CHECK(why.empty());
  }
}

TEST_CASE("references of any other shape are refused with the fault") {
  // Source: HL7 FHIR R4 references.html; a path step such as ".." is refused on purpose,
  // although the id pattern would allow it.
  const std::string shape =
      "is not a reference of the form Type/id (optionally /_history/version), relative or after an "
      "http(s) base URL";
  const std::string bad_id = "has an id that is not a FHIR id (1 to 64 of A-Z a-z 0-9 - .)";
  struct Case {
    std::string reference;
    std::string why;
  };
  const Case cases[] = {
      {"Patient/../../X/_history/1", shape},
      {"Patient/..", bad_id},
      {"Patient/.", bad_id},
      {"123", shape},
      {"", "is empty"},
      {"#med", "is a local reference to a contained resource"},
      {"urn:uuid:3f2a6c1e-8b4d-4e2a-9c1f-5d7e8a9b0c11", "is a urn, not a literal reference"},
      {"patient/123", shape},
      {"Patient/123/", shape},
      {"Patient//123", shape},
      {"Patient/12 3", bad_id},
      {"Patient/123?x=1", bad_id},
      {"Patient/" + std::string(65, 'a'), bad_id},
      {"https://ehr.example.org/fhir/Patient/123/_history/", "has a _history version that is not a FHIR id"},
      {"Patient/123/_history/..", "has a _history version that is not a FHIR id"},
      {"ftp://ehr.example.org/Patient/123", shape},
      {"https:///Patient/123", shape},
      {"https://ehr.example.org/a b/Patient/123", shape},
      {"Patient/123/_history/4/_history/5", shape},
  };
  for (const Case& c : cases) {
    CAPTURE(c.reference);
    std::string why;
    CHECK_FALSE(ParseFhirReference(c.reference, &why).has_value());
    CHECK(why == c.why);
  }
}

TEST_CASE("a FHIR id is 1 to 64 letters, digits, hyphens and dots") {
  // Source: HL7 FHIR R4 datatypes.html, id: [A-Za-z0-9\-\.]{1,64}.
  CHECK(IsFhirId("a"));
  CHECK(IsFhirId("A-b.9"));
  CHECK(IsFhirId(std::string(64, 'x')));
  CHECK_FALSE(IsFhirId(std::string(65, 'x')));
  CHECK_FALSE(IsFhirId(""));
  CHECK_FALSE(IsFhirId("a_b"));
  CHECK_FALSE(IsFhirId("a/b"));
  CHECK_FALSE(IsFhirId("é"));
  CHECK_FALSE(IsFhirId(".."));
}

TEST_CASE("a urn:uuid gives its UUID, and nothing else passes for one") {
  // Source: HL7 FHIR R4 references.html (urn:uuid references, RFC 4122 form).
  CHECK(UrnUuid("urn:uuid:c0ffee00-1234-4abc-8def-0123456789AB") == "c0ffee00-1234-4abc-8def-0123456789AB");
  CHECK_FALSE(UrnUuid("urn:uuid:c0ffee00-1234-4abc-8def-0123456789a").has_value());
  CHECK_FALSE(UrnUuid("urn:uuid:c0ffee00x1234-4abc-8def-0123456789ab").has_value());
  CHECK_FALSE(UrnUuid("urn:oid:1.2.3").has_value());
  CHECK_FALSE(UrnUuid("c0ffee00-1234-4abc-8def-0123456789ab").has_value());
}

}  // TEST_SUITE

}  // namespace medload
