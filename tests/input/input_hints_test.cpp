#include "medload/input/input_hints.h"

#include <doctest/doctest.h>

#include <string>

namespace medload {

TEST_SUITE("input/input_hints") {

TEST_CASE("compressed files are recognised by their first bytes") {
  struct Case {
    std::string head;
    const char* format;  // nullptr: not compressed
  };
  // Magic numbers from each format's specification (gzip: RFC 1952 section 2.3.1).
  const Case cases[] = {
      {std::string("\x1f\x8b\x08\x00", 4), "gzip"},
      {"PK\x03\x04rest", "zip"},
      {"BZh91AY", "bzip2"},
      {std::string("\xFD" "7zXZ\x00\x00", 7), "xz"},
      {"\x28\xB5\x2F\xFD", "zstd"},
      {"patient_id,dispensed_on\n", nullptr},
      {"{\"resourceType\": \"MedicationDispense\"}", nullptr},
      {"", nullptr},
      {"\x1f", nullptr},
  };
  for (const Case& c : cases) {
    CAPTURE(c.head);
    const auto format = CompressedFormat(c.head);
    if (c.format == nullptr) {
      CHECK_FALSE(format.has_value());
    } else {
      REQUIRE(format.has_value());
      CHECK(*format == c.format);
    }
  }
  CHECK(CompressedInputMessage("may.csv.gz", "gzip", "dispensing") ==
        "may.csv.gz is a gzip-compressed file; medload reads plain CSV or NDJSON: decompress it first (gunzip -k "
        "may.csv.gz), or stream it: zcat may.csv.gz | medload import dispensing -");
}

TEST_CASE("a header without commas but with another separator gets a hint naming it") {
  struct Case {
    const char* text;
    const char* hint;
  };
  const Case cases[] = {
      {"patient_id;dispensed_on;product;quantity",
       "; the header has no commas but 3 semicolons: medload reads comma-separated files (export as CSV with "
       "commas, or convert with tr ';' ',' if no field holds a comma)"},
      {"patient_id\tdispensed_on",
       "; the header has no commas but 1 tabs: medload reads comma-separated files (export as CSV with commas, "
       "or convert with tr '\\t' ',' if no field holds a comma)"},
      {"patient_id|dispensed_on|product",
       "; the header has no commas but 2 vertical bars: medload reads comma-separated files (export as CSV with "
       "commas, or convert with tr '|' ',' if no field holds a comma)"},
      {"patient_id,dispensed;on", ""},
      {"patientid", ""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    CsvRow header;
    header.text = c.text;
    CHECK(DelimiterHint(header) == c.hint);
  }
}

TEST_CASE("a date in another order gets a hint naming the date format that reads it") {
  struct Case {
    const char* text;
    DateOrder order;
    const char* hint;
  };
  const Case cases[] = {
      {"31/03/2024", DateOrder::kIso, "; it reads as a day-first date: use --date-format dmy"},
      {"03/31/2024", DateOrder::kIso, "; it reads as a month-first date: use --date-format mdy"},
      {"03/31/2024", DateOrder::kDmy, "; it reads as a month-first date: use --date-format mdy"},
      {"01.03.2024", DateOrder::kIso,
       "; it reads as a day-first or a month-first date: use --date-format dmy (DD/MM/YYYY) or mdy (MM/DD/YYYY)"},
      {"2024-03-31", DateOrder::kDmy, "; it reads as YYYY-MM-DD: use --date-format iso (the default)"},
      {"31/02/2024", DateOrder::kIso, ""},  // no order makes it a real date
      {"yesterday", DateOrder::kIso, ""},
  };
  for (const Case& c : cases) {
    CAPTURE(c.text);
    CHECK(DateOrderHint(c.text, c.order) == c.hint);
  }
}

}  // TEST_SUITE

}  // namespace medload
