#include "medload/input/csv_reader.h"

#include <doctest/doctest.h>

#include <optional>
#include <sstream>
#include <string>
#include <vector>

namespace medload {
namespace {

struct ReadRow {
  size_t line;
  std::vector<std::string> fields;
  std::string text;
  CsvFault fault;
  size_t line_count = 1;
};

// Every record of `input`; with `expected_fields`, set as the header's width once the
// first record is read (as the importer does).
std::vector<ReadRow> ReadAll(const std::string& input, CsvLimits limits = {},
                             size_t* blank_lines = nullptr, size_t expected_fields = 0,
                             size_t* lines = nullptr) {
  std::istringstream in(input);
  CsvReader reader(in, limits);
  std::vector<ReadRow> rows;
  CsvRow row;
  while (reader.Next(row)) {
    rows.push_back({row.line, std::vector<std::string>(row.fields.begin(), row.fields.end()),
                    std::string(row.text), row.fault, row.line_count});
    reader.ExpectFields(expected_fields);
  }
  if (blank_lines != nullptr) *blank_lines = reader.blank_lines();
  if (lines != nullptr) *lines = reader.lines();
  return rows;
}

// "1,2,3" for each line from `first` to `last`, each on its own line.
std::string NumberedRows(int first, int last) {
  std::string text;
  for (int i = first; i <= last; ++i) text += "r" + std::to_string(i) + ",x,y\n";
  return text;
}

}  // namespace

TEST_SUITE("input/csv_reader") {

TEST_CASE("records split into fields by RFC 4180 rules") {
  // Source: RFC 4180, "Common Format and MIME Type for CSV Files", section 2.
  struct Case {
    const char* name;
    std::string input;
    std::vector<std::vector<std::string>> rows;
  };
  const Case cases[] = {
      {"plain", "a,b,c\n1,2,3\n", {{"a", "b", "c"}, {"1", "2", "3"}}},
      {"no final line end", "a,b\n1,2", {{"a", "b"}, {"1", "2"}}},
      {"empty fields", ",,\n", {{"", "", ""}}},
      {"quoted comma", "\"Co-codamol 30mg/500mg, tablets\",2\n",
       {{"Co-codamol 30mg/500mg, tablets", "2"}}},
      {"doubled quote", "\"say \"\"one\"\" daily\",x\n", {{"say \"one\" daily", "x"}}},
      {"embedded newline", "\"line one\nline two\",x\n", {{"line one\nline two", "x"}}},
      {"embedded CRLF kept", "\"a\r\nb\",x\r\n", {{"a\r\nb", "x"}}},
      {"CRLF line ends", "a,b\r\n1,2\r\n", {{"a", "b"}, {"1", "2"}}},
      {"empty quoted field", "\"\",x\n", {{"", "x"}}},
      {"stray quote inside an unquoted field is data", "ab\"c,d\n", {{"ab\"c", "d"}}},
      {"text after a closing quote is data", "\"ab\"c,d\n", {{"abc", "d"}}},
      {"UTF-8 text", "Ibuprofen 5% gel,\xC2\xB5g\n", {{"Ibuprofen 5% gel", "\xC2\xB5g"}}},
      {"byte-order mark dropped", "\xEF\xBB\xBFpatient_id,x\n", {{"patient_id", "x"}}},
      {"last field empty", "a,\n", {{"a", ""}}},
      {"last field empty with CRLF", "a,\r\n", {{"a", ""}}},
  };
  for (const Case& c : cases) {
    CAPTURE(c.name);
    const std::vector<ReadRow> rows = ReadAll(c.input);
    REQUIRE(rows.size() == c.rows.size());
    for (size_t i = 0; i < rows.size(); ++i) {
      CHECK(rows[i].fault == CsvFault::kNone);
      CHECK(rows[i].fields == c.rows[i]);
    }
  }
}

TEST_CASE("each record keeps the physical line it starts on and its original text") {
  const std::string input = "h1,h2\n\"multi\nline\",x\r\n\n   \nlast,\"q\"\"uote\"\n";
  size_t blanks = 0;
  const std::vector<ReadRow> rows = ReadAll(input, {}, &blanks);
  REQUIRE(rows.size() == 3);
  CHECK(rows[0].line == 1);
  CHECK(rows[1].line == 2);
  CHECK(rows[1].text == "\"multi\nline\",x");
  CHECK(rows[2].line == 6);  // lines 4 and 5 are blank
  CHECK(rows[2].text == "last,\"q\"\"uote\"");
  CHECK(blanks == 2);
}

TEST_CASE("a row with a different number of fields is returned as it is") {
  const std::vector<ReadRow> rows = ReadAll("a,b,c\n1,2\n1,2,3,4\n");
  REQUIRE(rows.size() == 3);
  CHECK(rows[1].fields.size() == 2);
  CHECK(rows[2].fields.size() == 4);
}

TEST_CASE("invalid UTF-8 is a fault of that row only") {
  // Source: RFC 3629 section 3 and The Unicode Standard table 3-7 (well-formed UTF-8).
  const std::vector<ReadRow> rows = ReadAll("a,b\nbad\xFF,x\nok,y\n");
  REQUIRE(rows.size() == 3);
  CHECK(rows[1].fault == CsvFault::kInvalidUtf8);
  CHECK(rows[1].fields.empty());
  CHECK(rows[1].line == 2);
  CHECK(rows[2].fault == CsvFault::kNone);
  CHECK(rows[2].fields[0] == "ok");
}

TEST_CASE("UTF-8 validation rejects overlong forms, surrogates and stray continuation bytes") {
  // Source: The Unicode Standard, version 15, table 3-7 "Well-Formed UTF-8 Byte Sequences".
  struct Case {
    const char* name;
    std::string bytes;
    bool valid;
  };
  const Case cases[] = {
      {"ascii", "plain text 123", true},
      {"two-byte", "\xC2\xB5", true},
      {"three-byte", "\xE2\x82\xAC", true},
      {"four-byte", "\xF0\x9F\x92\x8A", true},
      {"overlong slash", "\xC0\xAF", false},
      {"overlong three-byte", "\xE0\x80\xAF", false},
      {"surrogate", "\xED\xA0\x80", false},
      {"above U+10FFFF", "\xF4\x90\x80\x80", false},
      {"lone continuation", "\x80", false},
      {"truncated sequence", "abcdefgh\xE2\x82", false},
      {"latin-1 byte", "caf\xE9", false},
  };
  for (const Case& c : cases) {
    CAPTURE(c.name);
    CHECK(IsValidUtf8(c.bytes) == c.valid);
  }
}

TEST_CASE("an over-long field is a fault and reading continues at the next record") {
  CsvLimits limits;
  limits.max_field_bytes = 16;
  const std::string long_field(100, 'x');
  const std::vector<ReadRow> rows =
      ReadAll("a,b\n" + long_field + ",1\n\"" + long_field + "\n" + long_field + "\",2\nok,3\n",
              limits);
  REQUIRE(rows.size() == 4);
  CHECK(rows[1].fault == CsvFault::kFieldTooLong);
  CHECK(rows[2].fault == CsvFault::kFieldTooLong);
  CHECK(rows[2].line == 3);
  CHECK(rows[3].fault == CsvFault::kNone);
  CHECK(rows[3].line == 5);
  CHECK(rows[3].fields == std::vector<std::string>{"ok", "3"});
}

TEST_CASE("a field of exactly the limit fits before a CRLF, quoted or not") {
  // Found by the csv_reader fuzz target: the CR of a CRLF counted against the field.
  CsvLimits limits;
  limits.max_field_bytes = 7;
  const std::vector<ReadRow> rows =
      ReadAll("1234567\r\n\"1234567\"\r\na,1234567\r\n12345678\r\n\"1234567\r\"\r\n", limits);
  REQUIRE(rows.size() == 5);
  CHECK(rows[0].fields == std::vector<std::string>{"1234567"});
  CHECK(rows[1].fields == std::vector<std::string>{"1234567"});
  CHECK(rows[2].fields == std::vector<std::string>{"a", "1234567"});
  CHECK(rows[3].fault == CsvFault::kFieldTooLong);  // eight bytes are still too many
  CHECK(rows[4].fault == CsvFault::kFieldTooLong);  // a CR inside quotes is data
}

TEST_CASE("an over-long record keeps only the first bytes of its text") {
  CsvLimits limits;
  limits.max_record_bytes = 32;
  const std::vector<ReadRow> rows = ReadAll(std::string(40, 'y') + ",z\nok\n", limits);
  REQUIRE(rows.size() == 2);
  CHECK(rows[0].fault == CsvFault::kRecordTooLong);
  CHECK(rows[0].text.size() == 32);
  CHECK(rows[1].fields == std::vector<std::string>{"ok"});
}

TEST_CASE("too many fields in one record is a fault") {
  CsvLimits limits;
  limits.max_fields = 4;
  const std::vector<ReadRow> rows = ReadAll("a,b,c,d\n1,2,3,4,5\n", limits);
  REQUIRE(rows.size() == 2);
  CHECK(rows[0].fault == CsvFault::kNone);
  CHECK(rows[1].fault == CsvFault::kTooManyFields);
}

TEST_CASE("a quote still open at the end of the input is a fault of its own line only") {
  const std::vector<ReadRow> rows = ReadAll("a,b\n\"never closed,x\nmore\n");
  REQUIRE(rows.size() == 3);
  CHECK(rows[1].fault == CsvFault::kUnclosedQuote);
  CHECK(rows[1].line == 2);
  CHECK(rows[1].text == "\"never closed,x");
  CHECK(rows[2].line == 3);
  CHECK(rows[2].fields == std::vector<std::string>{"more"});
  const std::vector<ReadRow> last = ReadAll("a,b\n\"never closed,x");
  REQUIRE(last.size() == 2);
  CHECK(last[1].fault == CsvFault::kUnclosedQuote);
}

TEST_CASE("a stray quote costs its own line and the records after it are read as written") {
  // A quote opening a field on line 3, then: no quote at all; a quote closing it a few
  // lines later (into a record of the right width); one closing it past the line limit;
  // one closing it on the next line into a record of the wrong width.
  struct Case {
    std::string name;
    std::string after;  // lines 4 onwards
    size_t records;     // after the header and line 2
  };
  const Case cases[] = {
      {"never closed", NumberedRows(4, 40), 38},
      {"closed three lines later", NumberedRows(4, 5) + "r6,\"x\",y\n" + NumberedRows(7, 40), 38},
      {"closed forty lines later", NumberedRows(4, 43) + "r44,\"x\",y\n" + NumberedRows(45, 50), 48},
      {"closed on the next line into a record of the wrong width", "r4\",x,extra\nr5,x,y\n", 3},
  };
  for (const Case& c : cases) {
    CAPTURE(c.name);
    const std::string input = "id,a,b\nr2,x,y\nr3,\"stray,y\n" + c.after;
    size_t lines = 0;
    const std::vector<ReadRow> rows = ReadAll(input, {}, nullptr, 3, &lines);
    REQUIRE(rows.size() == 2 + c.records);
    CHECK(rows[2].line == 3);
    CHECK(rows[2].fault == CsvFault::kUnclosedQuote);
    CHECK(rows[2].text == "r3,\"stray,y");
    CHECK(rows[2].line_count == 1);
    size_t counted = 0;
    for (size_t i = 0; i < rows.size(); ++i) {
      CAPTURE(i);
      if (i > 2) {
        CHECK(rows[i].line == rows[i - 1].line + rows[i - 1].line_count);  // no line skipped
      }
      counted += rows[i].line_count;
    }
    CHECK(counted == lines);
  }
}

TEST_CASE("a quoted field may hold line breaks when the record has the header's width") {
  // Source: RFC 4180 section 2, rule 6 (line breaks inside double quotes).
  const std::string input =
      "id,dosage,quantity\n"
      "1,\"take one\ndaily\",28\n"
      "\"2\nb\",x,56\n"
      "3,\"one\r\ntwo\rthree\",7\n"
      "4,plain,1\n";
  size_t lines = 0;
  const std::vector<ReadRow> rows = ReadAll(input, {}, nullptr, 3, &lines);
  REQUIRE(rows.size() == 5);
  CHECK(rows[1].fields == std::vector<std::string>{"1", "take one\ndaily", "28"});
  CHECK(rows[1].line_count == 2);
  CHECK(rows[2].fields == std::vector<std::string>{"2\nb", "x", "56"});
  CHECK(rows[3].fields == std::vector<std::string>{"3", "one\r\ntwo\rthree", "7"});
  CHECK(rows[3].line_count == 3);
  CHECK(rows[4].line == 9);
  CHECK(lines == 9);
}

TEST_CASE("a record spanning more lines or bytes than its limits ends at its first line") {
  CsvLimits limits;
  limits.max_record_lines = 3;
  const std::vector<ReadRow> long_span = ReadAll("a,b\n\"1\n2\n3\n4\",x\nz,y\n", limits);
  REQUIRE(long_span.size() == 6);
  CHECK(long_span[1].fault == CsvFault::kUnclosedQuote);
  CHECK(long_span[2].fields == std::vector<std::string>{"2"});
  CHECK(long_span[4].line == 5);
  CHECK(long_span[4].fields == std::vector<std::string>{"4\"", "x"});  // a quote inside is data
  CsvLimits bytes;
  bytes.max_record_bytes = 12;
  const std::vector<ReadRow> wide = ReadAll("a,b\n\"1\n23456789012345\",x\nz,y\n", bytes);
  REQUIRE(wide.size() == 4);
  CHECK(wide[1].fault == CsvFault::kUnclosedQuote);
  CHECK(wide[2].fault == CsvFault::kRecordTooLong);
  CHECK(wide[2].line == 3);
  CHECK(wide[3].fields == std::vector<std::string>{"z", "y"});
  // A first line over the limit that opens a quote: that line is the record.
  const std::vector<ReadRow> cut = ReadAll("a,b\n\"1234567890123456\nz,y\n", bytes);
  REQUIRE(cut.size() == 3);
  CHECK(cut[1].fault == CsvFault::kRecordTooLong);
  CHECK(cut[1].text.size() == 12);
  CHECK(cut[2].line == 3);
  CHECK(cut[2].fields == std::vector<std::string>{"z", "y"});
}

TEST_CASE("a CR alone ends a line, also among LF and CRLF lines") {
  size_t lines = 0;
  size_t blanks = 0;
  const std::vector<ReadRow> rows =
      ReadAll("a,b\n1,x\r2,y\r3,z\r\n\r4,w\n5,v", {}, &blanks, 2, &lines);
  REQUIRE(rows.size() == 6);
  for (size_t i = 1; i < rows.size(); ++i) {
    CAPTURE(i);
    CHECK(rows[i].fault == CsvFault::kNone);
    CHECK(rows[i].fields[0] == std::to_string(i));
  }
  CHECK(rows[4].line == 6);  // line 5 is the blank CR
  CHECK(blanks == 1);
  CHECK(lines == 7);
}

TEST_CASE("the lines counted are every line end plus a last line without one") {
  struct Case {
    std::string input;
    size_t lines;
  };
  const Case cases[] = {{"", 0},          {"a", 1},        {"a\n", 1},        {"a\r\n", 1},
                        {"a\r", 1},       {"a\n\n", 2},    {"a\r\r\n", 2},    {"\"x\ny\"\nz", 3},
                        {"\n\n\n", 3},   {"a\rb", 2}};
  for (const Case& c : cases) {
    CAPTURE(c.input);
    size_t lines = 0;
    ReadAll(c.input, {}, nullptr, 0, &lines);
    CHECK(lines == c.lines);
  }
}

TEST_CASE("a line is a well-formed record on its own only when its quotes open and close fields") {
  struct Case {
    std::string line;
    std::optional<size_t> fields;
  };
  const Case cases[] = {
      {"", 1},           {"a", 1},          {"a,b,c", 3},       {"a,", 2},
      {"\"a,b\",c", 2}, {"\"a\"\"b\",c", 2}, {"\"\"", 1},       {"a\"b,c", std::nullopt},
      {"\"a", std::nullopt}, {"\"a\"b,c", std::nullopt}, {"daily\",28", std::nullopt},
  };
  for (const Case& c : cases) {
    CAPTURE(c.line);
    CHECK(WellFormedFieldCount(c.line) == c.fields);
  }
}

TEST_CASE("empty input and blank-only input give no records") {
  size_t blanks = 0;
  CHECK(ReadAll("").empty());
  CHECK(ReadAll("\n\r\n  \n", {}, &blanks).empty());
  CHECK(blanks == 3);
  CHECK(ReadAll("\xEF\xBB\xBF").empty());
}

TEST_CASE("records spanning the reader's internal chunks are read whole") {
  std::string input = "id,text\n";
  std::vector<std::string> expected;
  for (int i = 0; i < 20000; ++i) {
    const std::string text = "row " + std::to_string(i) + ", \"quoted\"\nsecond line";
    expected.push_back(text);
    input += std::to_string(i) + ",\"" + "row " + std::to_string(i) + ", \"\"quoted\"\"\nsecond line\"\r\n";
  }
  const std::vector<ReadRow> rows = ReadAll(input);
  REQUIRE(rows.size() == 20001);
  for (size_t i = 0; i < expected.size(); ++i) {
    CAPTURE(i);
    REQUIRE(rows[i + 1].fields.size() == 2);
    CHECK(rows[i + 1].fields[1] == expected[i]);
    CHECK(rows[i + 1].line == 2 + 2 * i);
  }
}

}  // TEST_SUITE

}  // namespace medload
